package org.switchfit.linalg;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertInstanceOf;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.LUDecomposition;
import org.junit.jupiter.api.Test;

class SparseLuTest {

    private static final long SEED = 424242L;

    /** Random sparse matrix with about k off-diagonal entries per row plus the diagonal; returns pattern. */
    static int[][] randomPattern(Random rnd, int n, int k) {
        int[][] pattern = new int[n][];
        for (int i = 0; i < n; i++) {
            boolean[] used = new boolean[n];
            used[i] = rnd.nextBoolean(); // sometimes leave the diagonal implicit
            for (int t = 0; t < k; t++) {
                used[rnd.nextInt(n)] = true;
            }
            List<Integer> cols = new ArrayList<>();
            for (int j = 0; j < n; j++) {
                if (used[j]) {
                    cols.add(j);
                }
            }
            pattern[i] = cols.stream().mapToInt(Integer::intValue).toArray();
        }
        return pattern;
    }

    static double[] fill(Random rnd, int n, int[][] pattern, double diag) {
        double[] a = new double[n * n];
        for (int i = 0; i < n; i++) {
            for (int j : pattern[i]) {
                a[i * n + j] = rnd.nextGaussian();
            }
            a[i * n + i] += diag;
        }
        return a;
    }

    @Test
    void solvesLikeCommonsMathAndDenseLu() {
        int n = 300;
        Random rnd = new Random(SEED);
        int[][] pattern = randomPattern(rnd, n, 4);
        SparseLu sparse = new SparseLu(n, pattern);
        DenseLu dense = new DenseLu(n);
        for (int rep = 0; rep < 3; rep++) {
            // Diagonal 0.5 keeps it far from diagonally dominant, so pivoting matters.
            double[] a = fill(rnd, n, pattern, 0.5);
            assertTrue(sparse.factor(a));
            assertTrue(dense.factor(a));
            LUDecomposition oracle = new LUDecomposition(new Array2DRowRealMatrix(DenseLuTest.toRows(a, n)));
            double[] b = new double[n];
            for (int i = 0; i < n; i++) {
                b[i] = rnd.nextGaussian();
            }
            double[] expected = oracle.getSolver().solve(new ArrayRealVector(b)).toArray();
            double[] x = b.clone();
            sparse.solve(x);
            double[] y = b.clone();
            dense.solve(y);
            // Oracle: Apache Commons Math 3.6.1 LUDecomposition. Error ~cond(A) eps; 1e-8 relative to max|x|
            // allows cond up to ~1e7 for these random sparse matrices.
            double tol = 1e-8 * Math.max(1, DenseLuTest.maxAbs(expected));
            assertArrayEquals(expected, x, tol);
            assertArrayEquals(expected, y, tol);
        }
    }

