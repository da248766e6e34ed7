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

    /** Fast exchange rate between u and v of {@link #CANCELLING} (1/time): makes the system stiff. */
    static final double EXCHANGE = 1e6;

    /**
     * y1' = -a y1, u' = -a u - K u + K v, v' = -a v + K u - K v, y2' = y1 - u - v, with y1(0) = y2(0) = Y = 3e5,
     * u(0) = Y / 3, v(0) = Y - Y / 3 and a fast exchange K = {@link #EXCHANGE}: (u + v)' = -a (u + v), so
     * u + v = y1, y2 = Y and dy2/da = 0 for all t, while dy1/da = d(u + v)/da = -t Y e^{-at} (closed form).
     * Numerically dy2/da integrates the difference of large sensitivities that round differently, amplified by
     * the stiff exchange: its round-off lies far above atol 1e-12. The error test must not chase it (it sits below
     * the resolution rtol Y of y2 itself).
     */
    static final OdeSystem CANCELLING = new OdeSystem() {
        @Override
        public int stateCount() {
            return 4;
        }

        @Override
        public int parameterCount() {
            return 1;
        }

        @Override
        public void rhs(double t, double[] y, double[] p, double[] f) {
            f[0] = -p[0] * y[0];
            f[1] = -p[0] * y[1] - EXCHANGE * y[1] + EXCHANGE * y[2];
            f[2] = -p[0] * y[2] + EXCHANGE * y[1] - EXCHANGE * y[2];
            f[3] = y[0] - y[1] - y[2];
        }

        @Override
        public void jacobianY(double t, double[] y, double[] p, double[] j) {
            java.util.Arrays.fill(j, 0, 16, 0.0);
            j[0] = -p[0];
            j[5] = -p[0] - EXCHANGE;
            j[6] = EXCHANGE;
            j[9] = EXCHANGE;
            j[10] = -p[0] - EXCHANGE;
            j[12] = 1.0;
            j[13] = -1.0;
            j[14] = -1.0;
        }

        @Override
        public void jacobianP(double t, double[] y, double[] p, double[] j) {
            j[0] = -y[0];
            j[1] = -y[1];
            j[2] = -y[2];
            j[3] = 0.0;
        }
    };

    @Test
    void sensitivityOfLargeStateNearZeroIsNotChasedBelowRoundOff() {
        double a = 0.5;
        double big = 3e5;
        double rtol = 1e-8;
        double atol = 1e-12;
        BdfIntegrator bdf = new BdfIntegrator(SolverSettings.defaults().withTolerances(rtol, atol));
        double[] y0 = {big, big / 3, big - big / 3, big};
        double[] y = new double[4];
        IntegrationSession plain = bdf.start(CANCELLING, 0.0, y0, new double[] {a}, null, null, null);
        plain.advance(20.0, y, null);
        IntegrationSession sens = bdf.start(CANCELLING, 0.0, y0, new double[] {a}, null, new int[] {0}, null);
        double[] s = new double[4];
        for (double t : new double[] {1.0, 5.0, 20.0}) {
            sens.advance(t, y, s);
            double e = Math.exp(-a * t);
            // Closed form (class comment). Tolerances: 100 x the error-test scale of each quantity, rtol x the
            // largest |dy1/da| = Y / (e a) = 2.2e5 over time (so 100 x 2.2e-3), and rtol x |y2| = 3e-3 for dy2/da.
            assertEquals(-t * big * e, s[0], 100 * rtol * big / (Math.E * a), "dy1/da at " + t);
            assertEquals(-t * big * e, s[1] + s[2], 100 * rtol * big / (Math.E * a), "d(u + v)/da at " + t);
            assertEquals(0.0, s[3], 100 * rtol * big, "dy2/da at " + t);
            assertEquals(big, y[3], 100 * rtol * big, "y2 at " + t);
        }
        // With the sensitivities in the error test the step sequence may be somewhat finer than without, but not
        // by the factor that an error test on round-off gives (measured on this system before the floor on |y_i|
        // in the sensitivity weights: 12990 steps with the sensitivity against 399 without; after: 449).
        // Bound: twice the plain run's steps.
        long plainSteps = plain.stats().steps();
        long sensSteps = sens.stats().steps();
        org.junit.jupiter.api.Assertions.assertTrue(sensSteps <= 2 * plainSteps,
                "steps with sensitivities " + sensSteps + " vs plain " + plainSteps);
    }
}
