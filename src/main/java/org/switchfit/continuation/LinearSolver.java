package org.switchfit.continuation;

/**
 * Factor-once, solve-many square linear solver used by every Newton iteration in this package. Kept
 * package-private and narrow so that a sparse LU (from {@code org.switchfit.linalg}) can replace the dense one by
 * changing {@link LinearSolvers} only.
 *
 * <p>Matrices are flat row-major: {@code a[i * n + j]}. Implementations own a workspace and are not thread-safe.
 */
interface LinearSolver {

    /**
     * Factors the n x n matrix {@code a} (read, not kept).
     *
     * @return false when the matrix is numerically singular (a zero pivot was met)
     */
    boolean factor(double[] a, int n);

    /** Solves A x = b with the last factorisation; {@code b} and {@code x} may be the same array. */
    void solve(double[] b, double[] x);

    /**
     * Solves A^T x = b with the last factorisation; {@code b} and {@code x} may be the same array.
     *
     * @throws UnsupportedOperationException for implementations without a transposed solve (sparse); obtain a
     *                                       solver from {@link LinearSolvers#dense} when it is needed
     */
    void solveTransposed(double[] b, double[] x);
}
