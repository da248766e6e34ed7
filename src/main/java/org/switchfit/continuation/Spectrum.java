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

    /** Number of eigenvalues with positive real part. */
    static int unstableCount(double[] re) {
        int c = 0;
        for (double r : re) {
            if (r > 0) {
                c++;
            }
        }
        return c;
    }
}
