package org.switchfit.continuation;

/**
 * An underdetermined system H(u) = 0, H: R^{N+1} -> R^N, whose solution set is a curve. Implementations own
 * scratch space and are used by one thread.
 */
interface CurveProblem {

    /** N, the number of equations; u has N + 1 entries. */
    int equationCount();

    /** Writes H(u) into h (length N). */
    void evaluate(double[] u, double[] h);

    /** Writes the N x (N + 1) Jacobian row-major: {@code jac[i * (N + 1) + j] = ∂H_i/∂u_j}. */
    void jacobian(double[] u, double[] jac);

    /**
     * Structural pattern of the N x (N + 1) Jacobian: {@code pattern[i]} lists the increasing columns of row i
     * that may be non-zero; or null when the Jacobian of the underlying system is dense (then a dense solver is
     * used).
     */
    int[][] pattern();
}
