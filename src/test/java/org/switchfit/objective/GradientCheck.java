package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertTrue;

/** Jacobian of an objective against central finite differences of its residuals. */
final class GradientCheck {
    private GradientCheck() {
    }

    /**
     * Asserts {@code |J - J_fd|_max <= tol * max(1, |J|_max)} with central differences, step 1e-4 max(1, |θ_j|).
     * With integration at rtol 1e-10 the differencing noise is about 1e-6 and the truncation error about 1e-8
     * times the third derivative: a tolerance of 1e-5 leaves a margin of 10.
     */
    static void assertJacobian(Objective obj, double[] th, double tol) {
        int np = obj.parameterCount();
        int nr = obj.residualCount();
        double[] r = new double[nr];
        double[] jac = new double[nr * np];
        obj.evaluate(th, r, jac);
        double jmax = 0;
        for (double v : jac) {
            jmax = Math.max(jmax, Math.abs(v));
        }
        double[] rp = new double[nr];
        double[] rm = new double[nr];
        double worst = 0;
        String where = "";
        for (int j = 0; j < np; j++) {
            double h = 1e-4 * Math.max(1, Math.abs(th[j]));
            double[] t = th.clone();
            t[j] += h;
            obj.evaluate(t, rp, null);
            t[j] = th[j] - h;
            obj.evaluate(t, rm, null);
            for (int i = 0; i < nr; i++) {
                double fd = (rp[i] - rm[i]) / (2 * h);
                double e = Math.abs(fd - jac[i * np + j]);
                if (e > worst) {
                    worst = e;
                    where = "residual " + i + ", parameter " + j + ": J = " + jac[i * np + j] + ", fd = " + fd;
                }
            }
        }
        assertTrue(worst <= tol * Math.max(1, jmax), "worst Jacobian error " + worst + " at " + where);
    }
}
