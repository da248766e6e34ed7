package org.switchfit.linalg;

/**
 * Dense LU factorisation with partial (row) pivoting, P A = L U, on a flat row-major workspace.
 *
 * <p>Storage: the workspace {@code lu[i * n + j]} holds U on and above the diagonal and the multipliers of the
 * unit lower-triangular L below it; {@code perm[k]} is the original row now in position k. The algorithm is the
 * right-looking Doolittle elimination (Golub &amp; Van Loan, Matrix Computations, 4th ed., 2013, Alg. 3.4.1) in
 * k-i-j loop order so the inner loop runs over contiguous memory.
 *
 * <p>Singularity: a pivot with |u_kk| &lt;= {@link LinalgThresholds#SINGULAR_REL} * n * max|a_ij| counts as zero.
 *
 * <p>Not thread-safe. After construction, {@link #factor}, {@link #factorIdentityMinus} and {@link #solve}
 * allocate nothing.
 */
public final class DenseLu implements LuSolver {

    private final int n;
    private final double[] lu;
    private final int[] perm;
    private final int[] swaps;
    private boolean singular = true;
    private int sign = 1;

    /** Creates a workspace for n x n matrices. */
    public DenseLu(int n) {
        if (n < 0) {
            throw new IllegalArgumentException("dimension must be >= 0, got " + n);
        }
        this.n = n;
        this.lu = new double[n * n];
        this.perm = new int[n];
        this.swaps = new int[n];
    }

    @Override
    public int size() {
        return n;
    }

    @Override
    public boolean factor(double[] a) {
        checkLength(a);
        System.arraycopy(a, 0, lu, 0, n * n);
        return decompose();
    }

    @Override
    public boolean factorIdentityMinus(double c, double[] a) {
        checkLength(a);
        int nn = n * n;
        for (int k = 0; k < nn; k++) {
            lu[k] = -c * a[k];
        }
        for (int i = 0; i < n; i++) {
            lu[i * n + i] += 1.0;
        }
        return decompose();
    }

    private void checkLength(double[] a) {
        if (a.length < n * n) {
            throw new IllegalArgumentException("matrix array length " + a.length + " < n*n = " + (n * n));
        }
    }

    private boolean decompose() {
        final int n = this.n;
        final double[] lu = this.lu;
        double maxAbs = 0.0;
        int nn = n * n;
        for (int k = 0; k < nn; k++) {
            double v = Math.abs(lu[k]);
            if (v > maxAbs || v != v) {
                maxAbs = v;
            }
        }
        if (!(maxAbs < Double.POSITIVE_INFINITY)) {
            singular = true;
            return false;
        }
        double tiny = LinalgThresholds.SINGULAR_REL * Math.max(n, 1) * maxAbs;
        for (int i = 0; i < n; i++) {
            perm[i] = i;
        }
        sign = 1;
        for (int k = 0; k < n; k++) {
            int p = k;
            double best = Math.abs(lu[k * n + k]);
            for (int i = k + 1; i < n; i++) {
                double v = Math.abs(lu[i * n + k]);
                if (v > best) {
                    best = v;
                    p = i;
                }
            }
            swaps[k] = p;
            if (p != k) {
                int rk = k * n;
                int rp = p * n;
                for (int j = 0; j < n; j++) {
                    double t = lu[rk + j];
                    lu[rk + j] = lu[rp + j];
                    lu[rp + j] = t;
                }
                int t = perm[k];
                perm[k] = perm[p];
                perm[p] = t;
                sign = -sign;
            }
            if (best <= tiny || maxAbs == 0.0) {
                singular = true;
                return false;
            }
            int rk = k * n;
            double inv = 1.0 / lu[rk + k];
            for (int i = k + 1; i < n; i++) {
                int ri = i * n;
                double l = lu[ri + k] * inv;
                lu[ri + k] = l;
                if (l != 0.0) {
                    for (int j = k + 1; j < n; j++) {
                        lu[ri + j] -= l * lu[rk + j];
                    }
                }
            }
        }
        singular = false;
        return true;
    }

    @Override
    public void solve(double[] b) {
        if (singular) {
            throw new IllegalStateException("no valid LU factorisation held (singular or not factored)");
        }
        final int n = this.n;
        final double[] lu = this.lu;
        for (int k = 0; k < n; k++) {
            int p = swaps[k];
            if (p != k) {
                double t = b[k];
                b[k] = b[p];
                b[p] = t;
            }
        }
        for (int i = 1; i < n; i++) {
            int ri = i * n;
            double s = b[i];
            for (int j = 0; j < i; j++) {
                s -= lu[ri + j] * b[j];
            }
            b[i] = s;
        }
        for (int i = n - 1; i >= 0; i--) {
            int ri = i * n;
            double s = b[i];
            for (int j = i + 1; j < n; j++) {
                s -= lu[ri + j] * b[j];
            }
            b[i] = s / lu[ri + i];
        }
    }

    @Override
    public boolean isSingular() {
        return singular;
    }

    /** Unit lower-triangular factor L, new row-major n x n array (not for hot paths). */
    public double[] lower() {
        double[] l = new double[n * n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < i; j++) {
                l[i * n + j] = lu[i * n + j];
            }
            l[i * n + i] = 1.0;
        }
        return l;
    }

    /** Upper-triangular factor U, new row-major n x n array (not for hot paths). */
    public double[] upper() {
        double[] u = new double[n * n];
        for (int i = 0; i < n; i++) {
            for (int j = i; j < n; j++) {
                u[i * n + j] = lu[i * n + j];
            }
        }
        return u;
    }

    /** Row permutation: {@code perm[k]} is the row of A that ends up in row k of P A (new array). */
    public int[] permutation() {
        return perm.clone();
    }

    /** Determinant of the last factored matrix (0 when singular). */
    public double determinant() {
        if (singular) {
            return 0.0;
        }
        double d = sign;
        for (int i = 0; i < n; i++) {
            d *= lu[i * n + i];
        }
        return d;
    }
}
