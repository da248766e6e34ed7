package org.switchfit.continuation;

import org.switchfit.linalg.DenseLu;
import org.switchfit.linalg.LuSolver;
import org.switchfit.linalg.LuSolvers;

/**
 * Chooses the {@link LinearSolver} implementation: the single place that decides dense versus sparse. Sparse
 * factorisations come from {@code org.switchfit.linalg} ({@link LuSolvers}, which applies its own size and
 * density thresholds); dense ones are {@link org.switchfit.linalg.DenseLu} with the exact-zero pivot test (rel = 0,
 * see {@link org.switchfit.linalg.DenseLu#withPivotThreshold}), because Newton iterations here run next to
 * singular Jacobians at folds and judge convergence by residuals.
 */
final class LinearSolvers {
    private LinearSolvers() {
    }

    /** A dense solver for systems of order n (supports transposed solves). */
    static LinearSolver dense(int n) {
        return new Dense(n);
    }

    /** A dense solver (no structure known). */
    static LinearSolver forSize(int n) {
        return new Dense(n);
    }

    /**
     * A solver for n x n matrices whose row i may be non-zero only in the columns {@code pattern[i]}
     * (increasing; diagonal implied): sparse LU when {@link LuSolvers#useSparse} says so, else dense.
     */
    static LinearSolver forPattern(int n, int[][] pattern) {
        if (pattern == null || !LuSolvers.useSparse(n, pattern)) {
            return new Dense(n);
        }
        return new SparseAdapter(LuSolvers.create(n, pattern));
    }

    /**
     * A sparse LU for n x n matrices with this row pattern whatever the size thresholds say (an explicit choice,
     * {@link LinearAlgebra#SPARSE}); same adapter as {@link #forPattern}.
     */
    static LinearSolver sparse(int n, int[][] pattern) {
        return new SparseAdapter(new org.switchfit.linalg.SparseLu(n, pattern));
    }

    /**
     * Whether the bordered matrix {@code [A; dense row]} of order n + 1, where {@code rows} gives the pattern of
     * the first n rows (n + 1 columns), passes the sparse thresholds of {@link LuSolvers#useSparse}: the decision
     * is taken on the matrix that is actually factored, its dense last row included.
     */
    static boolean isSparseBordered(int n, int[][] rows) {
        int[][] bordered = new int[n + 1][];
        System.arraycopy(rows, 0, bordered, 0, n);
        bordered[n] = denseRow(0, n + 1);
        return LuSolvers.useSparse(n + 1, bordered);
    }

    /**
     * Whether a Jacobian with this row pattern is sparse enough for the sparse LU (bordering adds a row and a
     * column, which does not change the decision materially). Callers skip building bordered patterns otherwise.
     */
    static boolean isSparse(int n, int[][] jacobianPattern) {
        return jacobianPattern != null && LuSolvers.useSparse(n, jacobianPattern);
    }

    /** Adapter over {@link DenseLu} (exact-zero pivot test); a new workspace when the order changes. */
    private static final class Dense implements LinearSolver {
        private DenseLu lu;

        Dense(int n) {
            this.lu = DenseLu.withPivotThreshold(n, 0.0);
        }

        @Override
        public boolean factor(double[] a, int n) {
            if (n != lu.size()) {
                lu = DenseLu.withPivotThreshold(n, 0.0);
            }
            return lu.factor(a);
        }

        @Override
        public void solve(double[] b, double[] x) {
            if (b != x) {
                System.arraycopy(b, 0, x, 0, lu.size());
            }
            lu.solve(x);
        }

        @Override
        public void solveTransposed(double[] b, double[] x) {
            if (b != x) {
                System.arraycopy(b, 0, x, 0, lu.size());
            }
            lu.solveTransposed(x);
        }
    }

    /** Adapter over a linalg LU; no transposed solve. */
    static final class SparseAdapter implements LinearSolver {
        private final LuSolver lu;

        SparseAdapter(LuSolver lu) {
            this.lu = lu;
        }

        @Override
        public boolean factor(double[] a, int n) {
            if (n != lu.size()) {
                throw new IllegalArgumentException("matrix order " + n + " differs from the pattern's " + lu.size());
            }
            return lu.factor(a);
        }

        @Override
        public void solve(double[] b, double[] x) {
            if (b != x) {
                System.arraycopy(b, 0, x, 0, lu.size());
            }
            lu.solve(x);
        }

        @Override
        public void solveTransposed(double[] b, double[] x) {
            throw new UnsupportedOperationException("sparse LU has no transposed solve; use LinearSolvers.dense");
        }
    }

    /** Union of sorted column lists (each increasing), with extra columns, as an increasing array. */
    static int[] union(int[] a, int offsetA, int[] b, int offsetB, int... extra) {
        java.util.TreeSet<Integer> set = new java.util.TreeSet<>();
        if (a != null) {
            for (int j : a) {
                set.add(j + offsetA);
            }
        }
        if (b != null) {
            for (int j : b) {
                set.add(j + offsetB);
            }
        }
        for (int j : extra) {
            set.add(j);
        }
        int[] out = new int[set.size()];
        int k = 0;
        for (int j : set) {
            out[k++] = j;
        }
        return out;
    }

    /** Row pattern 0..n-1 (dense row). */
    static int[] denseRow(int from, int to) {
        int[] r = new int[to - from];
        for (int j = from; j < to; j++) {
            r[j - from] = j;
        }
        return r;
    }
}