    @Test
    void identityMinusUsesPatternAndDiagonal() {
        int n = 150;
        Random rnd = new Random(SEED + 1);
        int[][] pattern = randomPattern(rnd, n, 3);
        double[] j = fill(rnd, n, pattern, 0.0);
        double c = 2.5;
        SparseLu sparse = new SparseLu(n, pattern);
        DenseLu dense = new DenseLu(n);
        assertTrue(sparse.factorIdentityMinus(c, j));
        assertTrue(dense.factorIdentityMinus(c, j));
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = Math.sin(i);
        }
        double[] y = x.clone();
        sparse.solve(x);
        dense.solve(y);
        // Two LU orderings of the same matrix: agreement to ~cond * eps; 1e-9 absolute for O(1) solutions.
        assertArrayEquals(y, x, 1e-9 * Math.max(1, DenseLuTest.maxAbs(y)));
    }

    @Test
    void detectsSingular() {
        int n = 120;
        Random rnd = new Random(SEED + 2);
        int[][] pattern = randomPattern(rnd, n, 3);
        double[] a = fill(rnd, n, pattern, 3.0);
        // Zero out row 17 entirely: structurally present but numerically singular.
        for (int jj = 0; jj < n; jj++) {
            a[17 * n + jj] = 0;
        }
        SparseLu sparse = new SparseLu(n, pattern);
        assertFalse(sparse.factor(a));
        assertTrue(sparse.isSingular());
        assertTrue(sparse.factor(fill(rnd, n, pattern, 3.0)), "recovers on a regular matrix");
    }

    @Test
    void factoryChoosesByThresholds() {
        Random rnd = new Random(SEED + 3);
        assertInstanceOf(DenseLu.class, LuSolvers.create(30, randomPattern(rnd, 30, 2)));
        assertInstanceOf(DenseLu.class, LuSolvers.create(300, null));
        assertInstanceOf(SparseLu.class, LuSolvers.create(300, randomPattern(rnd, 300, 4)));
        // 300 x 300 with 60 entries per row = 20 % density: dense.
        assertInstanceOf(DenseLu.class, LuSolvers.create(300, randomPattern(rnd, 300, 70)));
    }

    @Test
    void minimumDegreeIsAPermutation() {
        Random rnd = new Random(SEED + 4);
        int n = 200;
        int[] order = SparsePattern.minimumDegreeOrder(n, randomPattern(rnd, n, 3));
        boolean[] seen = new boolean[n];
        for (int k : order) {
            assertFalse(seen[k]);
            seen[k] = true;
        }
        // Arrow matrix (dense first row and column): minimum degree must eliminate the hub last
        // (George & Liu 1989: the hub has the largest degree until the end).
        int[][] arrow = new int[n][];
        arrow[0] = new int[n];
        for (int j = 0; j < n; j++) {
            arrow[0][j] = j;
        }
        for (int i = 1; i < n; i++) {
            arrow[i] = new int[] {0, i};
        }
        int[] ao = SparsePattern.minimumDegreeOrder(n, arrow);
        assertTrue(ao[n - 1] == 0 || ao[n - 2] == 0);
    }

    @Test
    void planSharesOneSymbolicAnalysisAcrossWorkspaces() {
        int n = 200;
        Random rnd = new Random(SEED + 5);
        int[][] pattern = randomPattern(rnd, n, 3);
        LuPlan plan = LuPlan.of(n, pattern);
        assertTrue(plan.isSparse());
        SparseLu a = (SparseLu) plan.newSolver();
        SparseLu b = (SparseLu) plan.newSolver();
        assertTrue(a.symbolic() == b.symbolic(), "same analysis object");
        double[] m = fill(rnd, n, pattern, 2.0);
        assertTrue(a.factor(m));
        assertTrue(b.factor(m));
        double[] x = new double[n];
        java.util.Arrays.fill(x, 1.0);
        double[] y = x.clone();
        a.solve(x);
        b.solve(y);
        // Same structure, same arithmetic: bitwise identical results (reproducibility, common practice).
        assertArrayEquals(x, y, 0.0);
        assertFalse(LuPlan.of(30, pattern.length == 30 ? pattern : randomPattern(rnd, 30, 2)).isSparse());
    }

    @Test
    void refactorizationReusesPivotsAndFallsBackWhenAPivotCollapses() {
        int n = 150;
        Random rnd = new Random(SEED + 6);
        int[][] pattern = randomPattern(rnd, n, 3);
        SparseLu sparse = new SparseLu(n, pattern);
        for (int rep = 0; rep < 4; rep++) {
            double[] a = fill(rnd, n, pattern, 4.0);
            assertTrue(sparse.factor(a));
            checkAgainstOracle(sparse, a, rnd);
        }
        // Diagonally weighted matrices keep the first pivot order acceptable: one pivoting factorisation only.
        assertEquals(1, sparse.pivotingFactorizations());
        assertEquals(3, sparse.refactorizations());
        // Now zero every diagonal entry: the stored pivots (mostly diagonal) collapse, so the refactorisation must
        // refuse and a new pivoting factorisation must still solve correctly (if the matrix is regular).
        double[] b = fill(rnd, n, pattern, 0.0);
        for (int i = 0; i < n; i++) {
            b[i * n + i] = 0.0;
        }
        if (new DenseLu(n).factor(b)) {
            assertTrue(sparse.factor(b));
            assertEquals(2, sparse.pivotingFactorizations());
            checkAgainstOracle(sparse, b, rnd);
        }
    }

    private static void checkAgainstOracle(SparseLu lu, double[] a, Random rnd) {
        int n = lu.size();
        LUDecomposition oracle = new LUDecomposition(new Array2DRowRealMatrix(DenseLuTest.toRows(a, n)));
        double[] rhs = new double[n];
        for (int i = 0; i < n; i++) {
            rhs[i] = rnd.nextGaussian();
        }
        double[] expected = oracle.getSolver().solve(new ArrayRealVector(rhs)).toArray();
        lu.solve(rhs);
        // Commons Math 3.6.1 oracle; 1e-8 relative to max|x| (cond up to ~1e7, see above).
        assertArrayEquals(expected, rhs, 1e-8 * Math.max(1, DenseLuTest.maxAbs(expected)));
    }
}
