package org.switchfit.fit;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.switchfit.objective.ObjectiveException;
import org.switchfit.util.UserInputException;

/** Bound handling of {@link LevenbergMarquardt}: optima on a bound, fixed parameters, failures. */
class BoundedLevenbergMarquardtTest {

    // Straight line y = a + b x through exact data y = 1 + 2x: the unconstrained optimum is (1, 2).
    private static final double[] X = {0, 1, 2, 3, 4};
    private static final double[] Y = {1, 3, 5, 7, 9};

    private static CurveObjective line() {
        return new CurveObjective(X, Y, 0.5, 2, (x, b, g) -> {
            g[0] = 1;
            g[1] = x;
            return b[0] + b[1] * x;
        });
    }

    @Test
    void optimumOnUpperBoundHasZeroProjectedGradient() {
        // Closed form (derived by hand): with b held at its upper bound 1.5 the best a is mean(y - 1.5 x)
        // = mean(y) - 1.5 mean(x) = 5 - 3 = 2. The cost is convex, so (2, 1.5) is the box optimum;
        // dcost/db there is negative (b wants to grow), so the bound is binding.
        FitProblem p = FitProblem.of(line(), new String[] {"a", "b"}, new double[] {-10, -10},
                new double[] {10, 1.5});
        LocalFit f = LevenbergMarquardt.defaults().minimize(p, new double[] {0, 0});
        assertEquals(Termination.GRADIENT, f.termination());
        // Tolerance 1e-10 absolute: a linear model converges to rounding level (about 1e-15 x |a|) in a few
        // Gauss-Newton steps; 1e-10 leaves room for the damping.
        assertEquals(2.0, f.theta()[0], 1e-10);
        assertEquals(1.5, f.theta()[1], 0.0);
        assertArrayEquals(new int[] {0, 1}, f.activeBounds());
        // Projected gradient ~0 while the raw gradient component for b is large (|dnll/db| = 30 here).
        assertTrue(f.projectedGradientNorm() < 1e-9, "projected gradient " + f.projectedGradientNorm());
    }

    @Test
    void optimumOnLowerBoundOfNonlinearModel() {
        // y = A exp(-k t), exact data from A = 2, k = 0.5; lower bound k >= 0.8 binds. At k = 0.8 the best A is
        // Σ y e / Σ e² with e = exp(-0.8 t) (linear least squares in A, derived by hand).
        double[] t = {0, 0.5, 1, 2, 3, 5};
        double[] y = new double[t.length];
        for (int i = 0; i < t.length; i++) {
            y[i] = 2 * Math.exp(-0.5 * t[i]);
        }
        CurveObjective obj = new CurveObjective(t, y, 0.1, 2, (x, b, g) -> {
            double e = Math.exp(-b[1] * x);
            g[0] = e;
            g[1] = -b[0] * x * e;
            return b[0] * e;
        });
        double num = 0;
        double den = 0;
        for (int i = 0; i < t.length; i++) {
            double e = Math.exp(-0.8 * t[i]);
            num += y[i] * e;
            den += e * e;
        }
        FitProblem p = FitProblem.of(obj, new String[] {"A", "k"}, new double[] {0, 0.8}, new double[] {10, 5});
        LocalFit f = LevenbergMarquardt.defaults().minimize(p, new double[] {5, 3});
        assertEquals(Termination.GRADIENT, f.termination());
        // 1e-9 relative: A solves a 1-D linear least-squares problem once k sits on the bound.
        assertEquals(num / den, f.theta()[0], 1e-9 * num / den);
        assertEquals(0.8, f.theta()[1], 0.0);
        assertArrayEquals(new int[] {0, -1}, f.activeBounds());
    }

    @Test
    void fixedParameterKeepsStartValue() {
        FitProblem p = FitProblem.of(line(), new String[] {"a", "b"}, new double[] {-10, -10},
                new double[] {10, 10}).withFixed(1, true);
        LocalFit f = LevenbergMarquardt.defaults().minimize(p, new double[] {0, 3});
        assertEquals(3.0, f.theta()[1], 0.0);
        // Closed form: a = mean(y) - 3 mean(x) = 5 - 6 = -1. Tolerance 1e-7 absolute: the run may stop on the
        // relative cost test (1e-14) at cost 60, which bounds |Δa| by sqrt(2 * 1e-14 * 60 / H_aa) = 2.4e-7 with
        // H_aa = 5 / 0.5² = 20; measured error is far smaller when the gradient test fires first.
        assertEquals(-1.0, f.theta()[0], 2.5e-7);
        assertTrue(f.termination().converged());
    }

