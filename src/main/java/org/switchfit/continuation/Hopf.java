package org.switchfit.continuation;

/**
 * A Hopf point on a branch of equilibria: a complex pair of Jacobian eigenvalues ±iω crosses the imaginary axis
 * (Kuznetsov 2004, Elements of Applied Bifurcation Theory, 3rd ed., sec. 3.4 and 10.2.2). The direction
 * (sub/supercritical, first Lyapunov coefficient) is not computed.
 *
 * @param control    index of λ in the parameter vector
 * @param parameter  λ at the crossing (real part of the critical pair zero to the refinement tolerance)
 * @param state      y at the crossing
 * @param frequency  ω &gt; 0, the imaginary part of the critical pair
 * @param afterPoint index of the branch point just before the Hopf point
 */
public record Hopf(int control, double parameter, double[] state, double frequency, int afterPoint) {

    /** Copies the state. */
    public Hopf {
        state = state.clone();
    }

    @Override
    public double[] state() {
        return state.clone();
    }

    Hopf withAfterPoint(int index) {
        return new Hopf(control, parameter, state, frequency, index);
    }
}
