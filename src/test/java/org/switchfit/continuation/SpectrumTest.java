package org.switchfit.continuation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.junit.jupiter.api.Test;

/** Eigenvalues of {@link Spectrum} against Apache Commons Math 3.6.1, with and without badly scaled rows. */
class SpectrumTest {

    /** A sparse, diagonally dominant-ish random matrix (4 off-diagonal entries per row), seeded. */
    private static double[] sparseMatrix(int n, long seed) {
        Random rnd = new Random(seed);
        double[] a = new double[n * n];
        for (int i = 0; i < n; i++) {
            a[i * n + i] = -1 - rnd.nextDouble();
            for (int k = 0; k < 4; k++) {
                a[i * n + rnd.nextInt(n)] += rnd.nextGaussian();
            }
        }
        return a;
    }

    private static double[][] sortedOracle(double[] a, int n) {
        double[][] rows = new double[n][n];
        for (int i = 0; i < n; i++) {
            System.arraycopy(a, i * n, rows[i], 0, n);
        }
        EigenDecomposition ed = new EigenDecomposition(new Array2DRowRealMatrix(rows));
        double[] re = ed.getRealEigenvalues();
        double[] im = ed.getImagEigenvalues();
        Integer[] idx = new Integer[n];
        for (int i = 0; i < n; i++) {
            idx[i] = i;
        }
        Arrays.sort(idx, (x, y) -> {
            int c = Double.compare(re[y], re[x]);
            return c != 0 ? c : Double.compare(im[y], im[x]);
        });
        double[][] out = new double[2][n];
        for (int i = 0; i < n; i++) {
            out[0][i] = re[idx[i]];
            out[1][i] = im[idx[i]];
        }
        return out;
    }

    @Test
    void matchesCommonsMathOnModeratelySizedSparseMatrix() {
        int n = 120;
        double[] a = sparseMatrix(n, 20261202L);
        double[] re = new double[n];
        double[] im = new double[n];
        assertTrue(Spectrum.compute(a, n, re, im));
        double[][] o = sortedOracle(a, n);
        // Both are backward stable (Hessenberg QR); for eigenvalues of this well-separated random matrix the
        // forward error stays near eps * ||A|| * condition; 1e-8 absolute on entries of size O(1) (common practice).
        for (int i = 0; i < n; i++) {
            assertEquals(o[0][i], re[i], 1e-8, "Re " + i);
            assertEquals(Math.abs(o[1][i]), Math.abs(im[i]), 1e-8, "|Im| " + i);
        }
    }

    @Test
    void balancingKeepsEigenvaluesOfABadlyScaledSimilarMatrix() {
        // D^-1 A D with D spanning 1e-20 .. 1e20 has the eigenvalues of A exactly (similarity); unbalanced QR
        // would work on entries of size up to 1e40.
        int n = 40;
        double[] a = sparseMatrix(n, 7L);
        double[] b = new double[n * n];
        double[] d = new double[n];
        for (int i = 0; i < n; i++) {
            d[i] = Math.pow(10, -20 + 40.0 * i / (n - 1));
        }
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                b[i * n + j] = a[i * n + j] * d[j] / d[i];
            }
        }
        double[] re = new double[n];
        double[] im = new double[n];
        assertTrue(Spectrum.compute(b, n, re, im));
        double[][] o = sortedOracle(a, n);
        // Oracle on the unscaled A; the scaling is undone by balancing up to powers of two, so the same 1e-8 holds.
        for (int i = 0; i < n; i++) {
            assertEquals(o[0][i], re[i], 1e-8, "Re " + i);
            assertEquals(Math.abs(o[1][i]), Math.abs(im[i]), 1e-8, "|Im| " + i);
        }
    }

    @Test
    void realPartsAtRoundingLevelCountAsNeutral() {
        // diag(1e-14, -1, 2) scaled by max 2: tolerance n eps max = 3 * 2.2e-16 * 2 = 1.3e-15 < 1e-14, so the
        // first counts as unstable; diag(1e-16, -1, 2): 1e-16 below the tolerance, neutral.
        double[] j1 = {1e-14, 0, 0, 0, -1, 0, 0, 0, 2};
        double[] j2 = {1e-16, 0, 0, 0, -1, 0, 0, 0, 2};
        assertEquals(2, Spectrum.unstableCount(new double[] {2, 1e-14, -1}, j1, 3));
        assertEquals(1, Spectrum.unstableCount(new double[] {2, 1e-16, -1}, j2, 3));
    }
}
