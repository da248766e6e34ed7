package org.switchfit.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import java.util.Map;
import java.util.Random;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.objective.FoldPredictions;
import org.switchfit.objective.LikelihoodObjective;
import org.switchfit.objective.Prediction;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;

/**
 * Issue "Thresholds and steady states as data", what it must show #5: a Levenberg-Marquardt fit to synthetic
 * timecourse and switching-threshold data of models/stress_switch.xml (generated here from known parameters, Gaussian
 * noise from java.util.Random with a fixed seed) recovers the thresholds within their measurement sigma and the
 * parameters within their confidence, also from a start where the model is monostable.
 */
class ThresholdFitTest {
    private static final double SIGMA_ACT = 0.03;
    private static final double SIGMA_THRESHOLD = 0.05;
    private static final long SEED = 20261202L;
    private static final double[] TIMES = {0, 2, 5, 10, 15, 20, 30, 40, 50, 60};
    /** True values (log10) of k_stim, K_inh, k_inh: the declared values of models/stress_switch.xml. */
    private static final double[] TRUE_THETA = {Math.log10(0.2), Math.log10(0.4), Math.log10(10.0)};

    @TempDir
    static Path dir;
    private static LikelihoodObjective objective;
    private static double[] trueThresholds;

    private static String yaml(double[] thresholds) {
        Path model = Path.of("models/stress_switch.xml").toAbsolutePath();
        StringBuilder b = new StringBuilder();
        b.append("switchfit_format: 1\nmodel: \"").append(model).append("\"\nparameters:\n");
        for (String id : new String[] {"k_stim", "K_inh", "k_inh"}) {
            b.append("  - {id: ").append(id).append(", lower: 0.01, upper: 100, scale: log10, start: 1}\n");
        }
        b.append("experiments:\n  - id: rest\n    parameters: {stimulus: 0}\n");
        b.append("  - id: step_1p5\n    parameters: {stimulus: 1.5}\n    settle_in: rest\n");
        b.append("  - id: step_3\n    parameters: {stimulus: 3}\n    settle_in: rest\n");
        b.append("observables:\n  - id: act_frac\n    formula: \"ZarnA / (ZarnI + ZarnA)\"\n");
        b.append("    noise: {type: gaussian, sigma: ").append(SIGMA_ACT).append("}\n");
        b.append("data:\n  timecourses:\n    - file: \"tc.csv\"\n  thresholds:\n");
        for (int i = 0; i < thresholds.length; i++) {
            b.append(String.format(Locale.ROOT, "    - {experiment: rest, control: stimulus, direction: %s, "
                    + "value: %.17g, sigma: %s}%n", i < 3 ? "up" : "down", thresholds[i], SIGMA_THRESHOLD));
        }
        return b.toString();
    }

    private static void timecourses(double[] values) throws IOException {
        StringBuilder b = new StringBuilder("experiment,observable,time,value,sigma\n");
        int k = 0;
        for (String e : new String[] {"step_1p5", "step_3"}) {
            for (double t : TIMES) {
                b.append(String.format(Locale.ROOT, "%s,act_frac,%s,%.17g,%n", e, t, values[k++]));
            }
        }
        Files.writeString(dir.resolve("tc.csv"), b.toString());
    }

    @BeforeAll
    static void generate() throws IOException {
        SolverSettings settings = SolverSettings.defaults().withMethod(SolverSettings.Method.BDF)
                .withTolerances(1e-9, 1e-12);
        // pass 1: placeholder data, to simulate the observables and thresholds at the truth
        timecourses(new double[2 * TIMES.length]);
        Files.writeString(dir.resolve("p.yaml"), yaml(new double[] {2, 2, 2, 1, 1, 1}));
        LikelihoodObjective gen = LikelihoodObjective.of(ProblemLoader.load(dir.resolve("p.yaml")), settings);
        double[] sim = gen.evaluateDetailed(TRUE_THETA).simulated();
        Map<String, Prediction> folds = new FoldPredictions().foldPredictions(gen);
        trueThresholds = new double[] {folds.get("rest/stimulus/up").evaluate(TRUE_THETA, null),
                folds.get("rest/stimulus/down").evaluate(TRUE_THETA, null)};
        Random rnd = new Random(SEED);
        double[] tc = new double[sim.length];
        for (int i = 0; i < tc.length; i++) {
            tc[i] = sim[i] + SIGMA_ACT * rnd.nextGaussian();
        }
        double[] th = new double[6];
        for (int i = 0; i < 6; i++) {
            th[i] = trueThresholds[i / 3] + SIGMA_THRESHOLD * rnd.nextGaussian();
        }
        // pass 2: the noisy data set
        timecourses(tc);
        Files.writeString(dir.resolve("p.yaml"), yaml(th));
        EstimationProblem problem = ProblemLoader.load(dir.resolve("p.yaml"));
        objective = LikelihoodObjective.of(problem, settings);
    }

