package org.switchfit.report;

import com.fasterxml.jackson.annotation.JsonProperty;
import java.util.List;
import org.switchfit.profile.RankReport;

/**
 * Content of {@code profiles.json}, written by {@code switchfit profile}: profile likelihoods (Raue et al. 2009,
 * Bioinformatics 25(15):1923-1929, doi:10.1093/bioinformatics/btp358) of parameters, fold positions and
 * predictions (Kreutz et al. 2012, BMC Syst. Biol. 6:120, doi:10.1186/1752-0509-6-120) with their intervals and
 * classification. Immutable.
 *
 * <p>The fields beyond level, bestNll and profiles are diagnostics of the profile command; they may be absent
 * (null, false or NaN) in files written by other producers.
 *
 * @param level              confidence level of the intervals, e.g. 0.95
 * @param bestNll            negative log-likelihood at the best fit the profiles start from
 * @param thresholds         likelihood-ratio thresholds used, or null
 * @param betterOptimumFound true when some profile met a lower NLL than bestNll (the fit was not at the optimum)
 * @param bestNllFound       lowest NLL met by any profile (NaN when not recorded)
 * @param folds              status of the fold profiles as text ("not requested", a count, ...), or null
 * @param rankCheck          structural rank check of the residual Jacobian, or null
 * @param profiles           one entry per profiled quantity
 */
