package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.PetabFiles;

/**
 * Exact residual Jacobians of a PEtab problem whose model has a fast reaction (rapid equilibrium: the sensitivities
 * of the projection onto the equilibrium at the start, then of the index-reduced right-hand side), against a
 * closed form derived by hand and against central differences.
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

    /**
     * fast-equilibrium.xml (test resources): A &lt;-&gt; B fast, kf [A] - kr [B]; B -&gt; 0 slow at k [B];
     * compartment 2, amounts A = 3, B = 1; kf (log10) and k (lin) estimated, kr = 1.
     */
    private Path problem() throws IOException {
        String model = resource("fast-equilibrium.xml");
        StringBuilder meas = new StringBuilder("observableId | simulationConditionId | measurement | time");
        for (int i = 0; i < T.length; i++) {
            meas.append("\nobs | c0 | ").append(M[i]).append(" | ").append(T[i]);
        }
        return PetabFiles.write(dir, model,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "kf | log10 | 1e-2 | 100 | 2 | 1\n"
                        + "k | lin | 0.01 | 5 | 0.5 | 1",
                "conditionId\nc0",
                "observableId | observableFormula | noiseFormula\nobs | B | " + SIGMA,
                meas.toString());
    }

    @Test
    void jacobianMatchesClosedForm() throws IOException {
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(problem()), TIGHT);
        double[] th = obj.problem().nominalTheta();
        int nr = obj.residualCount();
        int np = obj.parameterCount();
        double[] r = new double[nr];
        double[] jac = new double[nr * np];
        obj.evaluate(th, r, jac);
        // Derived by hand: q = K/(1+K), K = kf/kr; [B] = q T0 exp(-k q t) / V with T0 = 4, V = 2.
        // d[B]/dq = [B] (1/q - k t), dq/dkf = 1 / (kr (1+K)^2), d[B]/dk = -q t [B]; kf on log10: dkf/dθ = kf ln 10.
        double kf = 2;
        double kr = 1;
        double k = 0.5;
        double bigK = kf / kr;
        double q = bigK / (1 + bigK);
        for (int i = 0; i < T.length; i++) {
            double t = T[i];
            double b = q * 4 * Math.exp(-k * q * t) / 2;
            assertEquals((M[i] - b) / SIGMA, r[i], REL * b / SIGMA, "residual at t = " + t);
            double dkf = b * (1 / q - k * t) / (kr * (1 + bigK) * (1 + bigK)) * kf * Math.log(10);
            double dk = -q * t * b;
            assertEquals(-dkf / SIGMA, jac[i * np], REL * Math.max(Math.abs(dkf), b) / SIGMA, "dr/dkf at " + t);
            assertEquals(-dk / SIGMA, jac[i * np + 1], REL * Math.max(Math.abs(dk), b) / SIGMA, "dr/dk at " + t);
        }
    }

    private static String resource(String name) throws IOException {
        try (var in = FastReactionGradientTest.class.getResourceAsStream("/sbml/" + name)) {
            return new String(in.readAllBytes(), java.nio.charset.StandardCharsets.UTF_8);
        }
    }

    @Test
    void jacobianAcrossASwitchInTheFastLaw() throws IOException {
        // fast-switch.xml: the fast law switches when [B] falls to 0.9 (about t = 1.1, depending on θ) and the
        // equilibrium moves from B = K A to B = K A / 2 at once: the jump of the switch and the projection together
        Path yaml = problem();
        java.nio.file.Files.writeString(yaml.resolveSibling("model.xml"), resource("fast-switch.xml"));
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(yaml), TIGHT);
        double[] th = obj.problem().nominalTheta();
        th[0] += 0.1;
        th[1] += 0.1;
        GradientCheck.assertJacobian(obj, th, 1e-5);
        // a prediction profile of such a model is available (sensitivities across the switch)
        ObservablePrediction.of(ProblemLoader.load(yaml), TIGHT, SteadyState.defaults(), "obs@2");
    }

    @Test
    void jacobianAcrossAnEventMatchesClosedForm() throws IOException {
        // fast-event.xml: the same model with an event at t = 1 adding 1 to [A] (2 amount units), which the fast
        // reaction shares at once. Derived by hand: T = 4 e^{-k q t} + 2 e^{-k q (t-1)} after the event, [B] = q T / V
        // (V = 2), so d[B]/dk = q/V (-q t 4 e^{-kqt} - q (t-1) 2 e^{-kq(t-1)}) and d[B]/dq = [B]/q + q/V (-k t 4
        // e^{-kqt} - k (t-1) 2 e^{-kq(t-1)}); before it the formulas of jacobianMatchesClosedForm. The event time
        // does not depend on θ; the projection after it carries the sensitivities.
        Path yaml = problem();
        java.nio.file.Files.writeString(yaml.resolveSibling("model.xml"), resource("fast-event.xml"));
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(yaml), TIGHT);
        double[] th = obj.problem().nominalTheta();
        int nr = obj.residualCount();
        int np = obj.parameterCount();
        double[] r = new double[nr];
        double[] jac = new double[nr * np];
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
            double e2 = t >= 1 ? 2 * Math.exp(-k * q * (t - 1)) : 0; // at t = 1: after the event (SBML)
            double t2 = t >= 1 ? t - 1 : 0;
            double b = q * (e1 + e2) / 2;
            double dk = q / 2 * (-q * t * e1 - q * t2 * e2);
            double dq = b / q + q / 2 * (-k * t * e1 - k * t2 * e2);
            double dkf = dq * dqdkf;
            assertEquals((M[i] - b) / SIGMA, r[i], REL * b / SIGMA, "residual at t = " + t);
            assertEquals(-dkf / SIGMA, jac[i * np], REL * Math.max(Math.abs(dkf), b) / SIGMA, "dr/dkf at " + t);
            assertEquals(-dk / SIGMA, jac[i * np + 1], REL * Math.max(Math.abs(dk), b) / SIGMA, "dr/dk at " + t);
        }
        th[0] += 0.3;
        th[1] += 0.4;
        GradientCheck.assertJacobian(obj, th, 1e-5);
    }

    @Test
    void jacobianAcrossStateTriggeredEventsWithATimeDependentEquilibrium() throws IOException {
        // fast-timed-event.xml: the fast law depends on time and the events fire when [B] falls below 1, at
        // θ-dependent times (about 0.9, 2.2 and 3.7): the projection after each needs ∂g/∂t dt_event/dθ too
        Path yaml = problem();
        java.nio.file.Files.writeString(yaml.resolveSibling("model.xml"), resource("fast-timed-event.xml"));
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(yaml), TIGHT);
        double[] th = obj.problem().nominalTheta();
        th[0] += 0.1;
        th[1] += 0.1;
        GradientCheck.assertJacobian(obj, th, 1e-5);
    }

    @Test
    void jacobianMatchesCentralDifferencesAwayFromNominal() throws IOException {
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(problem()), TIGHT);
        double[] th = obj.problem().nominalTheta();
        th[0] += 0.3;
        th[1] += 0.4;
        GradientCheck.assertJacobian(obj, th, 1e-5);
    }
}