    private static LocalFit fit(double[] start) {
        FitProblem fp = FitProblem.of(objective, new String[] {"k_stim", "K_inh", "k_inh"},
                new double[] {-2, -2, -2}, new double[] {2, 2, 2});
        return LevenbergMarquardt.defaults().withMaxIterations(200).minimize(fp, start);
    }

    private static double[] thresholds(double[] theta) {
        Map<String, Prediction> folds = new FoldPredictions().foldPredictions(objective);
        return new double[] {folds.get("rest/stimulus/up").evaluate(theta, null),
                folds.get("rest/stimulus/down").evaluate(theta, null)};
    }

    /** Standard errors sqrt(diag((J^T J)^-1)) at θ (Gaussian likelihood, Fisher information J^T J). */
    private static double[] standardErrors(double[] theta) {
        int np = 3;
        int nr = objective.residualCount();
        double[] r = new double[nr];
        double[] jac = new double[nr * np];
        objective.evaluate(theta, r, jac);
        RealMatrix f = new Array2DRowRealMatrix(np, np);
        for (int a = 0; a < np; a++) {
            for (int b = 0; b < np; b++) {
                double s = 0;
                for (int i = 0; i < nr; i++) {
                    s += jac[i * np + a] * jac[i * np + b];
                }
                f.setEntry(a, b, s);
            }
        }
        RealMatrix cov = new LUDecomposition(f).getSolver().getInverse();
        double[] se = new double[np];
        for (int a = 0; a < np; a++) {
            se[a] = Math.sqrt(cov.getEntry(a, a));
        }
        return se;
    }

    @Test
    void fitRecoversThresholdsAndParametersAlsoFromAMonostableStart() {
        // start in the monostable region: weak feedback (k_inh = 1) -- checked: both sweep directions then give the
        // same (steepest-response) threshold, which only happens without hysteresis
        double[] mono = {Math.log10(0.3), Math.log10(0.6), Math.log10(1.0)};
        double[] t0 = thresholds(mono);
        assertEquals(t0[0], t0[1], 1e-6 * Math.abs(t0[0]), "start is not monostable: " + t0[0] + " vs " + t0[1]);
        LocalFit f = fit(mono);
        assertTrue(f.termination().converged(), "termination " + f.termination());
        double[] se = standardErrors(f.theta());
        for (int j = 0; j < 3; j++) {
            // |θ̂ - θ_true| <= 3 SE: a 99.7% Wald interval (common practice)
            assertTrue(Math.abs(f.theta()[j] - TRUE_THETA[j]) <= 3 * se[j], String.format(Locale.ROOT,
                    "θ_%d = %.5f, true %.5f, SE %.3g", j, f.theta()[j], TRUE_THETA[j], se[j]));
        }
        double[] th = thresholds(f.theta());
        for (int k = 0; k < 2; k++) {
            assertEquals(trueThresholds[k], th[k], SIGMA_THRESHOLD, "threshold " + k);
        }
        // a start near the truth reaches the same optimum (NLL within 1e-6 relative: the LM cost tolerance)
        LocalFit g = fit(new double[] {TRUE_THETA[0] + 0.2, TRUE_THETA[1] - 0.2, TRUE_THETA[2] + 0.2});
        assertEquals(g.nll(), f.nll(), 1e-6 * Math.max(1, Math.abs(f.nll())));
    }
}
