package org.switchfit.continuation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Random;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.junit.jupiter.api.Test;

/** {@link CayleyArnoldi} against the dense eigenvalues of Apache Commons Math 3.6.1 on a sparse 400 x 400 matrix. */
class CayleyArnoldiTest {

    /** Diagonal in [-3, -1] except two entries +0.6 and +0.25, four off-diagonal entries of size 0.05 per row. */
    private static double[] matrix(int n, int[][] pattern) {
        Random rnd = new Random(20261202L);
        double[] a = new double[n * n];
        for (int i = 0; i < n; i++) {
            java.util.TreeSet<Integer> cols = new java.util.TreeSet<>();
            cols.add(i);
            a[i * n + i] = i == 7 ? 0.6 : i == 200 ? 0.25 : -1 - 2 * rnd.nextDouble();
            for (int k = 0; k < 4; k++) {
                int j = rnd.nextInt(n);
                a[i * n + j] += 0.05 * rnd.nextGaussian();
                cols.add(j);
            }
            pattern[i] = cols.stream().mapToInt(Integer::intValue).toArray();
        }
        return a;
    }

    @Test
    void findsTheUnstableEigenvaluesOfASparseMatrix() {
        int n = 400;
        int[][] pattern = new int[n][];
        double[] a = matrix(n, pattern);
        double[][] rows = new double[n][n];
        for (int i = 0; i < n; i++) {
            System.arraycopy(a, i * n, rows[i], 0, n);
        }
        EigenDecomposition dense = new EigenDecomposition(new Array2DRowRealMatrix(rows));
        double[] dre = dense.getRealEigenvalues();
        double[] dim = dense.getImagEigenvalues();
        int denseUnstable = 0;
        for (double r : dre) {
            denseUnstable += r > 0 ? 1 : 0;
        }
        assertEquals(2, denseUnstable, "construction: two eigenvalues near +0.6 and +0.25 (Gershgorin radius 0.2)");
        CayleyArnoldi.Result r = CayleyArnoldi.compute(a, n, pattern, 1.0, 60);
        assertNotNull(r);
        int found = 0;
        for (int k = 0; k < r.re().length; k++) {
            if (r.residual()[k] > 1e-10 * r.muAbs()[k]) {
                continue; // not converged
            }
            // Each converged Ritz value is an eigenvalue of the dense oracle: the Ritz residual 1e-10 in mu bounds
            // the eigenvalue error by about 1e-10 * |dlambda/dmu| <= 1e-8 here (well-separated, |mu - 1| >= 0.2).
            double best = Double.POSITIVE_INFINITY;
            for (int i = 0; i < n; i++) {
                best = Math.min(best, Math.hypot(dre[i] - r.re()[k], dim[i] - r.im()[k]));
            }
            assertTrue(best < 1e-7, "Ritz value " + r.re()[k] + " + " + r.im()[k] + "i off by " + best);
            found += r.re()[k] > 0 ? 1 : 0;
        }
        assertEquals(denseUnstable, found, "both unstable eigenvalues found and converged");
        // The two dominant Ritz values (largest |mu|) are the unstable ones.
        assertTrue(r.muAbs()[0] > 1 && r.muAbs()[1] > 1 && r.muAbs()[2] < 1);
    }
}
