package org.switchfit.cli;

import com.fasterxml.jackson.annotation.JsonProperty;
import java.util.List;
import org.switchfit.profile.RankReport;

/**
 * Content of {@code FITDIR/profiles.json} as written by {@code switchfit profile}. The fields {@code level},
 * {@code bestNll} and {@code profiles} (each with {@code id, kind, scale, estimate, lower, upper, thresholdNll,
 * class, compensating, points}) follow the report schema for profiles; the other fields are diagnostics on top.
 * All values of profiled quantities are on the LINEAR scale; open interval ends are null. Immutable.
 *
 * @param level              confidence level
 * @param bestNll            NLL at the optimum the profiles start from (the recorded one, re-evaluated)
 * @param thresholds         likelihood-ratio thresholds used
 * @param betterOptimumFound true when any profile found a lower NLL than bestNll (the fit was not at the optimum)
 * @param bestNllFound       lowest NLL met by any profile (equals bestNll unless a better optimum was found)
 * @param folds              status of fold profiles: "not requested", "not available in this build", or a count
 * @param rankCheck          structural rank check of the residual Jacobian
 * @param profiles           one entry per profiled quantity
 */
record ProfilesJson(double level, double bestNll, Thresholds thresholds, boolean betterOptimumFound,
                    double bestNllFound, String folds, RankCheck rankCheck, List<Entry> profiles) {

    /**
     * Likelihood-ratio thresholds (Δχ² = 2 ΔNLL) of the pointwise and simultaneous intervals.
     *
     * @param pointwise           χ²₁ quantile at the level
     * @param simultaneous        χ² quantile with {@code simultaneousDof} degrees of freedom
     * @param simultaneousDof     number of free parameters
     */
    record Thresholds(double pointwise, double simultaneous, int simultaneousDof) {
    }

    /**
     * Rank of the residual Jacobian at the optimum and at random points in the bounds.
     *
     * @param atOptimum rank report at θ*
     * @param random    rank reports at random points (seeded)
     * @param message   why a check could not be done, else empty
     */
    record RankCheck(RankReport atOptimum, List<RankReport> random, String message) {
    }

    /**
     * One profile.
     *
     * @param id                parameter id, fold id or prediction text
     * @param kind              parameter, fold or prediction
     * @param scale             estimation scale for parameters (lin, log, log10), lin otherwise
     * @param estimate          value at the optimum, linear scale
     * @param lower             pointwise lower end, linear; null when open
     * @param upper             pointwise upper end, linear; null when open
     * @param lowerSimultaneous simultaneous lower end, linear; null when open
     * @param upperSimultaneous simultaneous upper end, linear; null when open
     * @param thresholdNll      NLL level of the pointwise interval: optimum NLL + χ²₁/2
     * @param classification    identifiable, practically-nonidentifiable or structurally-nonidentifiable
     * @param bounds            for folds and predictions: pinned (both ends closed), bounded-below, bounded-above
     *                          or free; null for parameters
     * @param compensating      parameters moving along the profile, strongest first
     * @param compensations     their slopes dθ_j/dz (estimation scale) and ranges
     * @param optimumNll        NLL at the optimum this profile used (lower than bestNll after a restart)
     * @param betterOptimumFound true when this profile restarted from a better optimum
     * @param lowerSide         how the lower side ended (CLOSED, OPEN_AT_BOUND, OPEN_STEP_LIMIT, FAILED)
     * @param upperSide         how the upper side ended
     * @param solves            constrained re-optimisations performed
     * @param message           failure text, else empty
     * @param points            profile points sorted by value
     */
    record Entry(String id, String kind, String scale, double estimate, Double lower, Double upper,
                 Double lowerSimultaneous, Double upperSimultaneous, double thresholdNll,
                 @JsonProperty("class") String classification, String bounds, List<String> compensating,
                 List<Compensation> compensations, double optimumNll, boolean betterOptimumFound, String lowerSide,
                 String upperSide, int solves, String message, List<Point> points) {
    }

    /**
     * A compensating parameter.
     *
     * @param id    parameter id
     * @param slope least-squares dθ_j/dz over the profile points (estimation scales)
     * @param min   smallest θ_j (estimation scale)
     * @param max   largest θ_j
     */
    record Compensation(String id, double slope, double min, double max) {
    }

    /**
     * A profile point.
     *
     * @param value profiled quantity, linear scale
     * @param nll   minimised NLL there
     */
    record Point(double value, double nll) {
    }

    /**
     * What {@code FITDIR/profiles/KEY.json} holds for resume: the entry, the level it was computed at, and the
     * re-optimised parameters (linear) of each point, for the CSV.
     */
    record Stored(double level, Entry entry, List<String> parameterIds, List<double[]> pointParameters) {
    }
}
