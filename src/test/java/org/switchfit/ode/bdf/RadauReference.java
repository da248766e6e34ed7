package org.switchfit.ode.bdf;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.DecompositionSolver;
import org.apache.commons.math3.linear.LUDecomposition;
import org.switchfit.ode.OdeSystem;

/**
 * Independent test oracle for stiff problems: the 3-stage Radau IIA collocation method (order 5, L-stable;
 * Hairer &amp; Wanner, "Solving ODEs II", 2nd ed. 1996, Table IV.5.6) with full Newton on the 3n stage system
 * (linear algebra by Commons Math 3.6.1) and step-size control by step doubling (local error of the two half
 * steps estimated as their difference to the full step / (2^5 - 1)). Shares no code with the BDF under test
 * except the {@link OdeSystem} right-hand side. Slow and simple on purpose; small systems only.
 */
final class RadauReference {

    private static final double S6 = Math.sqrt(6.0);
    private static final double[] C = {(4 - S6) / 10, (4 + S6) / 10, 1.0};
    private static final double[][] A = {
        {(88 - 7 * S6) / 360, (296 - 169 * S6) / 1800, (-2 + 3 * S6) / 225},
        {(296 + 169 * S6) / 1800, (88 + 7 * S6) / 360, (-2 - 3 * S6) / 225},
        {(16 - S6) / 36, (16 + S6) / 36, 1.0 / 9}};

    private RadauReference() {
    }

    /** Integrates from (0, y0) to tEnd with mixed tolerance rtol |y| + atol. */
    static double[] integrate(OdeSystem sys, double[] p, double[] y0, double tEnd, double rtol, double atol) {
        int n = y0.length;
        double[] y = y0.clone();
        double t = 0;
        double h = 1e-8;
        while (t < tEnd) {
            if (t + h > tEnd) {
                h = tEnd - t;
            }
            double[] big = step(sys, p, t, y, h);
            double[] half = big == null ? null : step(sys, p, t, y, h / 2);
            double[] small = half == null ? null : step(sys, p, t + h / 2, half, h / 2);
            double err = Double.POSITIVE_INFINITY;
            if (small != null) {
                double sum = 0;
                for (int i = 0; i < n; i++) {
                    double e = (small[i] - big[i]) / 31.0 / (atol + rtol * Math.max(Math.abs(y[i]), Math.abs(small[i])));
                    sum += e * e;
                }
                err = Math.sqrt(sum / n);
            }
            if (err <= 1.0) {
                t += h;
                y = small;
            }
            double fac = err == 0 ? 4 : 0.9 * Math.pow(1.0 / err, 1.0 / 6.0);
            h *= Math.min(4.0, Math.max(0.2, fac));
            if (h < 1e-14 * Math.max(1, t)) {
                throw new IllegalStateException("reference integrator: step size underflow at t = " + t);
            }
        }
        return y;
    }

    /** One Radau IIA step; null when Newton does not converge. */
    private static double[] step(OdeSystem sys, double[] p, double t, double[] y, double h) {
        int n = y.length;
        double[] jac = new double[n * n];
        double[] z = new double[3 * n];
        double[] f = new double[n];
        double[] yi = new double[n];
        for (int iter = 0; iter < 20; iter++) {
            // Residual R(Z) = Z - h (A x I) F(Z); Newton matrix I - h (A x J(y + Z_j)) per block column.
            double[][] m = new double[3 * n][3 * n];
            double[] r = new double[3 * n];
            for (int i = 0; i < 3 * n; i++) {
                r[i] = z[i];
                m[i][i] = 1.0;
            }
            for (int j = 0; j < 3; j++) {
                for (int k = 0; k < n; k++) {
                    yi[k] = y[k] + z[j * n + k];
                }
                sys.rhs(t + C[j] * h, yi, p, f);
                sys.jacobianY(t + C[j] * h, yi, p, jac);
                for (int i = 0; i < 3; i++) {
                    for (int a = 0; a < n; a++) {
                        r[i * n + a] -= h * A[i][j] * f[a];
                        for (int b = 0; b < n; b++) {
                            m[i * n + a][j * n + b] -= h * A[i][j] * jac[a * n + b];
                        }
                    }
                }
            }
            DecompositionSolver solver = new LUDecomposition(new Array2DRowRealMatrix(m, false)).getSolver();
            if (!solver.isNonSingular()) {
                return null;
            }
            double[] dz = solver.solve(new ArrayRealVector(r)).toArray();
            double norm = 0;
            double scale = 0;
            for (int i = 0; i < 3 * n; i++) {
                z[i] -= dz[i];
                norm = Math.max(norm, Math.abs(dz[i]));
                scale = Math.max(scale, Math.abs(y[i % n]));
            }
            if (!Double.isFinite(norm)) {
                return null;
            }
            if (norm <= 1e-15 * Math.max(scale, 1e-300) || norm == 0) {
                double[] out = new double[n];
                for (int k = 0; k < n; k++) {
                    out[k] = y[k] + z[2 * n + k];
                }
                return out;
            }
        }
        return null;
    }
}
