package org.switchfit.linalg;

/** Factory choosing a dense or a sparse LU by size and structural density ({@link LinalgThresholds}). */
public final class LuSolvers {

    private LuSolvers() {
    }

    /**
     * Creates an LU workspace for n x n matrices with the given structure.
     *
     * @param n       dimension (&gt;= 0)
     * @param pattern {@code pattern[i]} lists, increasing, the columns of the possibly non-zero entries of row i; or
     *                null for a dense matrix. The diagonal is always included.
     * @return a {@link SparseLu} when n &gt;= {@link LinalgThresholds#SPARSE_MIN_SIZE} and the density is below
     *         {@link LinalgThresholds#SPARSE_MAX_DENSITY}, otherwise a {@link DenseLu}
     */
    public static LuSolver create(int n, int[][] pattern) {
        if (n < 0) {
            throw new IllegalArgumentException("dimension must be >= 0, got " + n);
        }
        if (pattern == null || !useSparse(n, pattern)) {
            return new DenseLu(n);
        }
        return new SparseLu(n, pattern);
    }

    /** True when the factory would choose the sparse kernel for this structure. */
    public static boolean useSparse(int n, int[][] pattern) {
        if (pattern == null || n < LinalgThresholds.SPARSE_MIN_SIZE) {
            return false;
        }
        long nnz = SparsePattern.countWithDiagonal(n, pattern);
        return nnz < LinalgThresholds.SPARSE_MAX_DENSITY * n * (double) n;
    }
}
