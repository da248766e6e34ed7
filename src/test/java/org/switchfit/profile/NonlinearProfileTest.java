package org.switchfit.profile;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.apache.commons.math3.analysis.solvers.BrentSolver;
import org.apache.commons.math3.optim.MaxEval;
import org.apache.commons.math3.optim.nonlinear.scalar.GoalType;
import org.apache.commons.math3.optim.univariate.BrentOptimizer;
import org.apache.commons.math3.optim.univariate.SearchInterval;
import org.apache.commons.math3.optim.univariate.UnivariateObjectiveFunction;
import org.junit.jupiter.api.Test;
import org.switchfit.fit.CurveObjective;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.LocalFit;
import org.switchfit.objective.Objective;
import org.switchfit.objective.Prediction;

/**
 * Profiles of the nonlinear two-parameter model y = A exp(-k t) against an independent brute-force profile
 * (dense grid over the other parameter, refined with Apache Commons Math 3.6.1 BrentOptimizer; interval ends by
 * Commons Math BrentSolver), and prediction profiles of g = 1 + 2k against the parameter profile of k.
 */
class NonlinearProfileTest {

    private static final long SEED = 777L;
    private static final double SIGMA = 0.05;
    /**
     * Brief's bar, 1e-4 absolute (NLL units on points, estimation-scale units on ends). The brute force is
     * accurate to ~1e-10 (Brent relative tolerance 1e-12 on the inner minimum); the profiler to ~1e-9.
     */
    private static final double TOL_BRUTE = 1e-4;

