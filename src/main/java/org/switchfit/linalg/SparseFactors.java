package org.switchfit.linalg;

import org.ejml.data.DMatrixSparseCSC;

/**
 * Our own copy of sparse LU factors P A = L U (compressed columns, rows in pivot order) with a numeric
 * refactorisation that reuses the pivot sequence and the fill structure of the last pivoting factorisation: the
 * "refactor" idea of KLU (Davis &amp; Palamadai Natarajan, ACM TOMS 37(3):36, 2010, doi:10.1145/1824801.1824814).
 * Refactoring is a left-looking sparse elimination over the known structure, O(flops), with no graph search.
 * It refuses (returns false) when a pivot becomes small relative to its column, or when a value would land outside
 * the known structure; the caller then factors again with partial pivoting.
 *
 * <p>Storage: L strictly lower (unit diagonal implied) in {@code lp, li, lx}; U strictly upper in
 * {@code up, ui, ux} with rows sorted increasing per column; diagonal of U in {@code ud}; {@code pinv[r]} = pivot
 * position of row r. Arrays grow on extraction only. Not thread-safe.
 */
final class SparseFactors {

    /** Refactor accepts a pivot only if |u_kk| >= this fraction of the largest entry in its column. */
    static final double PIVOT_TOL = 1e-3;

    private final int n;
    private int[] lp;
    private int[] li = new int[0];
    private double[] lx = new double[0];
    private int[] up;
    private int[] ui = new int[0];
    private double[] ux = new double[0];
    private final double[] ud;
    private final int[] pinv;
    private final double[] x;
    private final int[] mark;
    private boolean valid;

    SparseFactors(int n) {
        this.n = n;
        this.lp = new int[n + 1];
        this.up = new int[n + 1];
        this.ud = new double[n];
        this.pinv = new int[n];
        this.x = new double[n];
        this.mark = new int[n];
    }

    boolean isValid() {
        return valid;
    }

    void invalidate() {
        valid = false;
    }

    /** Copies the factors of a pivoting factorisation (setup-time work; may allocate). */
    void extract(DMatrixSparseCSC l, DMatrixSparseCSC u, int[] pivots) {
        System.arraycopy(pivots, 0, pinv, 0, n);
        int lnz = 0;
        int unz = 0;
        for (int c = 0; c < n; c++) {
            for (int s = l.col_idx[c]; s < l.col_idx[c + 1]; s++) {
                if (l.nz_rows[s] > c) {
                    lnz++;
                }
            }
            for (int s = u.col_idx[c]; s < u.col_idx[c + 1]; s++) {
                if (u.nz_rows[s] < c) {
                    unz++;
                }
            }
        }
        if (li.length < lnz) {
            li = new int[lnz];
            lx = new double[lnz];
        }
        if (ui.length < unz) {
            ui = new int[unz];
            ux = new double[unz];
        }
        lnz = 0;
        unz = 0;
        for (int c = 0; c < n; c++) {
            lp[c] = lnz;
            for (int s = l.col_idx[c]; s < l.col_idx[c + 1]; s++) {
                if (l.nz_rows[s] > c) {
                    li[lnz] = l.nz_rows[s];
                    lx[lnz++] = l.nz_values[s];
                }
            }
            up[c] = unz;
            ud[c] = 0.0;
            for (int s = u.col_idx[c]; s < u.col_idx[c + 1]; s++) {
                int r = u.nz_rows[s];
                if (r < c) {
                    ui[unz] = r;
                    ux[unz++] = u.nz_values[s];
                } else if (r == c) {
                    ud[c] = u.nz_values[s];
                }
            }
            sortColumn(ui, ux, up[c], unz);
        }
        lp[n] = lnz;
        up[n] = unz;
        java.util.Arrays.fill(mark, -1);
        valid = true;
    }

    private static void sortColumn(int[] idx, double[] val, int from, int to) {
        for (int a = from + 1; a < to; a++) {
            int key = idx[a];
            double kv = val[a];
            int b = a - 1;
            while (b >= from && idx[b] > key) {
                idx[b + 1] = idx[b];
                val[b + 1] = val[b];
                b--;
            }
            idx[b + 1] = key;
            val[b + 1] = kv;
        }
    }

    /**
     * Numeric refactorisation of A (compressed columns, same structure as at extraction) with the stored pivot
     * order.
     *
     * @param tiny absolute pivot threshold (singularity)
     * @return false when a pivot fails the threshold test or the structure does not hold; factors are then invalid
     */
    boolean refactor(int[] colIdx, int[] rows, double[] values, double tiny) {
        final double[] x = this.x;
        final int[] mark = this.mark;
        for (int k = 0; k < n; k++) {
            // Mark the structure of column k of L and U (pivot rows).
            mark[k] = k;
            for (int s = lp[k]; s < lp[k + 1]; s++) {
                mark[li[s]] = k;
            }
            for (int s = up[k]; s < up[k + 1]; s++) {
                mark[ui[s]] = k;
            }
            boolean ok = true;
            for (int s = colIdx[k]; s < colIdx[k + 1]; s++) {
                int r = pinv[rows[s]];
                ok &= mark[r] == k;
                x[r] = values[s];
            }
            for (int s = up[k]; s < up[k + 1] && ok; s++) {
                int j = ui[s];
                double xj = x[j];
                ux[s] = xj;
                x[j] = 0.0;
                if (xj != 0.0) {
                    for (int t = lp[j]; t < lp[j + 1]; t++) {
                        int i = li[t];
                        ok &= mark[i] == k;
                        x[i] -= lx[t] * xj;
                    }
                }
            }
            double pivot = x[k];
            x[k] = 0.0;
            double colMax = Math.abs(pivot);
            for (int s = lp[k]; s < lp[k + 1]; s++) {
                colMax = Math.max(colMax, Math.abs(x[li[s]]));
            }
            double ap = Math.abs(pivot);
            if (!ok || !(ap > tiny) || ap < PIVOT_TOL * colMax || !(ap < Double.POSITIVE_INFINITY)) {
                java.util.Arrays.fill(x, 0.0);
                java.util.Arrays.fill(mark, -1);
                valid = false;
                return false;
            }
            ud[k] = pivot;
            double inv = 1.0 / pivot;
            for (int s = lp[k]; s < lp[k + 1]; s++) {
                int i = li[s];
                lx[s] = x[i] * inv;
                x[i] = 0.0;
            }
        }
        valid = true;
        return true;
    }

    /** Smallest |u_kk| (for the singularity test after a pivoting factorisation). */
    double minAbsDiagonal() {
        double m = Double.POSITIVE_INFINITY;
        for (int k = 0; k < n; k++) {
            double a = Math.abs(ud[k]);
            if (!(a >= m)) {
                m = a;
            }
        }
        return m;
    }

    /** Solves L U z = P b' in place: on entry b'[r] in {@code b}, on exit z; {@code w} is scratch (length n). */
    void solve(double[] b, double[] w) {
        for (int r = 0; r < n; r++) {
            w[pinv[r]] = b[r];
        }
        for (int j = 0; j < n; j++) {
            double wj = w[j];
            if (wj != 0.0) {
                for (int s = lp[j]; s < lp[j + 1]; s++) {
                    w[li[s]] -= lx[s] * wj;
                }
            }
        }
        for (int j = n - 1; j >= 0; j--) {
            double zj = w[j] / ud[j];
            w[j] = zj;
            if (zj != 0.0) {
                for (int s = up[j]; s < up[j + 1]; s++) {
                    w[ui[s]] -= ux[s] * zj;
                }
            }
        }
        System.arraycopy(w, 0, b, 0, n);
    }
}
