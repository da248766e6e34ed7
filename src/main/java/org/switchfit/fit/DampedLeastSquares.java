package org.switchfit.fit;

/**
 * Solves the damped linear least-squares problem {@code min |A δ - b|² + λ |D δ|²} by Householder QR of the
 * augmented (m + w) × w matrix {@code [A; √λ D]} (Golub and Van Loan, "Matrix Computations", 4th ed., §5.2 and
 * §6.1.4). Package-private kernel; allocates its workspace per call (called once per LM trial step, not on a
 * hot path).
 */
final class DampedLeastSquares {

    private DampedLeastSquares() {
    }

    /**
     * @param a      A, row-major m × w (read)
     * @param b      b, length m (read)
     * @param diag   D diagonal, length w, entries &gt; 0 (read)
     * @param lambda λ ≥ 0
     * @return δ, length w; components along directions with a zero pivot are set to 0
     */
    static double[] solve(double[] a, int m, int w, double[] b, double[] diag, double lambda) {
        int rows = m + w;
        double[] q = new double[rows * w];
        System.arraycopy(a, 0, q, 0, m * w);
        double sl = Math.sqrt(lambda);
        for (int j = 0; j < w; j++) {
            q[(m + j) * w + j] = sl * diag[j];
        }
        double[] y = new double[rows];
        System.arraycopy(b, 0, y, 0, m);
        double[] v = new double[rows];
        for (int k = 0; k < w; k++) {
            double nrm = 0;
            for (int i = k; i < rows; i++) {
                double e = q[i * w + k];
                nrm += e * e;
            }
            nrm = Math.sqrt(nrm);
            if (nrm == 0.0) {
                continue;
            }
            double akk = q[k * w + k];
            double alpha = akk > 0 ? -nrm : nrm;
            double vn2 = 0;
            for (int i = k; i < rows; i++) {
                v[i] = q[i * w + k];
            }
            v[k] -= alpha;
            for (int i = k; i < rows; i++) {
                vn2 += v[i] * v[i];
            }
            if (vn2 == 0.0) {
                continue;
            }
            for (int j = k; j < w; j++) {
                double s = 0;
                for (int i = k; i < rows; i++) {
                    s += v[i] * q[i * w + j];
                }
                double f = 2 * s / vn2;
                for (int i = k; i < rows; i++) {
                    q[i * w + j] -= f * v[i];
                }
            }
            double s = 0;
            for (int i = k; i < rows; i++) {
                s += v[i] * y[i];
            }
            double f = 2 * s / vn2;
            for (int i = k; i < rows; i++) {
                y[i] -= f * v[i];
            }
        }
        double[] x = new double[w];
        for (int k = w - 1; k >= 0; k--) {
            double rkk = q[k * w + k];
            if (rkk == 0.0) {
                x[k] = 0;
                continue;
            }
            double s = y[k];
            for (int j = k + 1; j < w; j++) {
                s -= q[k * w + j] * x[j];
            }
            x[k] = s / rkk;
        }
        return x;
    }
    /**
     * Solves the symmetric system {@code H δ = b} by Cholesky factorisation (Golub and Van Loan, 4th ed., §4.2),
     * for the augmented model of {@link SecantModel}, whose Hessian is not a Gram matrix and so has no QR form.
     *
     * @param h row-major w × w, symmetric (read; only the lower triangle is used)
     * @param b length w (read)
     * @return δ, or null when H is not (numerically) positive definite
     */
    static double[] solveSymmetric(double[] h, int w, double[] b) {
        double[] c = new double[w * w];
        for (int j = 0; j < w; j++) {
            double d = h[j * w + j];
            for (int k = 0; k < j; k++) {
                d -= c[j * w + k] * c[j * w + k];
            }
            // A pivot below 1e-14 of the diagonal entry counts as singular (rounding level of the elimination).
            if (!(d > 1e-14 * Math.abs(h[j * w + j]))) {
                return null;
            }
            double ljj = Math.sqrt(d);
            c[j * w + j] = ljj;
            for (int i = j + 1; i < w; i++) {
                double e = h[i * w + j];
                for (int k = 0; k < j; k++) {
                    e -= c[i * w + k] * c[j * w + k];
                }
                c[i * w + j] = e / ljj;
            }
        }
        double[] x = b.clone();
        for (int i = 0; i < w; i++) {
            double e = x[i];
            for (int k = 0; k < i; k++) {
                e -= c[i * w + k] * x[k];
            }
            x[i] = e / c[i * w + i];
        }
        for (int i = w - 1; i >= 0; i--) {
            double e = x[i];
            for (int k = i + 1; k < w; k++) {
                e -= c[k * w + i] * x[k];
            }
            x[i] = e / c[i * w + i];
        }
        return x;
    }
}