    static CurveObjective objective() {
        SplittableRandom rnd = new SplittableRandom(SEED);
        int n = 15;
        double[] t = new double[n];
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            t[i] = 0.3 * i;
            y[i] = 2.0 * Math.exp(-0.8 * t[i]) + SIGMA * LinearGaussianProfileTest.gaussian(rnd);
        }
        return new CurveObjective(t, y, SIGMA, 2, (x, b, g) -> {
            double e = Math.exp(-b[1] * x);
            g[0] = e;
            g[1] = -b[0] * x * e;
            return b[0] * e;
        });
    }

    static FitProblem problem() {
        return FitProblem.of(objective(), new String[] {"A", "k"}, new double[] {0.1, 0.01},
                new double[] {10, 5});
    }

    /** Brute-force profile: min over the other parameter in [lo, hi] with parameter idx held at z. */
    private static double brute(CurveObjective obj, int idx, double z, double lo, double hi) {
        double[] th = new double[2];
        double[] r = new double[obj.residualCount()];
        int grid = 2001;
        double best = Double.POSITIVE_INFINITY;
        double bestW = lo;
        for (int i = 0; i < grid; i++) {
            double w = lo + (hi - lo) * i / (grid - 1);
            th[idx] = z;
            th[1 - idx] = w;
            double v = obj.evaluate(th, r, null);
            if (v < best) {
                best = v;
                bestW = w;
            }
        }
        double h = (hi - lo) / (grid - 1);
        BrentOptimizer opt = new BrentOptimizer(1e-12, 1e-14);
        double[] tt = new double[2];
        double[] rr = new double[obj.residualCount()];
        return opt.optimize(new MaxEval(1000), GoalType.MINIMIZE,
                new SearchInterval(Math.max(lo, bestW - h), Math.min(hi, bestW + h), bestW),
                new UnivariateObjectiveFunction(w -> {
                    tt[idx] = z;
                    tt[1 - idx] = w;
                    return obj.evaluate(tt, rr, null);
                })).getValue();
    }

    @Test
    void profilesMatchBruteForce() {
        FitProblem p = problem();
        CurveObjective obj = objective();
        LocalFit fit = LevenbergMarquardt.defaults().minimize(p, new double[] {1, 1});
        ProfileLikelihood pl = ProfileLikelihood.defaults();
        double q1 = pl.threshold(1);
        // Other-parameter search ranges for the brute force: A in [0.5, 4], k in [0.2, 2], which contain the
        // inner minima for every profiled value below the 2-dof threshold (checked: no minimum at the edges).
        double[][] range = {{0.2, 2.0}, {0.5, 4.0}};
        for (int idx = 0; idx < 2; idx++) {
            Profile prof = pl.profileParameter(p, fit.theta(), idx);
            assertEquals(Identifiability.IDENTIFIABLE, prof.identifiability());
            double nllStar = prof.optimumNll();
            double maxErr = 0;
            for (ProfilePoint pt : prof.points()) {
                double b = brute(obj, idx, pt.value(), range[idx][0], range[idx][1]);
                maxErr = Math.max(maxErr, Math.abs(b - pt.nll()));
            }
            assertTrue(maxErr < TOL_BRUTE, "max |profile - brute force| = " + maxErr + " for " + prof.name());
            final int fi = idx;
            double lo = prof.pointwise().lower();
            double hi = prof.pointwise().upper();
            BrentSolver solver = new BrentSolver(1e-13);
            double bruteLo = solver.solve(200, z -> 2 * (brute(obj, fi, z, range[fi][0], range[fi][1]) - nllStar)
                    - q1, lo - 0.05 * (hi - lo), prof.optimumValue());
            double bruteHi = solver.solve(200, z -> 2 * (brute(obj, fi, z, range[fi][0], range[fi][1]) - nllStar)
                    - q1, prof.optimumValue(), hi + 0.05 * (hi - lo));
            assertEquals(bruteLo, lo, TOL_BRUTE, "lower end of " + prof.name());
            assertEquals(bruteHi, hi, TOL_BRUTE, "upper end of " + prof.name());
            // Nonlinear model: the interval is not symmetric about the estimate (sanity check that the test
            // is not secretly linear).
            assertTrue(Math.abs((hi - prof.optimumValue()) - (prof.optimumValue() - lo)) > 1e-4);
        }
    }

    @Test
    void predictionProfileOfLinearFunctionEqualsShiftedParameterProfile() {
        FitProblem p = problem();
        LocalFit fit = LevenbergMarquardt.defaults().minimize(p, new double[] {1, 1});
        ProfileLikelihood pl = ProfileLikelihood.defaults();
        Profile pk = pl.profileParameter(p, fit.theta(), 1);
        // g(θ) = 1 + 2 k: the prediction profile is the parameter profile of k on the axis z = 1 + 2k (Kreutz et
        // al. 2012: a prediction that is a bijective function of one parameter has that parameter's profile).
        Prediction g = new Prediction() {
            @Override
            public int parameterCount() {
                return 2;
            }

            @Override
            public double evaluate(double[] theta, double[] gradient) {
                if (gradient != null) {
                    gradient[0] = 0;
                    gradient[1] = 2;
                }
                return 1 + 2 * theta[1];
            }
        };
        Profile pg = pl.profilePrediction(p, fit.theta(), g, "1+2k", Double.NEGATIVE_INFINITY,
                Double.POSITIVE_INFINITY);
        assertEquals(-1, pg.parameterIndex());
        assertEquals(Identifiability.IDENTIFIABLE, pg.identifiability());
        // 1e-6 absolute (brief's bar): both crossings are refined to |Δχ² - q| <= 1e-9 and the constraint is
        // met to 1e-9 standard errors, so ends agree to ~1e-8 in g units.
        assertEquals(1 + 2 * pk.pointwise().lower(), pg.pointwise().lower(), 1e-6);
        assertEquals(1 + 2 * pk.pointwise().upper(), pg.pointwise().upper(), 1e-6);
        assertEquals(1 + 2 * pk.simultaneous().lower(), pg.simultaneous().lower(), 1e-6);
        assertEquals(1 + 2 * pk.simultaneous().upper(), pg.simultaneous().upper(), 1e-6);
        // Pointwise: each prediction-profile point equals the parameter profile at k = (z - 1)/2, computed
        // directly by fixing k. 1e-8 NLL units: both NLLs are LM optima at relative cost tolerance 1e-14.
        FitProblem fixedK = p.withFixed(1, true);
        for (ProfilePoint pt : pg.points()) {
            double k = (pt.value() - 1) / 2;
            LocalFit f = LevenbergMarquardt.defaults().minimize(fixedK, new double[] {fit.theta()[0], k});
            assertEquals(f.nll(), pt.nll(), 1e-8, "at g = " + pt.value());
        }
    }

    @Test
    void nonlinearPredictionProfileEqualsProfileOfReparameterisedModel() {
        // g(θ) = A exp(-k t*) at t* = 3, a nonlinear prediction. Reparameterising the model by (g, k), with
        // A = g exp(k t*), turns g into a parameter, so the prediction profile must equal the ordinary parameter
        // profile of g in the reparameterised problem (Kreutz et al. 2012, §Methods: a prediction profile is the
        // profile likelihood of the prediction as if it were a parameter). Independent computations: the
        // constrained path uses the augmented Lagrangian, the other fixes a parameter.
        double ts = 3.0;
        FitProblem p = problem();
        CurveObjective base = objective();
        LocalFit fit = LevenbergMarquardt.defaults().minimize(p, new double[] {1, 1});
        Prediction g = new Prediction() {
            @Override
            public int parameterCount() {
                return 2;
            }

            @Override
            public double evaluate(double[] theta, double[] gradient) {
                double e = Math.exp(-theta[1] * ts);
                if (gradient != null) {
                    gradient[0] = e;
                    gradient[1] = -theta[0] * ts * e;
                }
                return theta[0] * e;
            }
        };
        Objective re = new Objective() {
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
                double ek = Math.exp(theta[1] * ts);
                double[] ab = {theta[0] * ek, theta[1]};
                double[] jb = jacobian == null ? null : new double[residuals.length * 2];
                double nll = base.evaluate(ab, residuals, jb);
                if (jacobian != null) {
                    for (int i = 0; i < residuals.length; i++) {
                        double dA = jb[2 * i];
                        jacobian[2 * i] = dA * ek;
                        jacobian[2 * i + 1] = dA * theta[0] * ts * ek + jb[2 * i + 1];
                    }
                }
                return nll;
            }
        };
        FitProblem rp = FitProblem.of(re, new String[] {"g", "k"}, new double[] {1e-4, 0.01},
                new double[] {10, 5});
        double[] th = fit.theta();
        double[] rth = {g.evaluate(th, null), th[1]};
        ProfileLikelihood pl = ProfileLikelihood.defaults();
        Profile viaParameter = pl.profileParameter(rp, rth, 0);
        Profile viaPrediction = pl.profilePrediction(p, th, g, "y(3)", Double.NEGATIVE_INFINITY,
                Double.POSITIVE_INFINITY);
        assertEquals(Identifiability.IDENTIFIABLE, viaPrediction.identifiability());
        // 1e-6 absolute in g units (g about 0.18, SE about 0.02): both ends refined to |Δχ² - q| <= 1e-9.
        assertEquals(viaParameter.pointwise().lower(), viaPrediction.pointwise().lower(), 1e-6);
        assertEquals(viaParameter.pointwise().upper(), viaPrediction.pointwise().upper(), 1e-6);
        assertEquals(viaParameter.simultaneous().lower(), viaPrediction.simultaneous().lower(), 1e-6);
        assertEquals(viaParameter.simultaneous().upper(), viaPrediction.simultaneous().upper(), 1e-6);
    }
}
