package org.switchfit.continuation;

/**
 * An equilibrium f(y, p) = 0 with its linear stability.
 *
 * @param state         y (length n of the system it was computed on); copied in and out
 * @param parameters    p used; copied in and out
 * @param residualNorm  max-norm of f at the returned state
 * @param unstableCount number of Jacobian eigenvalues with positive real part, or -1 when eigenvalues were not
 *                      computed
 * @param eigenReal     real parts of the eigenvalues, decreasing, or an empty array when not computed
 * @param eigenImag     imaginary parts matching {@code eigenReal}
 * @param iterations    Newton plus pseudo-transient iterations used
 */
public record SteadyState(double[] state, double[] parameters, double residualNorm, int unstableCount,
                          double[] eigenReal, double[] eigenImag, int iterations) {

    /** Copies the arrays. */
    public SteadyState {
        state = state.clone();
        parameters = parameters.clone();
        eigenReal = eigenReal.clone();
        eigenImag = eigenImag.clone();
    }

    @Override
    public double[] state() {
        return state.clone();
    }

    @Override
    public double[] parameters() {
        return parameters.clone();
    }

    @Override
    public double[] eigenReal() {
        return eigenReal.clone();
    }

    @Override
    public double[] eigenImag() {
        return eigenImag.clone();
    }

    /** Linearly stable: all eigenvalues in the open left half-plane (false when unknown). */
    public boolean stable() {
        return unstableCount == 0;
    }
}
