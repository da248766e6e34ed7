package org.switchfit.ode.bdf;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.junit.jupiter.api.Test;
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.SolverSettings;
import org.switchfit.ode.SolverStats;

class BdfClosedFormTest {

    private static BdfIntegrator bdf(double rtol, double atol) {
        return new BdfIntegrator(SolverSettings.defaults().withTolerances(rtol, atol));
    }

    @Test
    void decayMatchesClosedFormAtEveryOutput() {
        double k = 3.0;
        double y0 = 2.0;
        IntegrationSession s = bdf(1e-10, 1e-12).start(TestSystems.DECAY, 0.0, new double[] {y0},
                new double[] {k}, null, null, null);
        double[] y = new double[1];
        double worst = 0;
        for (int i = 1; i <= 50; i++) {
            double t = 0.1 * i;
            assertEquals(t, s.advance(t, y, null), 0.0, "returns the requested time exactly");
            // Closed form: y = y0 exp(-k t).
            double exact = y0 * Math.exp(-k * t);
            worst = Math.max(worst, Math.abs(y[0] - exact) / (1e-10 * exact + 1e-12));
        }
        // Global error in units of the local tolerance (rtol |y| + atol); BDF global error typically stays within
        // 1-2 orders of magnitude of the local tolerance (common practice): allow 100.
        assertTrue(worst < 100, "worst error in tolerance units " + worst);
    }

    @Test
    void reversibleReactionMatchesClosedForm() {
        double k1 = 2.0;
        double k2 = 0.5;
        IntegrationSession s = bdf(1e-9, 1e-12).start(TestSystems.REVERSIBLE, 0.0, new double[] {1.0, 0.0},
                new double[] {k1, k2}, null, null, null);
        double[] y = new double[2];
        for (double t : new double[] {0.01, 0.3, 1.0, 4.0, 20.0}) {
            s.advance(t, y, null);
            // Closed form: a = a_eq + (a0 - a_eq) exp(-(k1 + k2) t), a_eq = k2 T / (k1 + k2), T = 1, b = T - a.
            double aEq = k2 / (k1 + k2);
            double a = aEq + (1 - aEq) * Math.exp(-(k1 + k2) * t);
            // 1e-7 absolute: 100 x the local tolerance for O(1) values (see decay test).
            assertEquals(a, y[0], 1e-7, "a at t=" + t);
            assertEquals(1 - a, y[1], 1e-7, "b at t=" + t);
            // Conservation a + b = 1 holds for the linear multistep corrector up to the Newton tolerance.
            assertEquals(1.0, y[0] + y[1], 1e-9);
        }
    }

    @Test
    void stiffLinearSystemMatchesEigenDecomposition() {
        // Eigenvalues about -1 and -1000: stiffness ratio 1e3.
        double[] a = {-1.0, 0.5, 200.0, -1000.0};
        RealMatrix am = new Array2DRowRealMatrix(new double[][] {{a[0], a[1]}, {a[2], a[3]}});
        EigenDecomposition eig = new EigenDecomposition(am);
        double[] y0 = {1.0, -2.0};
        IntegrationSession s = bdf(1e-9, 1e-12).start(TestSystems.LINEAR2, 0.0, y0, a, null, null, null);
        double[] y = new double[2];
        for (double t : new double[] {1e-3, 0.05, 1.0, 5.0}) {
            s.advance(t, y, null);
            // Oracle: exp(A t) y0 = V diag(exp(lambda t)) V^-1 y0 via Commons Math 3.6.1 EigenDecomposition.
            double[] lam = eig.getRealEigenvalues();
            RealMatrix v = eig.getV();
            RealMatrix vi = new org.apache.commons.math3.linear.LUDecomposition(v).getSolver().getInverse();
            RealMatrix d = new Array2DRowRealMatrix(2, 2);
            d.setEntry(0, 0, Math.exp(lam[0] * t));
            d.setEntry(1, 1, Math.exp(lam[1] * t));
            double[] ex = v.multiply(d).multiply(vi).operate(y0);
            for (int i = 0; i < 2; i++) {
                // 100 x (rtol * max|y| + atol), max|y| = 2 at t = 0: errors made early decay only as fast as the
                // solution, so the global error scale is set by the largest |y| seen (common practice).
                assertEquals(ex[i], y[i], 100 * (1e-9 * 2.0 + 1e-12), "y" + i + " at t=" + t);
            }
        }
    }

    @Test
    void looserToleranceNeverCostsMoreSteps() {
        long prevSteps = Long.MAX_VALUE;
        long prevRhs = Long.MAX_VALUE;
        for (double rtol : new double[] {1e-12, 1e-10, 1e-8, 1e-6, 1e-4}) {
            IntegrationSession s = bdf(rtol, rtol * 1e-2).start(TestSystems.REVERSIBLE, 0.0,
                    new double[] {1.0, 0.0}, new double[] {2.0, 0.5}, null, null, null);
            s.advance(10.0, new double[2], null);
            SolverStats st = s.stats();
            // Property (common practice): on a smooth problem a looser tolerance never costs more work.
            assertTrue(st.steps() <= prevSteps, "steps at rtol " + rtol + ": " + st.steps() + " > " + prevSteps);
            assertTrue(st.rhsCalls() <= prevRhs, "rhs calls at rtol " + rtol);
            prevSteps = st.steps();
            prevRhs = st.rhsCalls();
        }
    }

    @Test
    void stopTimeIsNeverPassed() {
        BdfSession s = bdf(1e-8, 1e-10).start(TestSystems.DECAY, 0.0, new double[] {1.0}, new double[] {1.0},
                null, null, null);
        s.setStopTime(1.0);
        double[] y = new double[1];
        s.advance(1.0, y, null);
        assertEquals(1.0, s.internalTime(), 0.0, "internal time lands on the stop time exactly");
        // Closed form exp(-1); 100 x local tolerance.
        assertEquals(Math.exp(-1), y[0], 100 * (1e-8 * Math.exp(-1) + 1e-10));
    }
}
