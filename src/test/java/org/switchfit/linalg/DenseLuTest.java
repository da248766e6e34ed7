package org.switchfit.linalg;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.LUDecomposition;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.junit.jupiter.api.Test;

class DenseLuTest {

    private static final long SEED = 20261202L;

    static double[] randomMatrix(Random rnd, int n) {
        double[] a = new double[n * n];
        for (int k = 0; k < a.length; k++) {
            a[k] = rnd.nextGaussian();
        }
        return a;
    }

    static double[][] toRows(double[] a, int n) {
        double[][] r = new double[n][n];
        for (int i = 0; i < n; i++) {
            System.arraycopy(a, i * n, r[i], 0, n);
        }
        return r;
    }

    @ParameterizedTest
    @ValueSource(ints = {1, 2, 5, 30, 77})
    void reconstructsPermutedMatrixFromFactors(int n) {
        Random rnd = new Random(SEED + n);
        double[] a = randomMatrix(rnd, n);
        DenseLu lu = new DenseLu(n);
        assertTrue(lu.factor(a));
        double[] l = lu.lower();
        double[] u = lu.upper();
        int[] perm = lu.permutation();
        // Property: P A = L U. Tolerance: backward error of partial pivoting is a small multiple of
        // n * eps * max|a| * growth (Golub & Van Loan 2013, Thm 3.4.2); 64 n eps absolute for O(1) Gaussian entries.
        double tol = 64 * n * Math.ulp(1.0) * maxAbs(a);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                double s = 0;
                for (int k = 0; k < n; k++) {
                    s += l[i * n + k] * u[k * n + j];
                }
                assertEquals(a[perm[i] * n + j], s, tol, "entry " + i + "," + j);
            }
        }
        // Partial pivoting: every multiplier has |l_ij| <= 1 (common practice, definition of the pivot choice).
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < i; j++) {
                assertTrue(Math.abs(l[i * n + j]) <= 1.0);
            }
        }
    }

    @ParameterizedTest
    @ValueSource(ints = {1, 3, 30, 100})
    void solvesLikeCommonsMath(int n) {
        Random rnd = new Random(SEED * 3 + n);
        double[] a = randomMatrix(rnd, n);
        DenseLu lu = new DenseLu(n);
        assertTrue(lu.factor(a));
        LUDecomposition oracle = new LUDecomposition(new Array2DRowRealMatrix(toRows(a, n)));
        for (int rep = 0; rep < 3; rep++) {
            double[] b = new double[n];
            for (int i = 0; i < n; i++) {
                b[i] = rnd.nextGaussian();
            }
            double[] expected = oracle.getSolver().solve(new ArrayRealVector(b)).toArray();
            double[] x = b.clone();
            lu.solve(x);
            // Oracle: Apache Commons Math 3.6.1 LUDecomposition (same algorithm family). Both carry error
            // ~cond(A) * eps; 1e-9 relative to max|x| allows cond(A) up to ~1e6, typical for Gaussian matrices.
            double scale = Math.max(1.0, maxAbs(expected));
            assertArrayEquals(expected, x, 1e-9 * scale);
        }
        // Determinant vs the oracle, 1e-10 relative (same reasoning).
        double det = oracle.getDeterminant();
        assertEquals(det, lu.determinant(), 1e-10 * Math.abs(det));
    }

    @Test
    void identityMinusMatchesExplicitMatrix() {
        int n = 12;
        Random rnd = new Random(SEED + 99);
        double[] j = randomMatrix(rnd, n);
        double c = 0.37;
        double[] m = new double[n * n];
        for (int k = 0; k < n * n; k++) {
            m[k] = -c * j[k];
        }
        for (int i = 0; i < n; i++) {
            m[i * n + i] += 1;
        }
        DenseLu a = new DenseLu(n);
        DenseLu b = new DenseLu(n);
        assertTrue(a.factorIdentityMinus(c, j));
        assertTrue(b.factor(m));
        double[] x = new double[n];
        x[3] = 1;
        double[] y = x.clone();
        a.solve(x);
        b.solve(y);
        // Same arithmetic up to the order of one addition: 1e-13 absolute for O(1) solutions.
        assertArrayEquals(y, x, 1e-13);
    }

    @Test
    void detectsSingularMatrices() {
        int n = 6;
        Random rnd = new Random(SEED + 7);
        double[] a = randomMatrix(rnd, n);
        // Row 4 = 2 * row 1 - row 0: rank n-1.
        for (int j = 0; j < n; j++) {
            a[4 * n + j] = 2 * a[n + j] - a[j];
        }
        DenseLu lu = new DenseLu(n);
        assertFalse(lu.factor(a));
        assertTrue(lu.isSingular());
        assertEquals(0.0, lu.determinant());
        assertThrows(IllegalStateException.class, () -> lu.solve(new double[n]));
        assertFalse(lu.factor(new double[n * n]), "zero matrix");
        double[] nan = randomMatrix(rnd, n);
        nan[7] = Double.NaN;
        assertFalse(lu.factor(nan), "NaN entry");
        // A well-conditioned matrix afterwards works again (workspace reuse).
        assertTrue(lu.factor(randomMatrix(rnd, n)));
    }

    @Test
    void zeroSizeIsTrivial() {
        DenseLu lu = new DenseLu(0);
        assertTrue(lu.factor(new double[0]));
        lu.solve(new double[0]);
    }

    static double maxAbs(double[] a) {
        double m = 0;
        for (double v : a) {
            m = Math.max(m, Math.abs(v));
        }
        return m;
    }

    @ParameterizedTest
    @ValueSource(ints = {1, 4, 30, 90})
    void solvesTransposedLikeCommonsMath(int n) {
        Random rnd = new Random(SEED * 7 + n);
        double[] a = randomMatrix(rnd, n);
        DenseLu lu = new DenseLu(n);
        assertTrue(lu.factor(a));
        // Oracle: Commons Math LU of the explicitly transposed matrix.
        LUDecomposition oracle = new LUDecomposition(new Array2DRowRealMatrix(toRows(a, n)).transpose());
        double[] b = new double[n];
        for (int i = 0; i < n; i++) {
            b[i] = rnd.nextGaussian();
        }
        double[] expected = oracle.getSolver().solve(new ArrayRealVector(b)).toArray();
        double[] x = b.clone();
        lu.solveTransposed(x);
        // Both solutions are backward stable; for Gaussian matrices of this size the condition number stays below
        // about 1e4 at these seeds, so 1e-9 relative to max|x| bounds the forward difference.
        assertArrayEquals(expected, x, 1e-9 * (1 + maxAbs(expected)));
    }

    @Test
    void pivotThresholdZeroAcceptsTinyButNonZeroPivots() {
        // diag(1, 1e-300): singular for the default relative test (1e-300 <= 8 eps * 2 * 1), regular with rel = 0.
        double[] a = {1, 0, 0, 1e-300};
        assertFalse(new DenseLu(2).factor(a));
        DenseLu exact = DenseLu.withPivotThreshold(2, 0.0);
        assertTrue(exact.factor(a));
        double[] b = {2, 3e-300};
        exact.solve(b);
        // Closed form: x = (2, 3); division by a power-of-ten pivot is exact to one rounding.
        assertEquals(2.0, b[0], 0.0);
        assertEquals(3.0, b[1], 4 * Math.ulp(3.0));
        assertFalse(exact.factor(new double[] {1, 2, 2, 4}), "exactly singular (rank 1) stays singular");
    }
}