    @Test
    void failureAtStartPropagatesAndTrialFailuresAreRejectedSteps() {
        CurveObjective base = line();
        // Throws for b > 2.5: a trial step beyond that must be rejected, not fatal.
        org.switchfit.objective.Objective guarded = new org.switchfit.objective.Objective() {
            @Override
            public int parameterCount() {
                return 2;
            }

            @Override
            public int residualCount() {
                return base.residualCount();
            }

            @Override
            public double evaluate(double[] theta, double[] residuals, double[] jacobian) {
                if (theta[1] > 2.5) {
                    throw new ObjectiveException("cannot evaluate for b > 2.5");
                }
                return base.evaluate(theta, residuals, jacobian);
            }
        };
        FitProblem p = FitProblem.of(guarded, new String[] {"a", "b"}, new double[] {-10, -10},
                new double[] {10, 10});
        assertThrows(ObjectiveException.class, () -> LevenbergMarquardt.defaults().minimize(p,
                new double[] {0, 3}));
        LocalFit f = LevenbergMarquardt.defaults().minimize(p, new double[] {-5, -8});
        assertTrue(f.termination().converged(), f.termination().toString());
        assertEquals(1.0, f.theta()[0], 1e-9);
        assertEquals(2.0, f.theta()[1], 1e-9);
    }

    @Test
    void jacobianFailureAtATrialPointIsARejectedStep() {
        CurveObjective base = line();
        int[] thrown = new int[1];
        org.switchfit.objective.Objective jacobianFails = new org.switchfit.objective.Objective() {
            @Override
            public int parameterCount() {
                return 2;
            }

            @Override
            public int residualCount() {
                return base.residualCount();
            }

            @Override
            public double evaluate(double[] theta, double[] residuals, double[] jacobian) {
                // Residuals evaluate everywhere; the Jacobian fails in a band the damped path must cross.
                if (jacobian != null && theta[1] > -2 && theta[1] < -1.5) {
                    thrown[0]++;
                    throw new ObjectiveException("sensitivities failed for -2 < b < -1.5");
                }
                return base.evaluate(theta, residuals, jacobian);
            }
        };
        FitProblem p = FitProblem.of(jacobianFails, new String[] {"a", "b"}, new double[] {-10, -10},
                new double[] {10, 10});
        // Heavy initial damping makes short gradient-like steps from b = -9 upwards, so an accepted trial lands
        // in the band: it must become a rejected step, not an abort. Tolerance 1e-9 as above.
        LocalFit f = LevenbergMarquardt.defaults().withInitialDamping(100).minimize(p, new double[] {8, -9});
        assertTrue(thrown[0] >= 1, "the failure path was exercised");
        assertTrue(f.termination().converged(), f.termination().toString());
        assertEquals(1.0, f.theta()[0], 1e-9);
        assertEquals(2.0, f.theta()[1], 1e-9);
    }

    @Test
    void reportedEvaluationCountsAreExact() {
        CurveObjective base = line();
        int[] calls = new int[2];
        org.switchfit.objective.Objective counting = new org.switchfit.objective.Objective() {
            @Override
            public int parameterCount() {
                return 2;
            }

            @Override
            public int residualCount() {
                return base.residualCount();
            }

            @Override
            public double evaluate(double[] theta, double[] residuals, double[] jacobian) {
                synchronized (calls) {
                    calls[0]++;
                    calls[1] += jacobian != null ? 1 : 0;
                }
                return base.evaluate(theta, residuals, jacobian);
            }
        };
        FitProblem p = FitProblem.of(counting, new String[] {"a", "b"}, new double[] {-10, -10},
                new double[] {10, 10});
        LocalFit f = LevenbergMarquardt.defaults().minimize(p, new double[] {4, -3});
        assertEquals(calls[0], f.evaluations());
        assertEquals(calls[1], f.jacobianEvaluations());
        assertTrue(f.iterations() >= 1);
    }

    @Test
    void invalidBoundsAreAUserError() {
        UserInputException e = assertThrows(UserInputException.class, () -> FitProblem.of(line(),
                new String[] {"a", "b"}, new double[] {0, 5}, new double[] {1, 5}));
        assertTrue(e.getMessage().contains("'b'") && e.getMessage().contains("correct the bounds"),
                e.getMessage());
    }

    @Test
    void aStartOnAPlateauIsReportedFlatNotConverged() {
        // y = min(b, 1) x with data y = 3x: for b >= 1 the model ignores b, so the gradient is exactly 0 there while
        // the cost 0.5 sum ((3 - 1) x / 0.5)^2 stays positive (derived by hand). Started there, the run cannot move.
        CurveObjective capped = new CurveObjective(X, new double[] {0, 3, 6, 9, 12}, 0.5, 1, (x, b, g) -> {
            g[0] = b[0] < 1 ? x : 0.0;
            return Math.min(b[0], 1.0) * x;
        });
        FitProblem p = FitProblem.of(capped, new String[] {"b"}, new double[] {-10}, new double[] {10});
        LocalFit flat = LevenbergMarquardt.defaults().minimize(p, new double[] {2});
        assertEquals(Termination.FLAT, flat.termination());
        assertTrue(!flat.termination().converged());
        assertEquals(0, flat.iterations());
        // Started below the cap, the run descends (the cost falls as b grows to 1) and may end on the plateau, where
        // every point is a minimiser: it found lower cost, so that end counts as converged.
        LocalFit moved = LevenbergMarquardt.defaults().minimize(p, new double[] {0});
        assertTrue(moved.termination().converged(), moved.termination().toString());
        assertTrue(moved.theta()[0] > 0.99, "b = " + moved.theta()[0]);
    }
}
