package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.PetabFiles;

/**
 * Exact residual Jacobians of PEtab problems whose models have a fast reaction (rapid equilibrium: the sensitivities
 * of the projection onto the equilibrium at the start, after events and at switches, then of the index-reduced
 * right-hand side), against closed forms derived by hand and against central differences.
 */
class FastReactionGradientTest {
    /** Integration at rtol 1e-10 (see {@link GradientCheck} for the central-difference tolerance). */
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    /**
     * Relative tolerance against the closed form: BDF global error of states and sensitivities about 1e-9 to 1e-8
     * at rtol 1e-10 (common practice); 1e-6 leaves a margin of 100.
     */
    private static final double REL = 1e-6;
    private static final double[] T = {0.0, 1.0, 2.5, 4.0};
    private static final double[] M = {1.2, 1.0, 0.6, 0.4};
    private static final double SIGMA = 0.1;

    @TempDir
    Path dir;

    private static String resource(String name) throws IOException {
        try (var in = FastReactionGradientTest.class.getResourceAsStream("/sbml/" + name)) {
            return new String(in.readAllBytes(), StandardCharsets.UTF_8);
        }
    }

    /**
     * The problem around a test model (resources/sbml): kf (log10) and k (lin) estimated, observable [B] with
     * σ = 0.1 at times T. The models are variants of fast-equilibrium.xml: A &lt;-&gt; B fast, kf [A] - kr [B];
     * B -&gt; 0 slow at k [B]; compartment 2, amounts A = 3, B = 1; kr = 1.
     */
    private Path problem(String model) throws IOException {
        StringBuilder meas = new StringBuilder("observableId | simulationConditionId | measurement | time");
        for (int i = 0; i < T.length; i++) {
            meas.append("\nobs | c0 | ").append(M[i]).append(" | ").append(T[i]);
        }
        return PetabFiles.write(dir, resource(model),
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "kf | log10 | 1e-2 | 100 | 2 | 1\n"
                        + "k | lin | 0.01 | 5 | 0.5 | 1",
                "conditionId\nc0",
                "observableId | observableFormula | noiseFormula\nobs | B | " + SIGMA,
                meas.toString());
    }

    private LikelihoodObjective objective(String model) throws IOException {
        return LikelihoodObjective.of(ProblemLoader.load(problem(model)), TIGHT);
    }

    /**
     * Residuals and Jacobian at the nominal values against the closed form, derived by hand: q = K/(1+K), K = kf/kr;
     * the total amount T = 4 e^{-k q t} plus, after a dose of 2 amount units at t1 (an event adding 1 to [A]),
     * 2 e^{-k q (t - t1)}; [B] = q T / V with V = 2. So d[B]/dk = q/V (-q t e1 - q (t - t1) e2) and d[B]/dq =
     * [B]/q + q/V (-k t e1 - k (t - t1) e2) with e1, e2 the two terms, dq/dkf = 1 / (kr (1+K)^2), and on log10
     * dkf/dθ = kf ln 10. At t1 itself the output is the value after the event (SBML).
     */
    private static void assertClosedForm(LikelihoodObjective obj, double t1) {
        double[] th = obj.problem().nominalTheta();
        int np = obj.parameterCount();
        double[] r = new double[obj.residualCount()];
        double[] jac = new double[r.length * np];
        obj.evaluate(th, r, jac);
        double kf = 2;
        double kr = 1;
        double k = 0.5;
        double bigK = kf / kr;
        double q = bigK / (1 + bigK);
        double dqdkf = 1 / (kr * (1 + bigK) * (1 + bigK)) * kf * Math.log(10);
        for (int i = 0; i < T.length; i++) {
            double t = T[i];
            double e1 = 4 * Math.exp(-k * q * t);
            double e2 = t >= t1 ? 2 * Math.exp(-k * q * (t - t1)) : 0;
            double t2 = t >= t1 ? t - t1 : 0;
            double b = q * (e1 + e2) / 2;
            double dk = q / 2 * (-q * t * e1 - q * t2 * e2);
            double dkf = (b / q + q / 2 * (-k * t * e1 - k * t2 * e2)) * dqdkf;
            assertEquals((M[i] - b) / SIGMA, r[i], REL * b / SIGMA, "residual at t = " + t);
            assertEquals(-dkf / SIGMA, jac[i * np], REL * Math.max(Math.abs(dkf), b) / SIGMA, "dr/dkf at " + t);
            assertEquals(-dk / SIGMA, jac[i * np + 1], REL * Math.max(Math.abs(dk), b) / SIGMA, "dr/dk at " + t);
        }
    }

    /** Central differences at the nominal values moved by 0.1 on both estimation scales. */
    private static void assertCentralDifferences(LikelihoodObjective obj) {
        double[] th = obj.problem().nominalTheta();
        th[0] += 0.1;
        th[1] += 0.1;
        GradientCheck.assertJacobian(obj, th, 1e-5);
    }

    @Test
    void jacobianMatchesClosedForm() throws IOException {
        assertClosedForm(objective("fast-equilibrium.xml"), Double.POSITIVE_INFINITY);
    }

    @Test
    void jacobianMatchesCentralDifferences() throws IOException {
        assertCentralDifferences(objective("fast-equilibrium.xml"));
    }

    @Test
    void jacobianAcrossAnEventMatchesClosedForm() throws IOException {
        // fast-event.xml: at t = 1 an event adds 1 to [A], which the fast reaction shares at once; the event time
        // does not depend on θ, the projection after it carries the sensitivities
        LikelihoodObjective obj = objective("fast-event.xml");
        assertClosedForm(obj, 1.0);
        assertCentralDifferences(obj);
    }

    @Test
    void jacobianAcrossStateTriggeredEventsWithATimeDependentEquilibrium() throws IOException {
        // fast-timed-event.xml: the fast law depends on time and the events fire when [B] falls below 1, at
        // θ-dependent times (about 0.9, 2.2 and 3.7): the projection after each needs ∂g/∂t dt_event/dθ too
        assertCentralDifferences(objective("fast-timed-event.xml"));
    }

    @Test
    void jacobianAcrossASwitchInTheFastLaw() throws IOException {
        // fast-switch.xml: the fast law switches when [B] falls to 0.9 (about t = 1.1, depending on θ) and the
        // equilibrium moves from B = K A to B = K A / 2 at once: the jump of the switch and the projection together
        Path yaml = problem("fast-switch.xml");
        assertCentralDifferences(LikelihoodObjective.of(ProblemLoader.load(yaml), TIGHT));
        // a prediction profile of such a model is available (sensitivities across the switch)
        ObservablePrediction.of(ProblemLoader.load(yaml), TIGHT, SteadyState.defaults(), "obs@2");
    }
}
