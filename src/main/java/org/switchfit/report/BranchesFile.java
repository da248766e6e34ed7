package org.switchfit.report;

import com.fasterxml.jackson.annotation.JsonProperty;
import java.util.List;
import java.util.Map;

/**
 * Content of {@code branches.json}, written by {@code switchfit branches}: steady-state branches of the fitted
 * model against one control parameter (pseudo-arclength continuation), their folds and Hopf points, and the
 * measured switching thresholds for comparison. Immutable apart from the arrays inside points, which are copied
 * in and out.
 *
 * @param control    id of the control parameter
 * @param range      {@code [min, max]} of the control parameter that was traced
 * @param stateIds   state ids, the order of {@link Point#states()}
 * @param folds      special points (folds and Hopf points)
 * @param branches   traced branches
 * @param thresholds measured switching thresholds (empty when the data have none)
 */
public record BranchesFile(String control, double[] range, List<String> stateIds, List<Special> folds,
                           List<Branch> branches, List<Threshold> thresholds) {

    /** Validates and copies. */
    public BranchesFile {
        range = FileArrays.copy(range, "range");
        if (range.length != 2) {
            throw new IllegalArgumentException("range must be [min, max], got " + range.length + " numbers");
        }
        stateIds = stateIds == null ? List.of() : List.copyOf(stateIds);
        folds = folds == null ? List.of() : List.copyOf(folds);
        branches = branches == null ? List.of() : List.copyOf(branches);
        thresholds = thresholds == null ? List.of() : List.copyOf(thresholds);
    }

    @Override
    public double[] range() {
        return range.clone();
    }

    /** Kind of a special point. */
    public enum Kind {
        /** Saddle-node (fold, limit point). */
        @JsonProperty("fold") FOLD,
        /** Andronov-Hopf point. */
        @JsonProperty("hopf") HOPF
    }

    /**
     * A fold or Hopf point.
     *
     * @param id        identifier, e.g. {@code fold1}; fold profiles in {@code profiles.json} use the same id
     * @param parameter control parameter id
     * @param value     control parameter value at the point
     * @param states    steady state at the point, by state id
     * @param kind      fold or Hopf
     */
    public record Special(String id, String parameter, double value, Map<String, Double> states, Kind kind) {
        /** Copies the map in order. */
        public Special {
            states = states == null ? Map.of()
                    : java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(states));
        }
    }

    /**
     * One branch.
     *
     * @param id     branch label
     * @param points points in continuation order
     */
    public record Branch(String id, List<Point> points) {
        /** Copies the list. */
        public Branch {
            points = points == null ? List.of() : List.copyOf(points);
        }
    }

    /**
     * One point on a branch.
     *
     * @param value     control parameter value
     * @param states    steady state, in {@code stateIds} order
     * @param stable    whether all eigenvalues of the Jacobian have negative real part; null when they could not be
     *                  computed (stability unknown)
     * @param eigenReal real parts of the eigenvalues (may be empty when not computed)
     * @param eigenImag imaginary parts, same length as eigenReal
     */
    public record Point(double value, double[] states, Boolean stable, double[] eigenReal, double[] eigenImag) {
        /** Validates and copies. */
        public Point {
            states = FileArrays.copy(states, "states");
            eigenReal = eigenReal == null ? new double[0] : eigenReal.clone();
            eigenImag = eigenImag == null ? new double[0] : eigenImag.clone();
            if (eigenReal.length != eigenImag.length) {
                throw new IllegalArgumentException("eigenReal and eigenImag differ in length: " + eigenReal.length
                        + " vs " + eigenImag.length);
            }
        }

        @Override
        public double[] states() {
            return states.clone();
        }

        @Override
        public double[] eigenReal() {
            return eigenReal.clone();
        }

        @Override
        public double[] eigenImag() {
            return eigenImag.clone();
        }
    }

    /**
     * A measured switching threshold.
     *
     * @param id        data id
     * @param value     measured control parameter value at which the switch happened
     * @param sigma     its standard deviation
     * @param direction {@code up} or {@code down} (the sweep direction of the experiment)
     * @param fold      id of the fold it is matched to, or null
     */
    public record Threshold(String id, double value, double sigma, String direction, String fold) {
    }
}
