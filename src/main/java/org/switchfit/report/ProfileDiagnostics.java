package org.switchfit.report;

import java.util.List;
import org.switchfit.profile.RankReport;

/**
 * Diagnostics of a profile run kept in {@code profiles.json} beside the report fields of {@link ProfilesFile}:
 * thresholds, whether a better optimum was found, the status of fold profiles and the structural rank check of the
 * residual Jacobian (singular values at the optimum and at random points, null-space combinations named). Immutable.
 *
 * @param pointwiseThreshold    likelihood-ratio threshold Δχ² = 2 ΔNLL of the pointwise intervals (χ²₁ quantile)
 * @param simultaneousThreshold threshold of the simultaneous intervals (χ² quantile, {@code simultaneousDof} dof)
 * @param simultaneousDof       number of free parameters
 * @param betterOptimumFound    true when a profile met a lower NLL than {@link ProfilesFile#bestNll()}: the fit was
 *                              not at the optimum
 * @param bestNllFound          lowest NLL met by any profile point
 * @param folds                 status of fold-position profiles ("not requested", "fold predictions not available
 *                              in this build", or how many were profiled)
 * @param rankCheck             structural rank check
 */
public record ProfileDiagnostics(double pointwiseThreshold, double simultaneousThreshold, int simultaneousDof,
                                 boolean betterOptimumFound, double bestNllFound, String folds, RankCheck rankCheck) {

    /**
     * Rank of the residual Jacobian (free parameters) at the optimum and at seeded random points in the bounds.
     *
     * @param atOptimum rank report at the optimum (null when it could not be computed)
     * @param random    rank reports at random points
     * @param message   why a check could not be done, else empty
     */
    public record RankCheck(RankReport atOptimum, List<RankReport> random, String message) {

        /** Copies the list (null becomes empty). */
        public RankCheck {
            random = random == null ? List.of() : List.copyOf(random);
        }
    }

    /**
     * Diagnostics of one profile.
     *
     * @param lowerSimultaneous  simultaneous-interval lower end, linear scale; null when open
     * @param upperSimultaneous  simultaneous-interval upper end; null when open
     * @param bounds             for folds and predictions: pinned (both ends closed), bounded-below, bounded-above or
     *                           free; null for parameters
     * @param compensations      parameters moving along the profile with slope and range, strongest first
     * @param optimumNll         NLL at the optimum this profile used (below bestNll after a restart)
     * @param betterOptimumFound true when this profile restarted from a better optimum
     * @param lowerSide          how the lower side ended (CLOSED, OPEN_AT_BOUND, OPEN_STEP_LIMIT, FAILED)
     * @param upperSide          how the upper side ended
     * @param solves             constrained re-optimisations performed
     * @param message            failure text, else empty
     */
    public record Entry(Double lowerSimultaneous, Double upperSimultaneous, String bounds,
                        List<Compensation> compensations, double optimumNll, boolean betterOptimumFound,
                        String lowerSide, String upperSide, int solves, String message) {

        /** Copies the list (null becomes empty). */
        public Entry {
            compensations = compensations == null ? List.of() : List.copyOf(compensations);
        }
    }

    /**
     * A parameter compensating the profiled quantity.
     *
     * @param id    parameter id
     * @param slope least-squares dθ_j/dz over the profile points (estimation scales)
     * @param min   smallest θ_j along the profile (estimation scale)
     * @param max   largest θ_j
     */
    public record Compensation(String id, double slope, double min, double max) {
    }
}
