package org.switchfit.ode;

/**
 * Factory of integration sessions for one method. Configured integrators are immutable and shareable; each
 * {@link IntegrationSession} belongs to one thread.
 */
public interface Integrator {

    /**
     * Starts integrating {@code sys} from (t0, y0) with parameters p.
     *
     * @param sys        the ODE system
     * @param t0         initial time
     * @param y0         initial state, length n (copied)
     * @param p          parameters, length m (the session keeps a reference; do not modify during the session)
     * @param roots      switching functions to stop at, or null
     * @param sensParams indices k (into p) of parameters for forward sensitivities, or null for none. Each
     *                   sensitivity column obeys s' = J_y s + ∂f/∂p_k; columns may also hold sensitivities to
     *                   initial values (use index -1 for such a column: its equation is s' = J_y s)
     * @param s0         initial sensitivities, flat {@code s0[c * n + i] = ∂y_i/∂θ_c} for column c, or null
     * @return a session positioned at t0
     */
    IntegrationSession start(OdeSystem sys, double t0, double[] y0, double[] p, RootFunctions roots,
                             int[] sensParams, double[] s0);
}
