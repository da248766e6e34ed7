package org.switchfit.fit;

/**
 * The structured secant approximation S ≈ Σ r_i ∇²r_i of the second-order part of the least-squares Hessian, as in
 * the adaptive nonlinear least-squares algorithm of Dennis, Gay and Welsch (1981, "An adaptive nonlinear
 * least-squares algorithm", ACM TOMS 7(3):348-368, doi:10.1145/355958.355965; also Dennis and Schnabel 1983,
 * "Numerical Methods for Unconstrained Optimization and Nonlinear Equations", §10.3). The full Hessian of
 * ½|r|² is JᵀJ + Σ r_i ∇²r_i; Gauss-Newton drops the second term, which is exact only for zero or linear
 * residuals. Where residuals stay large at the optimum (estimated noise spreads, whose log-σ residuals never
 * vanish) the dropped term is of the same size as JᵀJ and Gauss-Newton converges only linearly.
 *
 * <p>After a step s from (r, J) to (r⁺, J⁺) the update is the symmetric rank-two DGW update with
 * {@code y = J⁺ᵀr⁺ - Jᵀr} (change of the gradient) and {@code y# = (J⁺ - J)ᵀ r⁺} (what S s should reproduce):
 * {@code S ← τS}, τ = min(1, |sᵀy#| / |sᵀSs|) (the sizing of DGW 1981, §4), then
 * {@code S⁺ = S + ((y# - Ss) yᵀ + y (y# - Ss)ᵀ) / (yᵀs) - ((y# - Ss)ᵀ s) y yᵀ / (yᵀs)²}, skipped when yᵀs ≤ 0
 * (the update would not be well defined). The result satisfies the secant equation {@code S⁺ s = y#}.
 *
 * <p>Layout: row-major n × n over all parameters, {@code s[i * n + j]}. Mutable, confined to one LM run.
 */
final class SecantModel {
    private final int n;
    private final double[] s;
    private final double[] ss;
    private final double[] v;

    SecantModel(int n) {
        this.n = n;
        this.s = new double[n * n];
        this.ss = new double[n];
        this.v = new double[n];
    }

    /** Entry S[i][j]. */
    double get(int i, int j) {
        return s[i * n + j];
    }

    /** sᵀ S s. */
    double quadratic(double[] step) {
        double q = 0;
        for (int i = 0; i < n; i++) {
            double row = 0;
            for (int j = 0; j < n; j++) {
                row += s[i * n + j] * step[j];
            }
            q += step[i] * row;
        }
        return q;
    }

    /**
     * Applies the sized DGW update for step {@code step}, gradient change {@code y} and {@code ySharp}.
     *
     * @return false when the update was skipped (yᵀs ≤ 0 or non-finite)
     */
    boolean update(double[] step, double[] y, double[] ySharp) {
        double ys = dot(y, step);
        if (!(ys > 0) || !Double.isFinite(ys)) {
            return false;
        }
        double sSs = quadratic(step);
        if (sSs != 0.0) {
            double tau = Math.min(1.0, Math.abs(dot(step, ySharp)) / Math.abs(sSs));
            for (int i = 0; i < s.length; i++) {
                s[i] *= tau;
            }
        }
        for (int i = 0; i < n; i++) {
            double row = 0;
            for (int j = 0; j < n; j++) {
                row += s[i * n + j] * step[j];
            }
            ss[i] = row;
        }
        for (int i = 0; i < n; i++) {
            v[i] = ySharp[i] - ss[i];
        }
        double vs = dot(v, step);
        double c1 = 1.0 / ys;
        double c2 = vs / (ys * ys);
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                s[i * n + j] += c1 * (v[i] * y[j] + y[i] * v[j]) - c2 * y[i] * y[j];
            }
        }
        for (double e : s) {
            if (!Double.isFinite(e)) {
                java.util.Arrays.fill(s, 0.0);
                return false;
            }
        }
        return true;
    }

    private static double dot(double[] a, double[] b) {
        double d = 0;
        for (int i = 0; i < a.length; i++) {
            d += a[i] * b[i];
        }
        return d;
    }
}
