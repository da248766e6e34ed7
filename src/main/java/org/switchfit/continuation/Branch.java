package org.switchfit.continuation;

import java.util.List;

/**
 * A continued branch of equilibria in one control parameter: points in order of arclength, the folds and Hopf
 * points found between them, and why each end stopped. Immutable.
 *
 * @param control    index of λ in the parameter vector of the continued system
 * @param points     computed points, in travel order
 * @param folds      folds, in travel order
 * @param hopfs      Hopf points, in travel order
 * @param startEnd   why the branch ends before its first point ({@link EndReason#START} for a one-sided trace)
 * @param finishEnd  why the branch ends after its last point
 */
public record Branch(int control, List<BranchPoint> points, List<Fold> folds, List<Hopf> hopfs,
                     EndReason startEnd, EndReason finishEnd) {

    /** Why tracing stopped at an end. */
    public enum EndReason {
        /** The trace started here (one-sided trace). */
        START,
        /** λ reached a bound; the end point lies exactly on it. */
        BOUNDARY,
        /** The point limit was reached. */
        MAX_POINTS,
        /** The step size fell below the minimum (corrector kept failing). */
        STEP_TOO_SMALL,
        /** The tangent could not be computed (singular bordered matrix, e.g. a branch point). */
        SINGULAR
    }

    /** Copies the lists. */
    public Branch {
        points = List.copyOf(points);
        folds = List.copyOf(folds);
        hopfs = List.copyOf(hopfs);
    }

    /** Number of points. */
    public int size() {
        return points.size();
    }

    /** Point i. */
    public BranchPoint point(int i) {
        return points.get(i);
    }
}
