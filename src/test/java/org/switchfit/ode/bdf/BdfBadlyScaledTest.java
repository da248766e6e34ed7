package org.switchfit.ode.bdf;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.SolverSettings;

/**
 * Iteration matrices I - gamma J whose entries span many orders of magnitude but which are far from singular
 * (rate constants at the bounds of a log10 search box, e.g. 1e-8 and 1e18 in one model).
 */
class BdfBadlyScaledTest {

    /**
     * y1' = -K y1 + K y2, y2' = -a y2 with K = 1e18, a = 0.01 (the 2x2 test system with A = [[-K, K], [0, -a]]).
     * M = I - gamma A is upper triangular with pivots 1 + gamma K and 1 + gamma a, so it is regular for every
     * gamma &gt; 0; a pivot test relative to max|M| = gamma K called the second pivot (about 1) zero once
     * gamma K &gt; 1 / (8 eps n) = 2.8e14, i.e. for every step above about 3e-4, and 3600 time units then needed
     * over 1e7 steps. Closed form (linear system, upper triangular): y2 = e^{-a t},
     * y1 = K / (K - a) e^{-a t} + (y1(0) - K / (K - a)) e^{-K t}.
     */
    @Test
    void fastRelaxationBesideSlowDecayTakesLongSteps() {
        double bigK = 1e18;
        double a = 0.01;
        double[] matrix = {-bigK, bigK, 0.0, -a};
        // 20000 steps: far more than the few hundred a regular run needs, far fewer than the 1.2e7 that steps
        // capped near 3e-4 would need for 3600 time units (so the old pivot test fails here).
        SolverSettings settings = new SolverSettings(SolverSettings.Method.BDF, 1e-8, 1e-12, 20_000,
                Double.POSITIVE_INFINITY);
        IntegrationSession s = new BdfIntegrator(settings).start(TestSystems.LINEAR2, 0.0, new double[] {0.0, 1.0},
                matrix, null, null, null);
        double[] y = new double[2];
        for (double t : new double[] {1.0, 10.0, 100.0, 1000.0, 3600.0}) {
            s.advance(t, y, null);
            double y2 = Math.exp(-a * t);
            double y1 = bigK / (bigK - a) * y2 - bigK / (bigK - a) * Math.exp(-bigK * t);
            // 100 x (rtol |y| + atol): the usual ratio of global to local error for BDF (common practice; see
            // BdfClosedFormTest).
            assertEquals(y2, y[1], 100 * (1e-8 * y2 + 1e-12), "y2 at t = " + t);
            assertEquals(y1, y[0], 100 * (1e-8 * Math.abs(y1) + 1e-12), "y1 at t = " + t);
        }
        long steps = s.stats().steps();
        // Smooth solution with time scale 1 / a = 100: order 5 at rtol 1e-8 needs hundreds of steps, not 1e7.
        assertTrue(steps < 5000, "steps " + steps);
    }
}
