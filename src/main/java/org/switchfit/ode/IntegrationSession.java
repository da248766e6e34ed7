package org.switchfit.ode;

/**
 * One running integration: advances in time, stops at requested output times exactly and at sign changes of
 * the switching functions. Not thread-safe. Forward integration only (tOut &gt; current time).
 *
 * <p>Root semantics: when some g_k changes sign inside a step, the session locates the earliest such change by
 * bracketing on the dense output until the bracket [tL, tR] is narrower than
 * {@code 4 * ulp(max(|tR|, 1)) + 1e-12 * max(|tR|, 1)}, then stops at tR, where the new sign holds.
 */
public interface IntegrationSession {

    /**
     * Width of the bracket within which a root at time t is located (the contract above):
     * {@code 4 ulp(max(|t|, 1)) + 1e-12 max(|t|, 1)}, a few ulps at t near 1 and 1e-12 relative beyond.
     */
    static double rootBracketWidth(double t) {
        double scale = Math.max(Math.abs(t), 1.0);
        return 4 * Math.ulp(scale) + 1e-12 * scale;
    }

    /**
     * Advances to {@code tOut} or to the first root before it.
     *
     * @param tOut target time
     * @param yOut receives y at the time reached (length n)
     * @param sOut receives sensitivities at the time reached (layout as in {@link Integrator#start}), or null
     * @return the time reached: {@code tOut} or a root time &lt; tOut
     * @throws IntegrationException when the step size underflows, the step count is exceeded, Newton fails
     *                              repeatedly or values become non-finite
     */
    double advance(double tOut, double[] yOut, double[] sOut);

    /** True when the last {@link #advance} stopped at a root. */
    boolean stoppedAtRoot();

    /** Indices of switching functions whose sign changed at the last root (valid when {@link #stoppedAtRoot}). */
    int[] rootsFound();

    /** Current time. */
    double time();

    /**
     * Restarts at the current time from new values (after an event changed states or parameters). Solver history is
     * discarded.
     *
     * @param y new state (copied)
     * @param s new sensitivities or null to keep none/unchanged
     */
    void reset(double[] y, double[] s);

    /**
     * Asks the session not to step past time t until it reaches it (a discontinuity of the
     * right-hand side at t, known in advance); advancing to t then lands on t exactly.
     *
     * @return whether the session honours stop times (the default does not: it returns false)
     */
    default boolean stopAt(double t) {
        return false;
    }

    /**
     * Restarts at time t, at or slightly after the current time, from new values, as {@link #reset} does: used to
     * step over the sliver between the two sides of a located switch of the right-hand side. Supported where
     * {@link #stopAt} returns true.
     *
     * @throws UnsupportedOperationException by default
     */
    default void restartAt(double t, double[] y, double[] s) {
        throw new UnsupportedOperationException("this integration session cannot restart at another time");
    }

    /** Statistics: steps, right-hand-side calls, Jacobian evaluations, LU factorisations. */
    SolverStats stats();
}
