package org.switchfit.linalg;

/**
 * An LU factorisation of a square n x n matrix with a reusable workspace: factor once, solve many right-hand
 * sides. Input matrices are always given dense, flat and row-major ({@code a[i * n + j]}); sparse
 * implementations read only the entries of their structural pattern (and the diagonal).
 *
 * <p>Not thread-safe: one instance per thread. After construction no method allocates.
 */
public interface LuSolver {

    /** Dimension n. */
    int size();

    /**
     * Factors A.
     *
     * @param a matrix, {@code a[i * n + j] = A_ij}; read only, no reference kept
     * @return false when A is (numerically) singular; then {@link #solve} must not be called
     */
    boolean factor(double[] a);

    /**
     * Factors I - c A (the Newton iteration matrix of implicit integrators).
     *
     * @param c scalar
     * @param a matrix, {@code a[i * n + j] = A_ij}; read only, no reference kept
     * @return false when I - c A is (numerically) singular
     */
    boolean factorIdentityMinus(double c, double[] a);

    /**
     * Solves M x = b with the last factored M, in place.
     *
     * @param b right-hand side on entry (length n), solution on exit
     * @throws IllegalStateException when no successful factorisation is held
     */
    void solve(double[] b);

    /** True when the last factorisation found a singular matrix (or none was attempted yet). */
    boolean isSingular();
}
