package org.switchfit.linalg;

import org.ejml.data.DMatrixRMaj;
import org.ejml.data.DMatrixSparseCSC;
import org.ejml.sparse.csc.decomposition.lu.LuUpLooking_DSCC;
import org.ejml.interfaces.linsol.LinearSolverSparse;
import org.ejml.sparse.FillReducing;
import org.ejml.sparse.csc.factory.LinearSolverFactory_DSCC;

/**
 * Sparse LU with partial pivoting for large sparse systems, on top of EJML's up-looking sparse LU
 * ({@code LinearSolverFactory_DSCC.lu}, the Gilbert-Peierls left/up-looking scheme as in Davis, "Direct Methods
 * for Sparse Linear Systems", SIAM 2006).
 *
 * <p>Symbolic work is done once in the constructor and reused by every factorisation: a symmetric fill-reducing
 * permutation (minimum degree on A + A^T, {@link SparsePattern#minimumDegreeOrder}; EJML 0.43.1 itself offers no
 * fill-reducing ordering besides identity and random), the compressed-column structure of P A P^T and a map from
 * each structural non-zero to its dense row-major index. {@link #factor} then only gathers values and runs the
 * numeric factorisation. The first factorisation (and any after a refused refactorisation) runs EJML with partial
 * pivoting; later ones reuse its pivot order and fill structure (the "refactor" of KLU, Davis &amp; Palamadai
 * Natarajan, ACM TOMS 37(3):36, 2010) as long as every pivot stays within a factor 1e3 of its column maximum.
 * Entries of the dense input outside the pattern (plus diagonal) are ignored: the pattern must be a superset of
 * the true structure.
 *
 * <p>Not thread-safe.
 */
public final class SparseLu implements LuSolver {

    private final int n;
    private final Symbolic symbolic;
    /** order[k'] = original index of permuted index k'. */
    private final int[] order;
    private final int[] denseIndex;
    private final boolean[] isDiagonal;
    private final DMatrixSparseCSC matrix;
    private final LinearSolverSparse<DMatrixSparseCSC, DMatrixRMaj> solver;
    private final SparseFactors factors;
    private final double[] work1;
    private final double[] work2;
    private boolean singular = true;
    private long pivotingCount;
    private long refactorCount;

    /**
     * Result of the symbolic analysis: fill-reducing order, compressed-column structure of P A P^T and the map to
     * dense indices. Immutable and thread-safe, so one analysis can serve many workspaces (for example every
     * integration of the same model).
     */
    public static final class Symbolic {
        final int n;
        final int[] order;
        final int[] colIdx;
        final int[] rows;
        final int[] denseIndex;
        final boolean[] isDiagonal;

        private Symbolic(int n, int[] order, int[] colIdx, int[] rows, int[] denseIndex) {
            this.n = n;
            this.order = order;
            this.colIdx = colIdx;
            this.rows = rows;
            this.denseIndex = denseIndex;
            this.isDiagonal = new boolean[denseIndex.length];
            for (int s = 0; s < denseIndex.length; s++) {
                isDiagonal[s] = denseIndex[s] / n == denseIndex[s] % n;
            }
        }

        /** Dimension n. */
        public int size() {
            return n;
        }

        /** Structural non-zeros (diagonal included). */
        public int nonZeros() {
            return denseIndex.length;
        }
    }

    /**
     * Symbolic analysis of a pattern (setup cost: minimum-degree ordering, allocates).
     *
     * @param n       dimension
     * @param pattern {@code pattern[i]} = increasing columns of row i that may be non-zero (diagonal implied)
     */
    public static Symbolic analyze(int n, int[][] pattern) {
        int nnz = Math.toIntExact(SparsePattern.countWithDiagonal(n, pattern));
        int[] order = SparsePattern.minimumDegreeOrder(n, pattern);
        int[] inverse = new int[n];
        for (int k = 0; k < n; k++) {
            inverse[order[k]] = k;
        }
        // Count entries per permuted column, then fill rows in increasing permuted order.
        int[] colCount = new int[n];
        for (int i = 0; i < n; i++) {
            boolean diag = false;
            for (int j : pattern[i]) {
                colCount[inverse[j]]++;
                diag |= j == i;
            }
            if (!diag) {
                colCount[inverse[i]]++;
            }
        }
        int[] colIdx = new int[n + 1];
        for (int c = 0; c < n; c++) {
            colIdx[c + 1] = colIdx[c] + colCount[c];
        }
        int[] fill = new int[n];
        int[] rows = new int[nnz];
        int[] dense = new int[nnz];
        // Walk permuted rows in increasing order so each column's row list comes out sorted.
        for (int rp = 0; rp < n; rp++) {
            int i = order[rp];
            boolean diag = false;
            for (int j : pattern[i]) {
                int cp = inverse[j];
                int slot = colIdx[cp] + fill[cp]++;
                rows[slot] = rp;
                dense[slot] = i * n + j;
                diag |= j == i;
            }
            if (!diag) {
                int cp = inverse[i];
                int slot = colIdx[cp] + fill[cp]++;
                rows[slot] = rp;
                dense[slot] = i * n + i;
            }
        }
        return new Symbolic(n, order, colIdx, rows, dense);
    }

