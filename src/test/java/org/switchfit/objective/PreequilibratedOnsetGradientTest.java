package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.OnsetSbml;

/**
 * Exact residual Jacobians and prediction gradients of a PEtab problem with pre-equilibration whose input switches
 * on at an estimated time: {@code x' = b + piecewise(0, time < t_on, u) - k x}, pre-equilibrated at u = 0 (steady
 * state x = b/k), then u = uOn from time 0 ({@link OnsetSbml}). The sensitivities must take the jump of the
 * θ-dependent switching time ({@code s⁺ = s⁻ + (f⁻ - f⁺) dt_on/dθ}) after the pre-equilibration too; checked against
 * the closed form, derived by hand, with τ = t - t_on and E = e^{-k τ}:
 * <pre>
 *   t &lt; t_on:  x = b/k,                          dx/dk = -b/k²,  dx/db = 1/k, dx/du = 0,           dx/dt_on = 0
 *   t &gt; t_on:  x = b/k + (u/k)(1 - E),          dx/db = 1/k,    dx/du = (1 - E)/k,                dx/dt_on = -u E,
 *              dx/dk = -b/k² - (u/k²)(1 - E) + (u/k) τ E
 *   t = inf:    x = (b + u)/k,  dx/dk = -(b + u)/k²,  dx/db = dx/du = 1/k,  dx/dt_on = 0
 * </pre>
 * and against central differences.
 */
class PreequilibratedOnsetGradientTest {
    /** Integration at rtol 1e-10, atol 1e-14 (see {@link GradientCheck} for the central-difference tolerance). */
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    /**
     * Relative tolerance against the closed form. The pre-equilibration stops at |f| &lt;= 1e-12 + 1e-8 |x|
     * ({@link SteadyState#defaults}), i.e. |x - b/k| &lt;= 1e-8 |x| / k = 2e-8 relative at k = 0.5, and the
     * sensitivities relax at the same rate k (their equation is s' = -k s + ∂f/∂θ); the BDF global error at rtol
     * 1e-10 is about 1e-9 to 1e-8 (common practice) and the switching time is located to 1e-12 relative. 1e-6
     * leaves a margin of 50 over the largest of these. The missing jump term changes dx/dt_on by u E (order 1 here),
     * far outside this tolerance.
     */
    private static final double REL = 1e-6;

    private static final double K = 0.5;
    private static final double B = 1.0;
    private static final double U = 2.0;
    private static final double T_ON = 3.0;
    private static final double SIGMA = 0.1;
    /** Measurement times: before the onset, after it, and the steady state (+inf) of the simulation condition. */
    private static final double[] T = {1.0, 4.0, 6.0, 10.0, Double.POSITIVE_INFINITY};
    private static final double[] M = {2.1, 3.5, 4.8, 5.6, 6.1};

    @TempDir
    Path dir;

    private EstimationProblem problem() {
        return ProblemLoader.load(OnsetSbml.writeProblem(dir, K, B, U, T_ON, SIGMA, T, M));
    }

    /** Closed form (class comment): {x, dx/dk, dx/db, dx/du, dx/dt_on} at time t for the nominal values. */
    private static double[] closedForm(double t) {
        if (t == Double.POSITIVE_INFINITY) {
            return new double[] {(B + U) / K, -(B + U) / (K * K), 1 / K, 1 / K, 0};
        }
        if (t < T_ON) {
            return new double[] {B / K, -B / (K * K), 1 / K, 0, 0};
        }
        double tau = t - T_ON;
        double e = Math.exp(-K * tau);
        return new double[] {B / K + U / K * (1 - e), -B / (K * K) - U / (K * K) * (1 - e) + U / K * tau * e,
            1 / K, (1 - e) / K, -U * e};
    }

    /** d(linear)/dθ: k on the log10 scale (k ln 10), the others linear (1); order as in the parameter table. */
    private static final double[] CHAIN = {K * Math.log(10), 1, 1, 1};

    @Test
    void residualJacobianMatchesClosedFormAfterPreequilibration() {
        LikelihoodObjective obj = LikelihoodObjective.of(problem(), TIGHT);
        double[] th = obj.problem().nominalTheta();
        int np = obj.parameterCount();
        double[] r = new double[obj.residualCount()];
        double[] jac = new double[r.length * np];
        obj.evaluate(th, r, jac);
        for (int i = 0; i < T.length; i++) {
            double[] cf = closedForm(T[i]);
            double x = cf[0];
            assertEquals((M[i] - x) / SIGMA, r[i], REL * x / SIGMA, "residual at t = " + T[i]);
            for (int j = 0; j < np; j++) {
                // residual (m - x)/σ: dr/dθ = -dx/dθ · dlin/dθ / σ
                double expected = -cf[1 + j] * CHAIN[j] / SIGMA;
                assertEquals(expected, jac[i * np + j], REL * Math.max(Math.abs(expected), x / SIGMA),
                        "dr/dθ at t = " + T[i] + ", parameter " + j);
            }
        }
        // the residuals alone (states-only simulation) agree with those of the sensitivity run to the tolerance
        double[] r0 = new double[r.length];
        obj.evaluate(th, r0, null);
        for (int i = 0; i < T.length; i++) {
            assertEquals(r[i], r0[i], REL * closedForm(T[i])[0] / SIGMA, "residual without Jacobian, t = " + T[i]);
        }
    }

    @Test
    void residualJacobianMatchesCentralDifferencesAwayFromNominal() {
        LikelihoodObjective obj = LikelihoodObjective.of(problem(), TIGHT);
        double[] th = obj.problem().nominalTheta();
        th[0] += 0.05;
        th[1] -= 0.2;
        th[2] += 0.3;
        th[3] += 0.7;
        GradientCheck.assertJacobian(obj, th, 1e-5);
    }

    @Test
    void predictionGradientMatchesClosedForm() {
        EstimationProblem p = problem();
        double[] th = p.nominalTheta();
        for (double t : new double[] {2.0, 5.0, Double.POSITIVE_INFINITY}) {
            ObservablePrediction g = ObservablePrediction.of(p, TIGHT, SteadyState.defaults(),
                    "obs@" + (t == Double.POSITIVE_INFINITY ? "inf" : String.valueOf(t)));
            double[] grad = new double[th.length];
            double v = g.evaluate(th, grad);
            double[] cf = closedForm(t);
            assertEquals(cf[0], v, REL * cf[0], "prediction at t = " + t);
            for (int j = 0; j < th.length; j++) {
                double expected = cf[1 + j] * CHAIN[j];
                assertEquals(expected, grad[j], REL * Math.max(Math.abs(expected), cf[0]),
                        "dg/dθ at t = " + t + ", parameter " + j);
            }
        }
    }
}
