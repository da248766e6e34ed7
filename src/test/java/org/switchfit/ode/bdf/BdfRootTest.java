package org.switchfit.ode.bdf;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.RootFunctions;
import org.switchfit.ode.SolverSettings;

class BdfRootTest {

    private static final double RTOL = 1e-10;
    private static final double ATOL = 1e-12;

    /** g0 = y - 0.5, g1 = y - 0.1 (later), g2 = t - 100 (never within range). */
    private static final RootFunctions THRESHOLDS = new RootFunctions() {
        public int count() {
            return 3;
        }

        public void evaluate(double t, double[] y, double[] p, double[] g) {
            g[0] = y[0] - 0.5;
            g[1] = y[0] - 0.1;
            g[2] = t - 100;
        }
    };

    private static IntegrationSession decay(RootFunctions r) {
        return new BdfIntegrator(SolverSettings.defaults().withTolerances(RTOL, ATOL))
                .start(TestSystems.DECAY, 0.0, new double[] {1.0}, new double[] {1.0}, r, null, null);
    }

    /**
     * Allowed distance from the exact root: bracket width (contract) plus the solution error divided by |y'|.
     * Solution error bound 100 x (rtol |y| + atol) (common practice global/local factor).
     */
    private static double rootTol(double t, double y, double slope) {
        return org.switchfit.ode.bdf.RootLocator.tolerance(t) + 100 * (RTOL * y + ATOL) / slope;
    }

    @Test
    void locatesDecayThresholdAtLn2() {
        IntegrationSession s = decay(THRESHOLDS);
        double[] y = new double[1];
        double t = s.advance(5.0, y, null);
        assertTrue(s.stoppedAtRoot());
        assertArrayEquals(new int[] {0}, s.rootsFound());
        // Closed form: e^{-t} = 0.5 at t = ln 2.
        assertEquals(Math.log(2), t, rootTol(t, 0.5, 0.5));
        assertEquals(t, s.time(), 0.0);
        assertTrue(y[0] < 0.5, "stops at the right end of the bracket, where the new sign holds");
        // Next: the 0.1 threshold at ln 10, then the output time.
        t = s.advance(5.0, y, null);
        assertTrue(s.stoppedAtRoot());
        assertArrayEquals(new int[] {1}, s.rootsFound());
        assertEquals(Math.log(10), t, rootTol(t, 0.1, 0.1));
        t = s.advance(5.0, y, null);
        assertFalse(s.stoppedAtRoot());
        assertEquals(5.0, t, 0.0);
        // Global error scale: rtol x the largest |y| seen (1 at t = 0), 100 x as above.
        assertEquals(Math.exp(-5), y[0], 100 * (RTOL * 1.0 + ATOL));
    }

    @Test
    void rootAfterOutputTimeIsFoundOnLaterCall() {
        IntegrationSession s = decay(THRESHOLDS);
        double[] y = new double[1];
        // ln 2 = 0.693: first output at 0.5 must not report it.
        assertEquals(0.5, s.advance(0.5, y, null), 0.0);
        assertFalse(s.stoppedAtRoot());
        double t = s.advance(1.0, y, null);
        assertTrue(s.stoppedAtRoot());
        assertEquals(Math.log(2), t, rootTol(t, 0.5, 0.5));
    }

    @Test
    void resetAfterEventRestartsFromNewState() {
        IntegrationSession s = decay(THRESHOLDS);
        double[] y = new double[1];
        double t1 = s.advance(10.0, y, null);
        // Event: refill to 1. The solution then is e^{-(t - t1)}, which crosses 0.5 at t1 + ln 2.
        s.reset(new double[] {1.0}, null);
        assertEquals(t1, s.time(), 0.0);
        double t2 = s.advance(10.0, y, null);
        assertTrue(s.stoppedAtRoot());
        assertArrayEquals(new int[] {0}, s.rootsFound());
        assertEquals(t1 + Math.log(2), t2, 2 * rootTol(t2, 0.5, 0.5));
    }

    @Test
    void simultaneousRootsAreReportedTogether() {
        // g0 and g1 are the same function: both must be reported at one root.
        RootFunctions twin = new RootFunctions() {
            public int count() {
                return 2;
            }

            public void evaluate(double t, double[] y, double[] p, double[] g) {
                g[0] = y[0] - 0.25;
                g[1] = 0.25 - y[0];
            }
        };
        IntegrationSession s = decay(twin);
        double t = s.advance(3.0, new double[1], null);
        assertArrayEquals(new int[] {0, 1}, s.rootsFound());
        // Closed form: e^{-t} = 0.25 at t = ln 4.
        assertEquals(Math.log(4), t, rootTol(t, 0.25, 0.25));
    }
}