    /**
     * Builds the symbolic structure and a workspace.
     *
     * @param n       dimension
     * @param pattern {@code pattern[i]} = increasing columns of row i that may be non-zero (diagonal implied)
     */
    public SparseLu(int n, int[][] pattern) {
        this(analyze(n, pattern));
    }

    /** Creates a workspace on an existing symbolic analysis (cheap: no ordering work). */
    public SparseLu(Symbolic symbolic) {
        this.symbolic = symbolic;
        this.n = symbolic.n;
        this.order = symbolic.order;
        this.denseIndex = symbolic.denseIndex;
        this.isDiagonal = symbolic.isDiagonal;
        int nnz = denseIndex.length;
        this.matrix = new DMatrixSparseCSC(n, n, nnz);
        System.arraycopy(symbolic.colIdx, 0, matrix.col_idx, 0, n + 1);
        System.arraycopy(symbolic.rows, 0, matrix.nz_rows, 0, nnz);
        matrix.nz_length = nnz;
        matrix.indicesSorted = true;
        this.solver = LinearSolverFactory_DSCC.lu(FillReducing.NONE);
        this.factors = new SparseFactors(n);
        this.work1 = new double[n];
        this.work2 = new double[n];
    }

    /** The symbolic analysis this workspace uses. */
    public Symbolic symbolic() {
        return symbolic;
    }

    @Override
    public int size() {
        return n;
    }

    /** Number of structural non-zeros (diagonal included). */
    public int nonZeros() {
        return denseIndex.length;
    }

    @Override
    public boolean factor(double[] a) {
        double[] v = matrix.nz_values;
        int nnz = denseIndex.length;
        for (int s = 0; s < nnz; s++) {
            v[s] = a[denseIndex[s]];
        }
        return numeric();
    }

    @Override
    public boolean factorIdentityMinus(double c, double[] a) {
        double[] v = matrix.nz_values;
        int nnz = denseIndex.length;
        for (int s = 0; s < nnz; s++) {
            double x = -c * a[denseIndex[s]];
            v[s] = isDiagonal[s] ? 1.0 + x : x;
        }
        return numeric();
    }

    private boolean numeric() {
        double[] v = matrix.nz_values;
        int nnz = denseIndex.length;
        double maxAbs = 0.0;
        for (int s = 0; s < nnz; s++) {
            double a = Math.abs(v[s]);
            if (!(a < Double.POSITIVE_INFINITY)) {
                singular = true;
                factors.invalidate();
                return false;
            }
            maxAbs = Math.max(maxAbs, a);
        }
        double tiny = LinalgThresholds.SINGULAR_REL * n * maxAbs;
        if (factors.isValid() && factors.refactor(matrix.col_idx, matrix.nz_rows, v, tiny)) {
            singular = false;
            refactorCount++;
            return true;
        }
        // Full factorisation with partial pivoting; its pivot order and fill serve later refactorisations.
        pivotingCount++;
        singular = !solver.setA(matrix);
        if (!singular) {
            LuUpLooking_DSCC lu = solver.getDecomposition();
            factors.extract(lu.getL(), lu.getU(), lu.getPinv());
            // EJML flags only exact zero pivots; apply the same relative pivot test as DenseLu.
            double d = factors.minAbsDiagonal();
            singular = !(d > tiny);
        }
        if (singular) {
            factors.invalidate();
        }
        return !singular;
    }

    /** Number of factorisations done with partial pivoting (graph search) since construction. */
    public long pivotingFactorizations() {
        return pivotingCount;
    }

    /** Number of factorisations done by refactoring with the stored pivot order since construction. */
    public long refactorizations() {
        return refactorCount;
    }

    @Override
    public void solve(double[] b) {
        if (singular) {
            throw new IllegalStateException("no valid LU factorisation held (singular or not factored)");
        }
        double[] r = work1;
        for (int k = 0; k < n; k++) {
            r[k] = b[order[k]];
        }
        factors.solve(r, work2);
        for (int k = 0; k < n; k++) {
            b[order[k]] = r[k];
        }
    }

    @Override
    public boolean isSingular() {
        return singular;
    }
}
