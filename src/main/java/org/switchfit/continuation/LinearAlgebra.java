package org.switchfit.continuation;

/**
 * Which LU factorisation the continuation's bordered Newton and tangent systems use ({@link ContinuationSettings}).
 * The two give the same branch up to rounding; they differ in cost and in their singularity test (the dense one
 * stops only at an exactly zero pivot, the sparse one at a pivot below {@code 8 eps n max|a_ij|}, see
 * {@code org.switchfit.linalg.SparseLu}).
 */
public enum LinearAlgebra {
    /**
     * Sparse when the bordered matrix {@code [J, f_λ; t^T]} (order n + 1, its structural pattern) passes the
     * size and density thresholds of {@code org.switchfit.linalg.LuSolvers#useSparse}, dense otherwise.
     */
    AUTO,
    /** Dense LU with partial pivoting. */
    DENSE,
    /** Sparse LU on the Jacobian's structural pattern, whatever its size; dense when the system's pattern is
     * structurally full (no structure known). */
    SPARSE
}
