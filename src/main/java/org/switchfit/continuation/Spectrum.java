package org.switchfit.continuation;

import org.hipparchus.complex.Complex;
import org.hipparchus.exception.MathRuntimeException;
import org.hipparchus.linear.Array2DRowRealMatrix;
import org.hipparchus.linear.EigenDecompositionNonSymmetric;

/**
 * Eigenvalues of a dense Jacobian (Hessenberg reduction and shifted QR, via Hipparchus), sorted by decreasing
 * real part, ties by decreasing imaginary part. Per-run use only (allocates).
 */
final class Spectrum {
    private Spectrum() {
    }

    /**
     * Writes the eigenvalues of the n x n row-major matrix into re, im.
     *
     * @return false when the QR iteration did not converge
     */
    static boolean compute(double[] jac, int n, double[] re, double[] im) {
        if (n == 0) {
            return true;
        }
        double[][] a = new double[n][n];
        for (int i = 0; i < n; i++) {
            System.arraycopy(jac, i * n, a[i], 0, n);
        }
        balance(a, n);
        Complex[] ev;
        try {
            ev = new EigenDecompositionNonSymmetric(new Array2DRowRealMatrix(a, false)).getEigenvalues();
        } catch (MathRuntimeException e) {
            return false;
        }
        Integer[] order = new Integer[n];
        for (int i = 0; i < n; i++) {
            order[i] = i;
        }
        java.util.Arrays.sort(order, (x, y) -> {
            int c = Double.compare(ev[y].getReal(), ev[x].getReal());
            return c != 0 ? c : Double.compare(ev[y].getImaginary(), ev[x].getImaginary());
        });
        for (int i = 0; i < n; i++) {
            re[i] = ev[order[i]].getReal();
            im[i] = ev[order[i]].getImaginary();
        }
        return true;
    }

    /**
     * Balancing by a diagonal similarity D^-1 A D with powers of two (exact in floating point), so that each row
     * and the matching column have comparable 1-norms (Parlett and Reinsch 1969, Numer. Math. 13:293-304,
     * doi:10.1007/BF02165404). Eigenvalues are unchanged; the QR iteration then converges on matrices whose
     * entries span tens of orders of magnitude (scaled Jacobians of large signalling models), where it otherwise
     * fails. In place.
     */
    static void balance(double[][] a, int n) {
        final double radix = 2;
        boolean done = false;
        for (int sweep = 0; sweep < 100 && !done; sweep++) {
            done = true;
            for (int i = 0; i < n; i++) {
                double c = 0;
                double r = 0;
                for (int j = 0; j < n; j++) {
                    if (j != i) {
                        c += Math.abs(a[j][i]);
                        r += Math.abs(a[i][j]);
                    }
                }
                if (c == 0 || r == 0 || !Double.isFinite(c) || !Double.isFinite(r)) {
                    continue;
                }
                double f = 1;
                double sum = c + r;
                double g = r / radix;
                while (c < g) {
                    f *= radix;
                    c *= radix * radix;
                }
                g = r * radix;
                while (c > g) {
                    f /= radix;
                    c /= radix * radix;
                }
                if ((c + r) / f < 0.95 * sum) {
                    done = false;
                    double inv = 1 / f;
                    for (int j = 0; j < n; j++) {
                        a[i][j] *= inv;
                    }
                    for (int j = 0; j < n; j++) {
                        a[j][i] *= f;
                    }
                }
            }
        }
    }

    /**
     * Number of eigenvalues with real part above the rounding level of the matrix, {@code n eps max|a_ij|}:
     * eigenvalues computed by a backward-stable method are exact for a matrix within that distance, so a real
     * part below it cannot be told from zero (such a direction is reported neutral, not unstable).
     */
    static int unstableCount(double[] re, double[] jac, int n) {
        double max = 0;
        for (int k = 0; k < n * n; k++) {
            max = Math.max(max, Math.abs(jac[k]));
        }
        double tol = n * Math.ulp(1.0) * max;
        int c = 0;
        for (double r : re) {
            if (r > tol) {
                c++;
            }
        }
        return c;
    }
}
