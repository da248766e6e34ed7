package org.switchfit.continuation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.switchfit.ode.OdeSystem;

class SteadyStateSolverTest {
    /** Newton converges quadratically to |f| <= 1e-10; states of order 1, so 1e-12 absolute is rounding-level. */
    private static final double ABS_TOL = 1e-12;

    @Test
    void newtonFindsCubicRoot() {
        // Closed form: -x^3 + x + p = 0 with p = 0 has roots -1, 0, 1; J = 1 - 3x^2 = -2 at x = 1 (stable).
        SteadyState s = SteadyStateSolver.defaults().solve(TestSystems.CUBIC, new double[] {1.3}, new double[] {0, 1});
        assertEquals(1.0, s.state()[0], ABS_TOL);
        assertEquals(0, s.unstableCount());
        // Eigenvalue of a 1x1 Jacobian at a state accurate to 1e-12: 1e-10 absolute.
        assertEquals(-2.0, s.eigenReal()[0], 1e-10);
    }

    @Test
    void pseudoTransientRescuesSingularStart() {
        // At x = 1/sqrt(3) the Jacobian 1 - 3x^2 vanishes exactly, so the first Newton step fails; the dynamics
        // from slightly above carry the state to the stable root x = 1 (closed form as above).
        double x0 = 1 / Math.sqrt(3);
        SteadyState s = SteadyStateSolver.defaults().solve(TestSystems.CUBIC, new double[] {x0},
                new double[] {0, 1});
        assertEquals(1.0, s.state()[0], ABS_TOL);
        assertTrue(s.stable());
    }

    @Test
    void brusselatorEigenvaluesMatchClosedForm() {
        // Equilibrium (a, b/a); J = [[b-1, a^2], [-b, -a^2]]: trace b-1-a^2, det a^2 (closed form).
        double a = 1.5;
        double b = 2.0;
        SteadyState s = SteadyStateSolver.defaults().solve(TestSystems.BRUSSELATOR, new double[] {1, 1},
                new double[] {a, b});
        assertEquals(a, s.state()[0], ABS_TOL);
        assertEquals(b / a, s.state()[1], ABS_TOL);
        double tr = b - 1 - a * a;
        double disc = a * a - tr * tr / 4;
        // Dense QR eigenvalues of a 2x2 matrix: a few ulp of O(1) entries; 1e-12 absolute.
        assertEquals(tr / 2, s.eigenReal()[0], 1e-12);
        assertEquals(Math.sqrt(disc), Math.abs(s.eigenImag()[0]), 1e-12);
        assertTrue(s.stable());
    }

    @Test
    void reducedPhosphoCycleKeepsItsTotal() {
        ReducedSystem red = ConservationLaws.of(TestSystems.PHOSPHO_STOICH).reduce(TestSystems.PHOSPHO_FEEDBACK);
        double[] p = {0.05, 1.0, 0.5, 1.0};
        double[] y0 = {1.5, 0.5};
        double[] q = red.parameters(p, y0);
        SteadyState s = SteadyStateSolver.defaults().solve(red, red.reducedState(y0), q);
        double[] y = red.fullState(s.state(), q);
        double[] f = new double[2];
        TestSystems.PHOSPHO_FEEDBACK.rhs(0, y, p, f);
        // Solver tolerance max|f| <= 1e-10 (absolute).
        assertEquals(0, f[1], 1e-10);
        // The total is a parameter of the reduced system: reconstruction is exact up to rounding.
        assertEquals(2.0, y[0] + y[1], 1e-14);
        assertEquals(0, s.unstableCount());
    }

    @Test
    void failureReportsNumbers() {
        // x' = 1 + x^2 has no real equilibrium (closed form), so both methods must fail.
        OdeSystem none = new OdeSystem() {
            public int stateCount() {
                return 1;
            }

            public int parameterCount() {
                return 0;
            }

            public void rhs(double t, double[] y, double[] p, double[] d) {
                d[0] = 1 + y[0] * y[0];
            }

            public void jacobianY(double t, double[] y, double[] p, double[] j) {
                j[0] = 2 * y[0];
            }

            public void jacobianP(double t, double[] y, double[] p, double[] j) {
            }
        };
        SteadyStateSolver solver = new SteadyStateSolver(1e-10, 1e-12, 20, 200, 1e-3, 10);
        ContinuationException e = assertThrows(ContinuationException.class,
                () -> solver.solve(none, new double[] {0.3}, new double[0]));
        assertTrue(e.getMessage().contains("no steady state"), e.getMessage());
    }
}
