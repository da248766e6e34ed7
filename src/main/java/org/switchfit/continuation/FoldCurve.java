package org.switchfit.continuation;

import java.util.List;

/**
 * A curve of folds in two parameters, with the cusps on it. Immutable.
 *
 * @param control1  index of the first parameter (the original control)
 * @param control2  index of the second parameter
 * @param points    fold points in travel order
 * @param cusps     cusp points (quadratic coefficient a = 0) in travel order
 * @param startEnd  why the curve stops before its first point
 * @param finishEnd why the curve stops after its last point
 */
public record FoldCurve(int control1, int control2, List<Point> points, List<Cusp> cusps, Branch.EndReason startEnd,
                        Branch.EndReason finishEnd) {

    /**
     * One fold on the curve.
     *
     * @param p1        value of parameter control1
     * @param p2        value of parameter control2
     * @param state     y at the fold
     * @param quadratic normal-form coefficient a = w^T D²f(v, v) with w^T v = 1 (changes sign at a cusp)
     */
    public record Point(double p1, double p2, double[] state, double quadratic) {
        /** Copies the state. */
        public Point {
            state = state.clone();
        }

        @Override
        public double[] state() {
            return state.clone();
        }
    }

    /**
     * A cusp: two folds meet and the bistable region closes (Kuznetsov 2004, sec. 8.2).
     *
     * @param p1         value of parameter control1
     * @param p2         value of parameter control2
     * @param state      y at the cusp
     * @param afterPoint index of the point just before the cusp
     */
    public record Cusp(double p1, double p2, double[] state, int afterPoint) {
        /** Copies the state. */
        public Cusp {
            state = state.clone();
        }

        @Override
        public double[] state() {
            return state.clone();
        }
    }

    /** Copies the lists. */
    public FoldCurve {
        points = List.copyOf(points);
        cusps = List.copyOf(cusps);
    }
}
