package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.LocalFit;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;

/**
 * An estimated noise sigma and a prior move the optimum exactly as computed by hand. The observable is a constant
 * mu (a parameter-table parameter that is not in the model), so every estimate has a closed form.
 */
class SigmaAndPriorTest {
    private static final SolverSettings SETTINGS = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    private static final double[] M = {1.3, 0.9, 1.6, 1.1, 1.45, 0.75, 1.2};

    @TempDir
    Path dir;

    private Path problem(String parameterRows, String noise) {
        StringBuilder meas = new StringBuilder("observableId | simulationConditionId | measurement | time\n");
        for (int i = 0; i < M.length; i++) {
            meas.append("obs | c0 | ").append(M[i]).append(" | ").append(i).append('\n');
        }
        return PetabFiles.write(dir, DecaySbml.MODEL,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate | "
                        + "objectivePriorType | objectivePriorParameters\n" + parameterRows,
                "conditionId\nc0",
                "observableId | observableFormula | noiseFormula\nobs | mu | " + noise, meas.toString());
    }

    private static LocalFit fit(LikelihoodObjective obj) {
        return LevenbergMarquardt.defaults().minimize(Fits.problem(obj), obj.problem().nominalTheta());
    }

    /**
     * Gaussian with unknown mean and sigma: the ML estimates are the sample mean and the root mean square deviation
     * (divisor n), and the NLL at the optimum is n/2 log(2 pi sigma²) + n/2 (derived by hand).
     */
    @Test
    void estimatedSigmaIsRootMeanSquareDeviation() {
        Path yaml = problem("mu | lin | -10 | 10 | 0.5 | 1 | | \nsd | log10 | 1e-3 | 10 | 1 | 1 | | ", "sd");
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(yaml), SETTINGS);
        LocalFit f = fit(obj);
        int n = M.length;
        double mean = 0;
        for (double v : M) {
            mean += v / n;
        }
        double ss = 0;
        for (double v : M) {
            ss += (v - mean) * (v - mean);
        }
        double sd = Math.sqrt(ss / n);
        // Tolerance 2e-6: LM stops on a relative cost change of 1e-14, and the cost holds the shift C/2 = 50 of
        // each sigma residual (cost about 350), so the NLL is optimal to about 4e-12 and, with curvature about 1
        // per unit² of mu and log10 sd, the estimates to about sqrt(4e-12) = 2e-6.
        assertEquals(mean, f.theta()[0], 2e-6, "mu");
        assertEquals(Math.log10(sd), f.theta()[1], 2e-6, "log10 sd");
        assertEquals(0.5 * n * Math.log(2 * Math.PI * sd * sd) + 0.5 * n, f.nll(), 1e-10, "NLL");
        GradientCheck.assertJacobian(obj, new double[] {0.8, -0.4}, 1e-6);
    }

    /**
     * Known sigma 0.5 and a normal prior N(1, 0.2²) on mu: the posterior mode is the precision-weighted mean
     * (Σ m / σ² + μ0 / s0²) / (n / σ² + 1 / s0²) (conjugate normal model, derived by hand).
     */
    @Test
    void normalPriorGivesPrecisionWeightedMean() {
        Path yaml = problem("mu | lin | -10 | 10 | 0.5 | 1 | normal | 1;0.2", "0.5");
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(yaml), SETTINGS);
        LocalFit f = fit(obj);
        double sigma = 0.5;
        double s0 = 0.2;
        double sum = 0;
        for (double v : M) {
            sum += v;
        }
        int n = M.length;
        double mu = (sum / (sigma * sigma) + 1.0 / (s0 * s0)) / (n / (sigma * sigma) + 1 / (s0 * s0));
        double nll = 0.5 * Math.log(2 * Math.PI * s0 * s0) + 0.5 * Math.pow((mu - 1) / s0, 2);
        for (double v : M) {
            nll += 0.5 * Math.log(2 * Math.PI * sigma * sigma) + 0.5 * Math.pow((v - mu) / sigma, 2);
        }
        assertEquals(mu, f.theta()[0], 1e-9, "mu");
        assertEquals(nll, f.nll(), 1e-10, "NLL including the prior density");
    }
    /**
     * Uniform prior U(1.2, 1.4) on mu (bounds [-10, 10]), known sigma 0.5: the density is 1/0.2 inside and 0
     * outside (PEtab v1 specification, from memory). Inside, the NLL is the Gaussian NLL plus log 0.2 (derived by
     * hand); outside, evaluate throws PriorSupportException (a point the optimizer rejects) and evaluateDetailed
     * gives +infinity naming the parameter. The sample mean 8.3/7 = 1.186 lies below the support, so a local fit in
     * the wider box of the bounds ends at the support's lower end without ever accepting a point outside it.
     */
    @Test
    void uniformPriorIsZeroOutsideItsSupport() {
        Path yaml = problem("mu | lin | -10 | 10 | 1.3 | 1 | uniform | 1.2;1.4", "0.5");
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(yaml), SETTINGS);
        double sigma = 0.5;
        double nll = Math.log(0.2);
        for (double v : M) {
            nll += 0.5 * Math.log(2 * Math.PI * sigma * sigma) + 0.5 * Math.pow((v - 1.3) / sigma, 2);
        }
        assertEquals(nll, obj.evaluateDetailed(new double[] {1.3}).nll(), 1e-12, "inside: closed form");
        assertThrows(PriorSupportException.class, () -> obj.evaluate(new double[] {1.0},
                new double[obj.residualCount()], null));
        LikelihoodObjective.Evaluation out = obj.evaluateDetailed(new double[] {1.41});
        assertEquals(Double.POSITIVE_INFINITY, out.nll());
        assertTrue(out.outsidePrior().contains("'mu' = 1.41"), out.outsidePrior());
        assertTrue(out.outsidePrior().contains("[1.20000, 1.40000]"), out.outsidePrior());
        LocalFit f = fit(obj);
        assertTrue(f.theta()[0] >= 1.2 && f.theta()[0] < 1.2 + 1e-3, "mu " + f.theta()[0]);
    }
}
