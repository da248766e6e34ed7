package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.junit.jupiter.api.Test;
import org.switchfit.ode.OdeSystem;

/**
 * Phase plane of the two-gene toggle u' = a/(1+v^3) - u, v' = a/(1+u^3) - v with a = 4 (the mutual-repression
 * form of Gardner, Cantor and Collins 2000, Nature 403:339-342, doi:10.1038/35002131), checked against closed forms.
 */
class PhasePlanesTest {
    static final double A = 4.0;

    /** The toggle with p = {a}. */
    static final class Toggle implements OdeSystem {
        @Override
        public int stateCount() {
            return 2;
        }

        @Override
        public int parameterCount() {
            return 1;
        }

        @Override
        public void rhs(double t, double[] y, double[] p, double[] dydt) {
            dydt[0] = p[0] / (1 + y[1] * y[1] * y[1]) - y[0];
            dydt[1] = p[0] / (1 + y[0] * y[0] * y[0]) - y[1];
        }

        @Override
        public void jacobianY(double t, double[] y, double[] p, double[] jac) {
            double dv = 1 + y[1] * y[1] * y[1];
            double du = 1 + y[0] * y[0] * y[0];
            jac[0] = -1;
            jac[1] = -3 * p[0] * y[1] * y[1] / (dv * dv);
            jac[2] = -3 * p[0] * y[0] * y[0] / (du * du);
            jac[3] = -1;
        }

        @Override
        public void jacobianP(double t, double[] y, double[] p, double[] jac) {
            jac[0] = 1 / (1 + y[1] * y[1] * y[1]);
            jac[1] = 1 / (1 + y[0] * y[0] * y[0]);
        }
    }

    @Test
    void toggleNullclinesSteadyStatesAndTrajectories() {
        PhasePlaneFile pp = PhasePlanes.compute(new Toggle(), new double[] {A}, new double[2], List.of("u", "v"), 0,
                1, new double[] {0, 4.5}, new double[] {0, 4.5}, 30.0, null);
        // Nullcline u' = 0 is u = a / (1 + v^3) (closed form). Marching squares interpolates linearly inside
        // cells of width h = 4.5 / 160 = 0.028; the interpolation error is O(h^2 |f''|). Measured maximum 6.6e-4
        // (units of u); tolerance 5e-3 = measured x 7.5, as a guard against a broken contour, not a tight bound.
        double[] x = pp.xNullcline().x();
        double[] y = pp.xNullcline().y();
        double worst = 0;
        int count = 0;
        for (int i = 0; i < x.length; i++) {
            if (Double.isFinite(x[i])) {
                worst = Math.max(worst, Math.abs(x[i] - A / (1 + y[i] * y[i] * y[i])));
                count++;
            }
        }
        assertTrue(count > 100, "u-nullcline has only " + count + " points");
        assertTrue(worst < 5e-3, "u-nullcline off by " + worst);
        // Symmetric steady state u = v = s with s^4 + s - a = 0 (substitute u = v into u = a/(1+v^3)); root by
        // Commons Math BrentSolver as an independent oracle. It is a saddle: the Jacobian [[-1, -c], [-c, -1]] with
        // c = 3 a s^2 / (1+s^3)^2 has det = 1 - c^2 < 0 when c > 1 (derived by hand).
        double s = new BrentSolver(1e-14).solve(100, z -> z * z * z * z + z - A, 0.5, 2.0);
        double c = 3 * A * s * s / ((1 + s * s * s) * (1 + s * s * s));
        assertTrue(c > 1, "oracle: symmetric point is a saddle");
        assertEquals(3, pp.steadyStates().size(), pp.steadyStates().toString());
        int stable = 0;
        boolean sawSaddle = false;
        for (PhasePlaneFile.SteadyPoint q : pp.steadyStates()) {
            // Newton stops at a step below 1e-12 relative; 1e-9 absolute in u, v is a loose bound.
            assertEquals(A / (1 + q.y() * q.y() * q.y()), q.x(), 1e-9);
            assertEquals(A / (1 + q.x() * q.x() * q.x()), q.y(), 1e-9);
            if (q.stable()) {
                stable++;
            } else {
                assertEquals(s, q.x(), 1e-9);
                assertEquals(s, q.y(), 1e-9);
                sawSaddle = true;
            }
        }
        assertEquals(2, stable);
        assertTrue(sawSaddle);
        // Trajectories from the corners (0, 4.5) and (4.5, 0) end near the stable state on their side after 30 time
        // units (the stable states attract; after 30 time units the
        // remaining distance is far below the 1e-2 absolute tolerance, which only guards the direction of approach).
        assertEquals(8, pp.trajectories().size());
        PhasePlaneFile.Curve t = pp.trajectories().get(1); // start (4.5, 0)
        double ex = t.x()[t.x().length - 1];
        double ey = t.y()[t.y().length - 1];
        assertTrue(ex > 3 && ey < 0.2, "trajectory from (4.5, 0) ended at " + ex + ", " + ey);
        assertEquals(A / (1 + ey * ey * ey), ex, 1e-2);
        assertTrue(pp.heldStates().isEmpty());
        assertFalse(Json.toJson(pp).isEmpty());
    }
}
