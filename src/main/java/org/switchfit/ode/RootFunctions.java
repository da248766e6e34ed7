package org.switchfit.ode;

/**
 * Switching functions g(t, y, p) whose sign changes an integration must stop at (event triggers, for example).
 * Immutable, thread-safe, allocation-free per call.
 */
public interface RootFunctions {

    /** Number of switching functions. */
    int count();

    /** Writes {@code g[0..count())} at (t, y, p). */
    void evaluate(double t, double[] y, double[] p, double[] g);
}
