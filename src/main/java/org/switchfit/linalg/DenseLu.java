package org.switchfit.linalg;

/**
 * Dense LU factorisation with partial (row) pivoting, P A = L U, on a flat row-major workspace.
 *
 * <p>Storage: the workspace {@code lu[i * n + j]} holds U on and above the diagonal and the multipliers of the
 * unit lower-triangular L below it; {@code perm[k]} is the original row now in position k. The algorithm is the
 * right-looking Doolittle elimination (Golub &amp; Van Loan, Matrix Computations, 4th ed., 2013, Alg. 3.4.1) in
 * k-i-j loop order so the inner loop runs over contiguous memory.
 *
 * <p>Singularity: a pivot with |u_kk| &lt;= rel * n * max|a_ij| counts as zero, with rel =
 * {@link LinalgThresholds#SINGULAR_REL} by default ({@link #DenseLu(int)}). Newton iterations next to singular
 * matrices (continuation through folds, where the Jacobian is singular at the fold itself and the bordered
 * systems are regular but badly scaled) use rel = 0 ({@link #withPivotThreshold}): only exactly zero or
 * non-finite pivots count as singular, and the caller judges the result by its residual.
 *
 * <p>Not thread-safe. After construction, {@link #factor}, {@link #factorIdentityMinus}, {@link #solve} and
 * {@link #solveTransposed} allocate nothing.
 */
public final class DenseLu implements LuSolver {

    private final int n;
    private final double singularRel;
    private final double[] lu;
    private final int[] perm;
    private final int[] swaps;
    private boolean singular = true;
    private int sign = 1;

    /** Creates a workspace for n x n matrices with the default pivot threshold. */
    public DenseLu(int n) {
        this(n, LinalgThresholds.SINGULAR_REL);
    }

    private DenseLu(int n, double singularRel) {
        if (n < 0) {
            throw new IllegalArgumentException("dimension must be >= 0, got " + n);
        }
        if (!(singularRel >= 0)) {
            throw new IllegalArgumentException("pivot threshold must be >= 0, got " + singularRel);
        }
        this.n = n;
        this.singularRel = singularRel;
        this.lu = new double[n * n];
        this.perm = new int[n];
        this.swaps = new int[n];
    }

    /**
     * A workspace for n x n matrices whose pivots count as zero when |u_kk| &lt;= rel * n * max|a_ij|
     * (rel = 0: exactly zero pivots only).
     */
    public static DenseLu withPivotThreshold(int n, double rel) {
        return new DenseLu(n, rel);
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
        double tiny = singularRel * Math.max(n, 1) * maxAbs;
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

    /**
     * Solves A^T x = b with the last factored A, in place. With P A = L U, A^T = U^T L^T P: solves U^T z = b,
     * then L^T w = z, then x = P^T w.
     *
     * @param b right-hand side on entry (length n), solution on exit
     * @throws IllegalStateException when no successful factorisation is held
     */
    public void solveTransposed(double[] b) {
        if (singular) {
            throw new IllegalStateException("no valid LU factorisation held (singular or not factored)");
        }
        final int n = this.n;
        final double[] lu = this.lu;
        for (int i = 0; i < n; i++) {
            double s = b[i];
            for (int j = 0; j < i; j++) {
                s -= lu[j * n + i] * b[j];
            }
            b[i] = s / lu[i * n + i];
        }
        for (int i = n - 1; i >= 0; i--) {
            double s = b[i];
            for (int j = i + 1; j < n; j++) {
                s -= lu[j * n + i] * b[j];
            }
            b[i] = s;
        }
        // x = P^T w: undo the row interchanges in reverse order.
        for (int k = n - 1; k >= 0; k--) {
            int p = swaps[k];
            if (p != k) {
                double t = b[k];
                b[k] = b[p];
                b[p] = t;
            }
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