public record ProfilesFile(double level, double bestNll, Thresholds thresholds, boolean betterOptimumFound,
                           double bestNllFound, String folds, RankCheck rankCheck, List<Entry> profiles) {

    /** Copies the list (null becomes empty). */
    public ProfilesFile {
        profiles = profiles == null ? List.of() : List.copyOf(profiles);
    }

    /** A file with the required fields only (no diagnostics). */
    public ProfilesFile(double level, double bestNll, List<Entry> profiles) {
        this(level, bestNll, null, false, Double.NaN, null, null, profiles);
    }

    /**
     * Likelihood-ratio thresholds (Δχ² = 2 ΔNLL) of the pointwise and simultaneous intervals.
     *
     * @param pointwise       χ²₁ quantile at the level
     * @param simultaneous    χ² quantile with {@code simultaneousDof} degrees of freedom
     * @param simultaneousDof number of free parameters
     */
    public record Thresholds(double pointwise, double simultaneous, int simultaneousDof) {
    }

    /**
     * Rank of the residual Jacobian at the optimum and at random points within the bounds.
     *
     * @param atOptimum rank report at the optimum, or null
     * @param random    rank reports at random points
     * @param message   why a check could not be done, else empty
     */
    public record RankCheck(RankReport atOptimum, List<RankReport> random, String message) {
        /** Copies the list. */
        public RankCheck {
            random = random == null ? List.of() : List.copyOf(random);
        }
    }

    /**
     * A compensating parameter along a profile.
     *
     * @param id    parameter id
     * @param slope least-squares dθ_j/dz over the profile points (estimation scales)
     * @param min   smallest θ_j along the profile (estimation scale)
     * @param max   largest θ_j
     */
    public record Compensation(String id, double slope, double min, double max) {
    }

    /** What was profiled. */
    public enum Kind {
        /** An estimated parameter. */
        @JsonProperty("parameter") PARAMETER,
        /** The control-parameter value of a fold (saddle-node) of the fitted model. */
        @JsonProperty("fold") FOLD,
        /** A model prediction (prediction profile). */
        @JsonProperty("prediction") PREDICTION;

        /** The name as written in the file ({@code parameter}, {@code fold}, {@code prediction}). */
        public String token() {
            return name().toLowerCase(java.util.Locale.ROOT);
        }
    }

    /** Identifiability class after Raue et al. 2009. */
    public enum Identifiability {
        /** The interval is closed on both sides. */
        @JsonProperty("identifiable") IDENTIFIABLE,
        /** The profile is open on at least one side but not flat. */
        @JsonProperty("practically-nonidentifiable") PRACTICALLY_NONIDENTIFIABLE,
        /** The profile is flat: the data do not constrain the quantity at all. */
        @JsonProperty("structurally-nonidentifiable") STRUCTURALLY_NONIDENTIFIABLE;

        /** The name as written in the file, e.g. {@code practically-nonidentifiable}. */
        public String token() {
            return name().toLowerCase(java.util.Locale.ROOT).replace('_', '-');
        }
    }

    /**
     * One profile.
     *
     * @param id                 parameter id, fold id (as in {@code branches.json}) or prediction id
     * @param kind               what was profiled
     * @param scale              axis scale of the profiled quantity ({@code lin}, {@code log}, {@code log10})
     * @param estimate           best-fit value, linear scale
     * @param lower              pointwise lower interval end, linear scale; null when the profile does not cross
     *                           the threshold on that side (open)
     * @param upper              pointwise upper interval end, linear scale; null when open
     * @param lowerSimultaneous  simultaneous lower end, linear scale; null when open or not computed
     * @param upperSimultaneous  simultaneous upper end; null when open or not computed
     * @param thresholdNll       NLL level that defines the pointwise interval: {@code bestNll + chi2_1(level) / 2}
     * @param classification     identifiability class
     * @param bounds             for folds and predictions: pinned, bounded-below, bounded-above or free; null for
     *                           parameters
     * @param compensating       ids of the parameters that change most along the profile, strongest first
     * @param compensations      their slopes and ranges (may be empty)
     * @param optimumNll         NLL at the optimum this profile used (NaN when not recorded)
     * @param betterOptimumFound true when this profile restarted from a better optimum
     * @param lowerSide          how the lower side ended (e.g. CLOSED, OPEN_AT_BOUND), or null
     * @param upperSide          how the upper side ended, or null
     * @param solves             constrained re-optimisations performed
     * @param message            failure text, or null / empty
     * @param points             profile points in ascending order of value
     */
    public record Entry(String id, Kind kind, String scale, double estimate, Double lower, Double upper,
                        Double lowerSimultaneous, Double upperSimultaneous, double thresholdNll,
                        @JsonProperty("class") Identifiability classification, String bounds,
                        List<String> compensating, List<Compensation> compensations, double optimumNll,
                        boolean betterOptimumFound, String lowerSide, String upperSide, int solves, String message,
                        List<Point> points) {

        /** Copies the lists (null becomes empty). */
        public Entry {
            compensating = compensating == null ? List.of() : List.copyOf(compensating);
            compensations = compensations == null ? List.of() : List.copyOf(compensations);
            points = points == null ? List.of() : List.copyOf(points);
        }

        /** An entry with the required fields only (no diagnostics). */
        public Entry(String id, Kind kind, String scale, double estimate, Double lower, Double upper,
                     double thresholdNll, Identifiability classification, List<String> compensating,
                     List<Point> points) {
            this(id, kind, scale, estimate, lower, upper, null, null, thresholdNll, classification, null,
                    compensating, null, Double.NaN, false, null, null, 0, null, points);
        }

        /** Whether the quantity is shown on a logarithmic axis. */
        public boolean logScale() {
            return "log".equals(scale) || "log10".equals(scale);
        }
    }

    /**
     * One profile point.
     *
     * @param value value of the profiled quantity, linear scale
     * @param nll   minimised negative log-likelihood with the quantity fixed there (NaN when the point failed)
     */
    public record Point(double value, double nll) {
    }

    /**
     * One finished profile as kept in {@code FITDIR/profiles/KEY.json} (for resuming, the CSV and the audit): the
     * entry, the level it was computed at, and the re-optimised parameters of each point (linear scale, in the order
     * of {@code parameterIds}), one row per entry point.
     *
     * @param level           confidence level the profile was computed at
     * @param entry           the profile
     * @param parameterIds    ids of the estimated parameters
     * @param pointParameters linear parameter values per point, parallel to {@code entry.points()}
     */
    public record Stored(double level, Entry entry, List<String> parameterIds, List<double[]> pointParameters) {
        /** Copies the lists (null becomes empty). */
        public Stored {
            parameterIds = parameterIds == null ? List.of() : List.copyOf(parameterIds);
            pointParameters = pointParameters == null ? List.of() : List.copyOf(pointParameters);
        }
    }
}
