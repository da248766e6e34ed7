package org.switchfit.ode.bdf;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.OdeSystem;
import org.switchfit.ode.SolverSettings;

class BdfSensitivityTest {

    @Test
    void decaySensitivitiesMatchClosedForm() {
        double k = 1.5;
        double y0 = 2.0;
        double rtol = 1e-10;
        double atol = 1e-12;
        // Column 0: d/dk; column 1: d/dy0 (index -1, s0 = 1).
        IntegrationSession s = new BdfIntegrator(SolverSettings.defaults().withTolerances(rtol, atol))
                .start(TestSystems.DECAY, 0.0, new double[] {y0}, new double[] {k}, null, new int[] {0, -1},
                        new double[] {0.0, 1.0});
        double[] y = new double[1];
        double[] sens = new double[2];
        for (double t : new double[] {0.1, 0.5, 1.0, 2.0, 5.0}) {
            s.advance(t, y, sens);
            double e = Math.exp(-k * t);
            // Closed form: y = y0 e^{-kt}; dy/dk = -t y0 e^{-kt}; dy/dy0 = e^{-kt}.
            // Tolerance: 100 x (rtol x max|s| over time + atol); max |dy/dk| = y0 / (e k) ~ 0.5, max dy/dy0 = 1.
            assertEquals(y0 * e, y[0], 100 * (rtol * y0 + atol), "y at " + t);
            assertEquals(-t * y0 * e, sens[0], 100 * (rtol * 0.5 + atol), "dy/dk at " + t);
            assertEquals(e, sens[1], 100 * (rtol * 1.0 + atol), "dy/dy0 at " + t);
        }
    }

    /** Central finite differences of y(t) with respect to p[k] (relative step hRel). */
    static double[] centralDifference(OdeSystem sys, double[] y0, double[] p, int k, double t, double rtol,
                                      double atol, double hRel) {
        double[] pp = p.clone();
        double[] pm = p.clone();
        double dp = hRel * Math.abs(p[k]);
        pp[k] += dp;
        pm[k] -= dp;
        BdfIntegrator bdf = new BdfIntegrator(SolverSettings.defaults().withTolerances(rtol, atol));
        double[] yp = new double[y0.length];
        double[] ym = new double[y0.length];
        bdf.start(sys, 0.0, y0, pp, null, null, null).advance(t, yp, null);
        bdf.start(sys, 0.0, y0, pm, null, null, null).advance(t, ym, null);
        double[] d = new double[y0.length];
        for (int i = 0; i < d.length; i++) {
            d[i] = (yp[i] - ym[i]) / (2 * dp);
        }
        return d;
    }

    @Test
    void robertsonSensitivitiesMatchCentralDifferences() {
        double[] p = {0.04, 3e7, 1e4};
        double[] y0 = {1, 0, 0};
        double t = 40.0;
        IntegrationSession s = new BdfIntegrator(SolverSettings.defaults().withTolerances(1e-8, 1e-14))
                .start(TestSystems.ROBERTSON, 0.0, y0, p, null, new int[] {0, 1, 2}, null);
        double[] y = new double[3];
        double[] sens = new double[9];
        s.advance(t, y, sens);
        for (int k = 0; k < 3; k++) {
            // Central differences with relative step 1e-4 on runs at rtol 1e-12: truncation ~1e-8 relative,
            // solver noise ~1e-10 / 1e-4 = 1e-6 relative; the sensitivity run at rtol 1e-8 is accurate to
            // ~1e-6 relative. Tolerance 1e-4 relative to the column's largest entry.
            double[] fd = centralDifference(TestSystems.ROBERTSON, y0, p, k, t, 1e-12, 1e-18, 1e-4);
            double scale = 0;
            for (double v : fd) {
                scale = Math.max(scale, Math.abs(v));
            }
            for (int i = 0; i < 3; i++) {
                assertEquals(fd[i], sens[k * 3 + i], 1e-4 * scale, "dy" + i + "/dp" + k);
            }
        }
    }

    @Test
    void stiffLinearSensitivitiesMatchCentralDifferences() {
        double[] a = {-1.0, 0.5, 200.0, -1000.0};
        double[] y0 = {1.0, -2.0};
        double t = 2.0;
        IntegrationSession s = new BdfIntegrator(SolverSettings.defaults().withTolerances(1e-9, 1e-12))
                .start(TestSystems.LINEAR2, 0.0, y0, a, null, new int[] {0, 1, 2, 3, -1},
                        new double[] {0, 0, 0, 0, 0, 0, 0, 0, 1, 0});
        double[] y = new double[2];
        double[] sens = new double[10];
        s.advance(t, y, sens);
        for (int k = 0; k < 4; k++) {
            double[] fd = centralDifference(TestSystems.LINEAR2, y0, a, k, t, 1e-12, 1e-15, 1e-5);
            double scale = Math.max(Math.abs(fd[0]), Math.abs(fd[1]));
            for (int i = 0; i < 2; i++) {
                // Same error budget as the Robertson case: 1e-5 relative to the column scale.
                assertEquals(fd[i], sens[k * 2 + i], 1e-5 * scale, "dy" + i + "/da" + k);
            }
        }
        // Initial-value column d y / d y0[0]: finite difference on the initial state.
        BdfIntegrator ref = new BdfIntegrator(SolverSettings.defaults().withTolerances(1e-12, 1e-15));
        double h = 1e-5;
        double[] yp = new double[2];
        double[] ym = new double[2];
        ref.start(TestSystems.LINEAR2, 0.0, new double[] {1 + h, -2}, a, null, null, null).advance(t, yp, null);
        ref.start(TestSystems.LINEAR2, 0.0, new double[] {1 - h, -2}, a, null, null, null).advance(t, ym, null);
        for (int i = 0; i < 2; i++) {
            double fd = (yp[i] - ym[i]) / (2 * h);
            assertEquals(fd, sens[8 + i], 1e-5 * Math.max(1e-3, Math.abs(fd)), "dy" + i + "/dy0_0");
        }
    }

    @Test
    void sensitivitiesSurviveResetWithoutNewValues() {
        // Reset to the same state with s = null must keep the sensitivities: the result equals an
        // uninterrupted run (closed form dy/dk = -t y0 e^{-kt}).
        double k = 0.7;
        IntegrationSession s = new BdfIntegrator(SolverSettings.defaults().withTolerances(1e-10, 1e-12))
                .start(TestSystems.DECAY, 0.0, new double[] {1.0}, new double[] {k}, null, new int[] {0}, null);
        double[] y = new double[1];
        double[] sens = new double[1];
        s.advance(1.0, y, sens);
        s.reset(y, null);
        s.advance(3.0, y, sens);
        // 100 x (rtol x max|s| + atol), max |dy/dk| = 1 / (e k) ~ 0.53.
        assertEquals(-3.0 * Math.exp(-3 * k), sens[0], 100 * (1e-10 * 0.53 + 1e-12));
    }
}
