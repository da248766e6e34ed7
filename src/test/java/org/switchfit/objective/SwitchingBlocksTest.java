package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;

/**
 * Threshold and dose-response residual blocks on the demo problem (datasets/stress_switch.yaml: synthetic data of
 * models/stress_switch.xml; the true values are listed in datasets/stress_switch-truth.md).
 *
 * <p>Gradient tolerance: central differences on θ (log10 scale) with step h = 1e-4 have truncation error about
 * h² |g'''| / 6 ≈ 1e-9 relative for these smooth functions, and rounding noise of about ε_state / h ≈ 1e-13 / 1e-4 =
 * 1e-9 (steady states and folds are solved to |f| ≤ 1e-13); 1e-5 relative leaves a margin of about 1e3 for the
 * steepest-response fallback, whose own gradient is good to about 1e-5 (see continuation.Thresholds).
 */
class SwitchingBlocksTest {
    static final Path DEMO = Path.of("datasets/stress_switch.yaml");
    private static EstimationProblem problem;

    @BeforeAll
    static void load() {
        problem = ProblemLoader.load(DEMO);
    }

    /** θ (log10) at the true values of datasets/stress_switch-truth.md, in the problem's parameter order. */
    static double[] truth(EstimationProblem p) {
        Map<String, Double> t = Map.of("k_basal", 0.01, "k_stim", 0.2, "k_dephos", 1.0,
                "K_inh", 0.4, "k_inh", 10.0, "k_rec", 1.0, "sigma_act", 0.03);
        double[] th = new double[p.parameterCount()];
        for (int j = 0; j < th.length; j++) {
            th[j] = Math.log10(t.get(p.parameters().get(j).id()));
        }
        return th;
    }

    /** Per entry |J - J_fd| <= tol * max(|J_fd|, 1e-2 max|J_block|). */
    static void assertBlockGradient(ResidualBlock b, EstimationProblem p, double[] th, double tol) {
        int np = th.length;
        double[] r = new double[b.size()];
        double[] jac = new double[b.size() * np];
        b.evaluate(new EvaluationContext(p, th, null, null), r, 0, jac);
        double jmax = 0;
        for (double v : jac) {
            jmax = Math.max(jmax, Math.abs(v));
        }
        assertTrue(jmax > 0, "block has a zero Jacobian");
        for (int j = 0; j < np; j++) {
            double h = 1e-4;
            double[] tp = th.clone();
            tp[j] += h;
            double[] rp = new double[b.size()];
            b.evaluate(new EvaluationContext(p, tp, null, null), rp, 0, null);
            tp[j] = th[j] - h;
            double[] rm = new double[b.size()];
            b.evaluate(new EvaluationContext(p, tp, null, null), rm, 0, null);
            for (int i = 0; i < b.size(); i++) {
                double fd = (rp[i] - rm[i]) / (2 * h);
                double err = Math.abs(fd - jac[i * np + j]);
                assertTrue(err <= tol * Math.max(Math.abs(fd), 1e-2 * jmax), String.format(java.util.Locale.ROOT,
                        "%s residual %d, θ_%d: J = %.10g, central difference %.10g", b.getClass().getSimpleName(),
                        i, j, jac[i * np + j], fd));
            }
        }
    }

    @Test
    void thresholdAndDoseResponseGradientsMatchCentralDifferences() {
        double[] th = truth(problem);
        List<ResidualBlock> blocks = SwitchingBlocks.of(problem);
        // 2 threshold blocks (up, down) and 2 dose-response blocks (low, high history) on the demo problem
        assertEquals(4, blocks.size());
        for (ResidualBlock b : blocks) {
            assertBlockGradient(b, problem, th, 1e-5);
        }
    }

    @Test
    void modelThresholdsAtTheTruthAgreeWithTheMeasuredOnes() {
        double[] th = truth(problem);
        List<ResidualBlock> blocks = SwitchingBlocks.of(problem);
        for (ResidualBlock b : blocks) {
            if (b instanceof ThresholdBlock t) {
                double[] r = new double[t.size()];
                t.evaluate(new EvaluationContext(problem, th, null, null), r, 0, null);
                double mean = 0;
                for (double v : r) {
                    mean += v / r.length;
                }
                // three replicates with sigma 0.05 (datasets/stress_switch-truth.md): the mean standardised
                // residual is N(0, 1/3) at the truth; |mean| < 4/sqrt(3) fails with probability below 1e-4
                assertTrue(Math.abs(mean) < 4 / Math.sqrt(3), t.id() + " mean residual " + mean);
            }
        }
    }

    @Test
    void fullDemoObjectiveIsFiniteAtTheTruthAndItsGradientMatchesDifferences() {
        LikelihoodObjective obj = LikelihoodObjective.of(problem, SolverSettings.defaults()
                .withMethod(SolverSettings.Method.BDF).withTolerances(1e-10, 1e-12));
        double[] th = truth(problem);
        double[] r = new double[obj.residualCount()];
        double nll = obj.evaluate(th, r, null);
        assertTrue(Double.isFinite(nll));
        // timecourse rows + 6 thresholds + 30 dose-response points (each with a sigma residual: sigma_act estimated)
        assertTrue(obj.residualCount() > 6 + 60, "residuals " + obj.residualCount());
        GradientCheck.assertJacobian(obj, th, 1e-5);
    }

    @Test
    void detailedEvaluationListsEveryThresholdAndDoseResponseWithTheModelValue() {
        LikelihoodObjective obj = LikelihoodObjective.of(problem, SolverSettings.defaults()
                .withMethod(SolverSettings.Method.BDF).withTolerances(1e-10, 1e-12));
        List<SwitchingFit> rows = obj.evaluateDetailed(truth(problem)).switching();
        long thresholds = rows.stream().filter(f -> f.data() == SwitchingFit.Data.THRESHOLD).count();
        assertEquals(6, thresholds, "three up and three down thresholds in datasets/stress_switch.yaml");
        assertEquals(problem.extraData().size() - 6, rows.size() - thresholds, "one row per dose-response point");
        java.util.Map<String, double[]> low = new java.util.HashMap<>();
        for (SwitchingFit f : rows) {
            if (f.data() == SwitchingFit.Data.THRESHOLD) {
                // the folds at the true values, from the independent sympy computation of
                // datasets/stress_switch_check.py (30 digits): fold refinement to 1e-11, 1e-8 relative margin
                double fold = f.direction().equals("up") ? 2.06755334253028 : 0.825486114450160;
                assertEquals("fold", f.note());
                assertEquals(fold, f.model(), 1e-8 * fold);
                assertEquals((f.measurement() - fold) / f.sigma(), f.residual(), 1e-7 / f.sigma());
            } else if (f.direction().equals("low")) {
                low.put(f.observable() + "@" + f.dose(), new double[] {f.model()});
            }
        }
        int bistable = 0;
        for (SwitchingFit f : rows) {
            double[] l = low.get(f.observable() + "@" + f.dose());
            if (f.data() == SwitchingFit.Data.DOSE_RESPONSE && f.direction().equals("high") && l != null) {
                boolean between = f.dose() > 0.825486114450160 && f.dose() < 2.06755334253028;
                // hysteresis: between the folds the state reached from the high state lies above the low one;
                // outside them both histories reach the same (only) stable state
                if (between) {
                    bistable++;
                    assertTrue(f.model() > l[0] + 0.1, "dose " + f.dose() + ": high " + f.model() + ", low " + l[0]);
                } else {
                    assertEquals(l[0], f.model(), 1e-6, "dose " + f.dose());
                }
            }
        }
        assertTrue(bistable > 0, "no dose inside the bistable range");
    }
}
