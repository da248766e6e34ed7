package org.switchfit.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.switchfit.objective.Objective;

/**
 * How {@link LevenbergMarquardt} ends when evaluations with and without the Jacobian disagree by a small amount, as
 * an adaptive integration with and without sensitivities does: {@link Termination#WITHIN_NOISE} at an optimum,
 * {@link Termination#NO_PROGRESS} where the model still promises a gain (a kink).
 */
class EvaluationNoiseTest {

    // Straight line through scattered data (values chosen by hand): least-squares solution by the normal
    // equations, b = Σ(x - x̄)(y - ȳ) / Σ(x - x̄)², a = ȳ - b x̄ (any statistics textbook).
    private static final double[] X = {0, 1, 2, 3, 4};
    private static final double[] Y = {1.1, 2.9, 5.2, 6.8, 9.1};

    private static CurveObjective line() {
        return new CurveObjective(X, Y, 0.5, 2, (x, b, g) -> {
            g[0] = 1;
            g[1] = x;
            return b[0] + b[1] * x;
        });
    }

    /**
     * The objective whose evaluations without Jacobian are scaled by 1 + ε u(θ), u in [0.5, 1) a fixed hash of θ:
     * the cost is about 2 ε u too high, so near the optimum every trial looks worse than the point it starts from.
     */
    private static Objective noisy(Objective inner, double eps) {
        return new Objective() {
            @Override
            public int parameterCount() {
                return inner.parameterCount();
            }

            @Override
            public int residualCount() {
                return inner.residualCount();
            }

            @Override
            public double evaluate(double[] theta, double[] r, double[] jac) {
                double v = inner.evaluate(theta, r, jac);
                if (jac != null) {
                    return v;
                }
                long h = java.util.Arrays.hashCode(theta);
                double u = 0.5 + 0.5 * ((h * 0x9E3779B97F4A7C15L >>> 11) * 0x1.0p-53);
                double s2 = 0;
                for (int i = 0; i < r.length; i++) {
                    double before = r[i];
                    r[i] *= 1 + eps * u;
                    s2 += r[i] * r[i] - before * before;
                }
                return v + 0.5 * s2;
            }
        };
    }

    private static double[] leastSquares() {
        double mx = 0;
        double my = 0;
        for (int i = 0; i < X.length; i++) {
            mx += X[i] / X.length;
            my += Y[i] / X.length;
        }
        double sxy = 0;
        double sxx = 0;
        for (int i = 0; i < X.length; i++) {
            sxy += (X[i] - mx) * (Y[i] - my);
            sxx += (X[i] - mx) * (X[i] - mx);
        }
        double b = sxy / sxx;
        return new double[] {my - b * mx, b};
    }

    private static FitProblem problem(Objective o) {
        return FitProblem.of(o, new String[] {"a", "b"}, new double[] {-10, -10}, new double[] {10, 10});
    }

    @Test
    void optimumHiddenByEvaluationNoiseEndsWithinNoise() {
        // ε = 1e-6 lies eight decades above the cost tolerance 1e-14, so the cost-change tests cannot stop the run.
        LocalFit f = LevenbergMarquardt.defaults().minimize(problem(noisy(line(), 1e-6)), new double[] {0, 0});
        assertEquals(Termination.WITHIN_NOISE, f.termination());
        assertTrue(f.termination().converged());
        // Where the noise stops it, the cost is within about 2ε of its minimum; the cost is quadratic with
        // curvature Σ x²/σ² = 120 in b (smaller in a), so the parameters are within about sqrt(2 * 2ε cost / 4)
        // < 1e-3 of the solution; 1e-3 is the bound asserted.
        double[] ls = leastSquares();
        assertEquals(ls[0], f.theta()[0], 1e-3);
        assertEquals(ls[1], f.theta()[1], 1e-3);
    }

    @Test
    void withoutNoiseTheSameFitConvergesOrdinarily() {
        LocalFit f = LevenbergMarquardt.defaults().minimize(problem(line()), new double[] {0, 0});
        assertTrue(f.termination() != Termination.WITHIN_NOISE && f.termination().converged(),
                "termination " + f.termination());
        double[] ls = leastSquares();
        // 1e-9: a linear model, solved to rounding in a few Gauss-Newton steps.
        assertEquals(ls[0], f.theta()[0], 1e-9);
        assertEquals(ls[1], f.theta()[1], 1e-9);
    }

    @Test
    void kinkStaysNoProgressDespiteNoise() {
        // y = a + (b + 3|b - 2.5|) x: the effective slope b + 3|b - 2.5| is at least 2.5, above the slope 2 the data
        // want, so the best b is the kink b = 2.5, where the cost is not differentiable. Approaching it from above,
        // the one-sided Jacobian promises the gain of lowering the slope to 2 (far above the noise), which no step
        // delivers: the run must end with NO_PROGRESS, not be called converged.
        CurveObjective kinked = new CurveObjective(X, Y, 0.5, 2, (x, b, g) -> {
            g[0] = 1;
            g[1] = x * (1 + 3 * Math.signum(b[1] - 2.5));
            return b[0] + (b[1] + 3 * Math.abs(b[1] - 2.5)) * x;
        });
        LocalFit f = LevenbergMarquardt.defaults().minimize(problem(noisy(kinked, 1e-6)), new double[] {0, 4});
        assertEquals(Termination.NO_PROGRESS, f.termination());
        assertFalse(f.termination().converged());
        // It did move (accepted steps measured the noise) and ended near the kink; 0.05 is loose on purpose,
        // the point of the test is the label.
        assertTrue(f.jacobianEvaluations() > 2, "accepted steps: " + (f.jacobianEvaluations() - 1));
        assertEquals(2.5, f.theta()[1], 0.05);
    }
}
