package org.switchfit.ode.bdf;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.OdeSystem;
import org.switchfit.ode.SolverSettings;

class BdfFailureTest {

    /** y' = y^2, y(0) = 1: closed form y = 1 / (1 - t), blows up at t = 1. */
    private static final OdeSystem BLOW_UP = new OdeSystem() {
        public int stateCount() {
            return 1;
        }

        public int parameterCount() {
            return 0;
        }

        public void rhs(double t, double[] y, double[] p, double[] d) {
            d[0] = y[0] * y[0];
        }

        public void jacobianY(double t, double[] y, double[] p, double[] j) {
            j[0] = 2 * y[0];
        }

        public void jacobianP(double t, double[] y, double[] p, double[] j) {
        }
    };

    @Test
    void blowUpStopsNearTheSingularityWithAnExplanation() {
        IntegrationSession s = new BdfIntegrator(SolverSettings.defaults().withTolerances(1e-8, 1e-10))
                .start(BLOW_UP, 0.0, new double[] {1.0}, new double[0], null, null, null);
        double[] y = new double[1];
        // Before the singularity the closed form holds. Unstable problem: perturbations grow by
        // dy(t)/dy(0) = 1 / (1 - t)^2 = 100 at t = 0.9, times the usual 100 global/local factor -> 1e-4 relative.
        s.advance(0.9, y, null);
        assertEquals(10.0, y[0], 1e-4 * 10);
        IntegrationException e = assertThrows(IntegrationException.class, () -> s.advance(2.0, y, null));
        // The failure time must be just before t = 1 (the solution leaves every finite range there).
        assertTrue(e.time() > 0.99 && e.time() <= 1.0 + 1e-6, "time " + e.time());
        assertTrue(e.getMessage().contains("integration stopped at t ="), e.getMessage());
    }

    @Test
    void stepLimitNamesTheSettingToChange() {
        SolverSettings few = new SolverSettings(SolverSettings.Method.BDF, 1e-10, 1e-12, 5,
                Double.POSITIVE_INFINITY);
        IntegrationSession s = new BdfIntegrator(few).start(TestSystems.DECAY, 0.0, new double[] {1.0},
                new double[] {1.0}, null, null, null);
        IntegrationException e = assertThrows(IntegrationException.class, () -> s.advance(100.0, new double[1],
                null));
        assertTrue(e.getMessage().contains("more than 5 steps"), e.getMessage());
        assertTrue(e.getMessage().contains("raise maxSteps"), e.getMessage());
    }

    @Test
    void maxStepSizeIsRespected() {
        BdfSession s = new BdfIntegrator(SolverSettings.defaults().withMaxStepSize(0.01))
                .start(TestSystems.DECAY, 0.0, new double[] {1.0}, new double[] {1.0}, null, null, null);
        s.advance(1.0, new double[1], null);
        // 1.0 / 0.01 = 100 steps at least.
        assertTrue(s.stats().steps() >= 100, "steps " + s.stats().steps());
        assertTrue(s.lastStepSize() <= 0.01 * (1 + 1e-12));
    }

    @Test
    void rejectsBackwardOutputAndBadSettings() {
        IntegrationSession s = new BdfIntegrator(SolverSettings.defaults()).start(TestSystems.DECAY, 1.0,
                new double[] {1.0}, new double[] {1.0}, null, null, null);
        assertThrows(IllegalArgumentException.class, () -> s.advance(0.5, new double[1], null));
        assertThrows(IllegalArgumentException.class,
                () -> new BdfIntegrator(SolverSettings.defaults().withTolerances(0, 1e-10)));
        assertThrows(IllegalArgumentException.class, () -> new BdfIntegrator(SolverSettings.defaults())
                .start(TestSystems.DECAY, 0.0, new double[] {1.0}, new double[] {1.0}, null, new int[] {1}, null));
    }

    @Test
    void stopTimeClearsItselfOnceReached() {
        BdfSession s = new BdfIntegrator(SolverSettings.defaults()).start(TestSystems.DECAY, 0.0,
                new double[] {1.0}, new double[] {1.0}, null, null, null);
        s.setStopTime(0.5);
        double[] y = new double[1];
        s.advance(0.5, y, null);
        s.reset(new double[] {2.0}, null);
        s.advance(1.5, y, null);
        // Closed form after the reset: 2 e^{-(t - 0.5)}; 100 x local tolerance (defaults rtol 1e-8).
        assertEquals(2 * Math.exp(-1.0), y[0], 100 * 1e-8 * 2);
    }
}
