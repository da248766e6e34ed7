package org.switchfit.report;

import com.fasterxml.jackson.annotation.JsonProperty;
import java.util.List;

/**
 * Content of {@code profiles.json}, written by {@code switchfit profile}: profile likelihoods (Raue et al. 2009,
 * Bioinformatics 25(15):1923-1929, doi:10.1093/bioinformatics/btp358) of parameters, fold positions and
 * predictions (Kreutz et al. 2012, BMC Syst. Biol. 6:120, doi:10.1186/1752-0509-6-120) with their intervals and
 * classification. Immutable.
 *
 * @param level    confidence level of the intervals, e.g. 0.95
 * @param bestNll  negative log-likelihood at the best fit the profiles start from
 * @param profiles one entry per profiled quantity
 */
public record ProfilesFile(double level, double bestNll, List<Entry> profiles) {

    /** Copies the list (null becomes empty). */
    public ProfilesFile {
        profiles = profiles == null ? List.of() : List.copyOf(profiles);
    }

    /** What was profiled. */
    public enum Kind {
        /** An estimated parameter. */
        @JsonProperty("parameter") PARAMETER,
        /** The control-parameter value of a fold (saddle-node) of the fitted model. */
        @JsonProperty("fold") FOLD,
        /** A model prediction (prediction profile). */
        @JsonProperty("prediction") PREDICTION
    }

    /** Identifiability class after Raue et al. 2009. */
    public enum Identifiability {
        /** The interval is closed on both sides. */
        @JsonProperty("identifiable") IDENTIFIABLE,
        /** The profile is open on at least one side but not flat. */
        @JsonProperty("practically-nonidentifiable") PRACTICALLY_NONIDENTIFIABLE,
        /** The profile is flat: the data do not constrain the quantity at all. */
        @JsonProperty("structurally-nonidentifiable") STRUCTURALLY_NONIDENTIFIABLE
    }

    /**
     * One profile.
     *
     * @param id             parameter id, fold id (as in {@code branches.json}) or prediction id
     * @param kind           what was profiled
     * @param scale          axis scale of the profiled quantity ({@code lin}, {@code log}, {@code log10})
     * @param estimate       best-fit value, linear scale
     * @param lower          lower interval end, linear scale; null when the profile does not cross the threshold
     *                       on that side (open)
     * @param upper          upper interval end, linear scale; null when open
     * @param thresholdNll   NLL level that defines the interval: {@code bestNll + chi2_1(level) / 2} for pointwise
     *                       intervals
     * @param classification identifiability class
     * @param compensating   ids of the parameters that change most along the profile (compensating the profiled
     *                       one), strongest first
     * @param points         profile points in ascending order of value
     */
    public record Entry(String id, Kind kind, String scale, double estimate, Double lower, Double upper,
                        double thresholdNll, @JsonProperty("class") Identifiability classification,
                        List<String> compensating, List<Point> points) {

        /** Copies the lists (null becomes empty). */
        public Entry {
            compensating = compensating == null ? List.of() : List.copyOf(compensating);
            points = points == null ? List.of() : List.copyOf(points);
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
}
