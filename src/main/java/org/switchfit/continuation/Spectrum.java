package org.switchfit.continuation;

import org.hipparchus.complex.Complex;
import org.hipparchus.exception.MathRuntimeException;
import org.hipparchus.linear.Array2DRowRealMatrix;
import org.hipparchus.linear.EigenDecompositionNonSymmetric;
import org.switchfit.linalg.DenseEigenvalues;

/**
 * Eigenvalues of a dense Jacobian (Hessenberg reduction and shifted QR, via Hipparchus; when that does not
 * converge, the independent implementation {@link DenseEigenvalues}), sorted by decreasing real part, ties by
 * decreasing imaginary part. Per-run use only (allocates).
 */
final class Spectrum {
    private Spectrum() {
    }

    /**
     * Writes the eigenvalues of the n x n row-major matrix into re, im.
     *
     * @return false when neither QR iteration converged
     */
    static boolean compute(double[] jac, int n, double[] re, double[] im) {
        if (n == 0) {
            return true;
        }
        // The QR iteration (fixed iteration limit) occasionally fails on one of A, balanced A, A^T while succeeding
        // on another; all three have the same eigenvalues, so try them in turn.
        Complex[] ev = null;
        for (int attempt = 0; attempt < 3 && ev == null; attempt++) {
            double[][] a = new double[n][n];
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < n; j++) {
                    a[i][j] = attempt == 2 ? jac[j * n + i] : jac[i * n + j];
                }
            }
            if (attempt != 1) {
                balance(a, n);
            }
            flushNegligible(a, n);
            try {
                ev = new EigenDecompositionNonSymmetric(new Array2DRowRealMatrix(a, false)).getEigenvalues();
            } catch (MathRuntimeException e) {
                ev = null;
            }
        }
        if (ev == null) {
            // A second implementation of the QR iteration (different shift and deflation details) on the balanced
            // matrix; its convergence on strongly graded matrices is independent of the first one's.
            double[][] b = new double[n][n];
            for (int i = 0; i < n; i++) {
                System.arraycopy(jac, i * n, b[i], 0, n);
            }
            balance(b, n);
            flushNegligible(b, n);
            double[] flat = new double[n * n];
            for (int i = 0; i < n; i++) {
                System.arraycopy(b[i], 0, flat, i * n, n);
            }
            double[] r = new double[n];
            double[] c = new double[n];
            if (!DenseEigenvalues.compute(flat, n, r, c)) {
                return false;
            }
            ev = new Complex[n];
            for (int i = 0; i < n; i++) {
                ev[i] = new Complex(r[i], c[i]);
            }
        }
        final Complex[] eig = ev;
        Integer[] order = new Integer[n];
        for (int i = 0; i < n; i++) {
            order[i] = i;
        }
        java.util.Arrays.sort(order, (x, y) -> {
            int c = Double.compare(eig[y].getReal(), eig[x].getReal());
            return c != 0 ? c : Double.compare(eig[y].getImaginary(), eig[x].getImaginary());
        });
        for (int i = 0; i < n; i++) {
            re[i] = eig[order[i]].getReal();
            im[i] = eig[order[i]].getImaginary();
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
     * Sets entries below eps^2 max|a_ij| to zero (in place). The change is far below the backward error
     * (about n eps max|a_ij|) of the QR iteration, so the computed eigenvalues are as valid as before, and it removes
     * subnormal numbers, on which the iteration was seen to stop converging (scaled Jacobian of a 500-species
     * model, entries down to 1e-322).
     */
    static void flushNegligible(double[][] a, int n) {
        double max = 0;
        for (double[] row : a) {
            for (double v : row) {
                max = Math.max(max, Math.abs(v));
            }
        }
        double tiny = Math.ulp(1.0) * Math.ulp(1.0) * max;
        for (double[] row : a) {
            for (int j = 0; j < n; j++) {
                if (Math.abs(row[j]) < tiny) {
                    row[j] = 0;
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
