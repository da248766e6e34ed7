package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.PetabFiles;

/**
 * End to end on the tiny PEtab problem of the data package's test resources (invented P -> Q -> nothing model with
 * a pre-equilibration, a steady-state row, row-wise placeholders, an estimated noise parameter, a log10/Laplace
 * observable and priors). Simulations and the NLL are checked against values derived by hand.
 */
class PetabTinyTest {
    /** Integration at rtol 1e-10: simulated values carry a relative error of about 1e-9 (common practice). */
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    /** Relative tolerance for simulated values and NLL: 100 x the integration tolerance. */
    private static final double REL = 1e-7;

    @Test
    void simulationsAndNllMatchHandDerivation() {
        EstimationProblem p = ProblemLoader.load(PetabFiles.tinyProblem());
        LikelihoodObjective obj = LikelihoodObjective.of(p, TIGHT);
        LikelihoodObjective.Evaluation ev = obj.evaluateDetailed(p.nominalTheta());
        // Derived by hand. Pre-equilibration 'starved' (feed 0): P, Q -> 0. Condition 'fed': feed 0.2, k_conv =
        // k_conv_fed = 0.7, k_loss 0.1, P(0) = Q(0) = 0 (P is NaN in the condition table: keep the
        // pre-equilibrated value). P' = 0.2 - 0.7 P, Q' = 0.7 P - 0.1 Q  =>  Q(t) = 2 + e^{-0.7 t}/3 - (7/3)
        // e^{-0.1 t}; steady state Q = 0.2 / 0.1 = 2. Observable q_obs = scale_q * Q + 0.05, scale_q = 1.
        double q25 = 2 + Math.exp(-0.7 * 2.5) / 3 - 7.0 / 3 * Math.exp(-0.1 * 2.5);
        double[] expected = {0.05, q25 + 0.05, 2.05, Math.exp(-0.5)};
        // Row 4: condition 'starved' without pre-equilibration: P(1) = exp(-k_conv * 1), k_conv = 0.5.
        for (int i = 0; i < 4; i++) {
            assertEquals(expected[i], ev.simulated()[i], REL * Math.abs(expected[i]), "row " + (i + 1));
        }
        double[] m = {0.12, 0.81, 1.93, 0.35};
        double nll = 0;
        for (int i = 0; i < 2; i++) {
            // normal, sigma 0.02 (numeric noise parameter)
            nll += 0.5 * Math.log(2 * Math.PI * 0.02 * 0.02) + 0.5 * sq((m[i] - expected[i]) / 0.02);
        }
        // normal, sigma = sd_q = 0.05 (estimated)
        nll += 0.5 * Math.log(2 * Math.PI * 0.05 * 0.05) + 0.5 * sq((m[2] - expected[2]) / 0.05);
        // Laplace on log10 data, scale sd_p = 0.1: |log10 m - log10 h| / b + log(2 b) + log(m ln 10)
        // (PEtab v1 log10-Laplace density, Schmiester et al. 2021)
        nll += Math.abs(Math.log10(m[3]) - Math.log10(expected[3])) / 0.1 + Math.log(0.2)
                + Math.log(m[3] * Math.log(10));
        double prior = 0.5 * Math.log(2 * Math.PI * 0.04) // k_conv ~ N(0.5, 0.2) at 0.5
                + Math.log(0.7) + 0.5 * Math.log(2 * Math.PI) + 0.5 * sq(Math.log(0.7)) // k_conv_fed ~ logN(0, 1)
                + 0.5 * Math.log(2 * Math.PI * 0.25) + 0.5 * sq((Math.log10(0.05) + 1) / 0.5); // sd_q, scale N
        assertEquals(prior, ev.priorPart(), 1e-12, "prior part (closed form, no simulation)");
        assertEquals(nll + prior, ev.nll(), REL * Math.abs(nll + prior));
    }

    @Test
    void gradientMatchesCentralDifferences() {
        EstimationProblem p = ProblemLoader.load(PetabFiles.tinyProblem());
        LikelihoodObjective obj = LikelihoodObjective.of(p, TIGHT);
        double[] th = p.nominalTheta();
        for (int j = 0; j < th.length; j++) {
            th[j] += 0.05 * (j + 1);
        }
        GradientCheck.assertJacobian(obj, th, 1e-5);
    }

    private static double sq(double x) {
        return x * x;
    }

    @Test
    void residualCountCoversEstimatedSigma() {
        EstimationProblem p = ProblemLoader.load(PetabFiles.tinyProblem());
        LikelihoodObjective obj = LikelihoodObjective.of(p, TIGHT);
        // 4 data residuals + 1 for the estimated sigma of row 3 + priors: k_conv 1, k_conv_fed 2 (log-normal
        // has the ln x term), sd_q 1.
        assertEquals(4 + 1 + 4, obj.residualCount());
        assertTrue(obj.constant() != 0);
    }
}
