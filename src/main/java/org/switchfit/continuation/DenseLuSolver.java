package org.switchfit.continuation;

/**
 * Dense LU factorisation with partial (row) pivoting, PA = LU, on a flat row-major copy of the matrix
 * (Golub and Van Loan, Matrix Computations, 4th ed. 2013, algorithm 3.4.1). Workspace grows, never shrinks.
 * Not thread-safe.
 */
final class DenseLuSolver implements LinearSolver {
    private double[] lu = new double[0];
    private int[] perm = new int[0];
    private double[] work = new double[0];
    private int n;

    @Override
    public boolean factor(double[] a, int size) {
        this.n = size;
        int nn = size * size;
        if (lu.length < nn) {
            lu = new double[nn];
        }
        if (perm.length < size) {
            perm = new int[size];
            work = new double[size];
        }
        System.arraycopy(a, 0, lu, 0, nn);
        double[] m = lu;
        for (int i = 0; i < size; i++) {
            perm[i] = i;
        }
        for (int k = 0; k < size; k++) {
            int p = k;
            double best = Math.abs(m[k * size + k]);
            for (int i = k + 1; i < size; i++) {
                double v = Math.abs(m[i * size + k]);
                if (v > best) {
                    best = v;
                    p = i;
                }
            }
            if (!(best > 0) || !Double.isFinite(best)) {
                return false;
            }
            if (p != k) {
                int rk = k * size;
                int rp = p * size;
                for (int j = 0; j < size; j++) {
                    double t = m[rk + j];
                    m[rk + j] = m[rp + j];
                    m[rp + j] = t;
                }
                int t = perm[k];
                perm[k] = perm[p];
                perm[p] = t;
            }
            double inv = 1.0 / m[k * size + k];
            int rk = k * size;
            for (int i = k + 1; i < size; i++) {
                int ri = i * size;
                double l = m[ri + k] * inv;
                if (l == 0) {
                    continue;
                }
                m[ri + k] = l;
                for (int j = k + 1; j < size; j++) {
                    m[ri + j] -= l * m[rk + j];
                }
            }
        }
        return true;
    }

    @Override
    public void solve(double[] b, double[] x) {
        int size = n;
        double[] m = lu;
        double[] w = work;
        for (int i = 0; i < size; i++) {
            w[i] = b[perm[i]];
        }
        for (int i = 0; i < size; i++) {
            double s = w[i];
            int ri = i * size;
            for (int j = 0; j < i; j++) {
                s -= m[ri + j] * w[j];
            }
            w[i] = s;
        }
        for (int i = size - 1; i >= 0; i--) {
            double s = w[i];
            int ri = i * size;
            for (int j = i + 1; j < size; j++) {
                s -= m[ri + j] * w[j];
            }
            w[i] = s / m[ri + i];
        }
        System.arraycopy(w, 0, x, 0, size);
    }

    @Override
    public void solveTransposed(double[] b, double[] x) {
        // A^T = U^T L^T P, so solve U^T z = b, L^T u = z, x = P^T u.
        int size = n;
        double[] m = lu;
        double[] w = work;
        System.arraycopy(b, 0, w, 0, size);
        for (int i = 0; i < size; i++) {
            double s = w[i];
            for (int j = 0; j < i; j++) {
                s -= m[j * size + i] * w[j];
            }
            w[i] = s / m[i * size + i];
        }
        for (int i = size - 1; i >= 0; i--) {
            double s = w[i];
            for (int j = i + 1; j < size; j++) {
                s -= m[j * size + i] * w[j];
            }
            w[i] = s;
        }
        for (int i = 0; i < size; i++) {
            x[perm[i]] = w[i];
        }
    }
}
