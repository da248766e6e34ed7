package org.switchfit.continuation;

/**
 * One computed equilibrium on a {@link Branch}.
 *
 * @param parameter     value of the control parameter λ
 * @param state         y (of the system that was continued; for a {@link ReducedSystem} the independent species)
 * @param unstableCount eigenvalues with positive real part, or -1 when not computed
 * @param eigenReal     eigenvalue real parts, decreasing (empty when not computed)
 * @param eigenImag     matching imaginary parts
 * @param paramSlope    dλ/ds, the λ component of the unit tangent in the travel direction of the branch
 * @param arclength     arclength s from the first point of the branch (in units of the (y, λ) Euclidean norm)
 */
public record BranchPoint(double parameter, double[] state, int unstableCount, double[] eigenReal,
                          double[] eigenImag, double paramSlope, double arclength) {

    /** Copies the arrays. */
    public BranchPoint {
        state = state.clone();
        eigenReal = eigenReal.clone();
        eigenImag = eigenImag.clone();
    }

    @Override
    public double[] state() {
        return state.clone();
    }

    @Override
    public double[] eigenReal() {
        return eigenReal.clone();
    }

    @Override
    public double[] eigenImag() {
        return eigenImag.clone();
    }

    /** Linearly stable (false when unknown). */
    public boolean stable() {
        return unstableCount == 0;
    }

    BranchPoint reversed(double totalLength) {
        return new BranchPoint(parameter, state, unstableCount, eigenReal, eigenImag, -paramSlope,
                totalLength - arclength);
    }

    BranchPoint shifted(double ds) {
        return new BranchPoint(parameter, state, unstableCount, eigenReal, eigenImag, paramSlope, arclength + ds);
    }
}
