package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;
import org.switchfit.util.UserInputException;

/**
 * {@link ObservablePrediction} (the quantity of Kreutz et al. 2012 prediction profiles) on a model with an event:
 * the decay with a bolus ({@link DecaySbml#BOLUS}: X' = -k X, X(0) = x0, at t = t1: X += d), all four parameters
 * estimated (k on log10 scale, x0, d, t1 linear).
 *
 * <p>Closed form, derived by hand: X(t) = x0 e^{-kt} + [t &gt; t1] d e^{-k(t - t1)}; dX/dk = -t x0 e^{-kt}
 * - [t &gt; t1] (t - t1) d e^{-k(t - t1)}, times dk/dθ = k ln 10 on the log10 scale; dX/dx0 = e^{-kt};
 * dX/dd = [t &gt; t1] e^{-k(t - t1)}; dX/dt1 = [t &gt; t1] k d e^{-k(t - t1)}.
 */
class EventPredictionTest {
    /** Integration at rtol 1e-10, atol 1e-14. */
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    /**
     * Relative tolerance against the closed form: BDF global error of states and sensitivities about 1e-9 to 1e-8
     * at rtol 1e-10 (common practice), the bolus time located to about 1e-12 relative and the jump exact; 1e-6
     * leaves a margin of 100.
     */
    private static final double REL = 1e-6;
    /**
     * Relative tolerance (of the largest gradient entry) against central differences with step h = 1e-4 on the
     * estimation scale: differencing noise about rtol / h = 1e-6 relative, truncation about h² = 1e-8; 2e-5
     * leaves a margin of 20 on the noise.
     */
    private static final double REL_FD = 2e-5;
    private static final double K = 0.3;
    private static final double X0 = 2.0;
    private static final double D = 1.5;
    private static final double T1 = 2.0;

    @TempDir
    Path dir;

    private EstimationProblem problem() {
        return problem("obs | c0 | 1.5 | 1\nobs | c0 | 1.6 | 3\nobs | c0 | 0.9 | 5");
    }

    private EstimationProblem problem(String measurements) {
        return ProblemLoader.load(PetabFiles.write(dir, DecaySbml.BOLUS,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "k | log10 | 1e-3 | 10 | " + K + " | 1\n"
                        + "x0 | lin | 0.1 | 10 | " + X0 + " | 1\n"
                        + "d | lin | 0.1 | 10 | " + D + " | 1\n"
                        + "t1 | lin | 0.5 | 5 | " + T1 + " | 1",
                "conditionId\nc0",
                "observableId | observableFormula | noiseFormula\nobs | X | 0.1",
                "observableId | simulationConditionId | measurement | time\n" + measurements));
    }

    @Test
    void valueAndGradientMatchClosedFormAcrossTheBolus() {
        EstimationProblem p = problem();
        double[] theta = p.nominalTheta();
        assertTrue(p.hasEvents());
        for (double t : new double[] {1.0, 3.0, 7.5}) {
            ObservablePrediction g = ObservablePrediction.of(p, TIGHT, SteadyState.defaults(), "obs@" + t);
            double[] grad = new double[4];
            double v = g.evaluate(theta, grad);
            double after = t > T1 ? 1.0 : 0.0;
            double e1 = Math.exp(-K * t);
            double e2 = after * Math.exp(-K * (t - T1));
            double x = X0 * e1 + D * e2;
            assertEquals(x, v, REL * x, "X at t = " + t);
            double dk = (-t * X0 * e1 - (t - T1) * D * e2) * K * Math.log(10);
            assertEquals(dk, grad[0], REL * Math.abs(dk), "dX/dlog10(k) at t = " + t);
            assertEquals(e1, grad[1], REL * x, "dX/dx0 at t = " + t);
            assertEquals(e2, grad[2], REL * x, "dX/dd at t = " + t);
            assertEquals(K * D * e2, grad[3], REL * x, "dX/dt1 at t = " + t);
            // Sensitivities are always integrated, so the value does not depend on the gradient request.
            assertEquals(v, g.evaluate(theta, null), 0.0, "value with and without gradient at t = " + t);
        }
    }

    @Test
    void gradientMatchesCentralDifferencesOfThePrediction() {
        EstimationProblem p = problem();
        double[] theta = p.nominalTheta();
        ObservablePrediction g = ObservablePrediction.of(p, TIGHT, SteadyState.defaults(), "c0/obs@4");
        double[] grad = new double[4];
        g.evaluate(theta, grad);
        double scale = 0;
        for (double v : grad) {
            scale = Math.max(scale, Math.abs(v));
        }
        for (int j = 0; j < 4; j++) {
            double h = 1e-4 * Math.max(1.0, Math.abs(theta[j]));
            double[] tp = theta.clone();
            tp[j] += h;
            double up = g.evaluate(tp, null);
            tp[j] = theta[j] - h;
            double down = g.evaluate(tp, null);
            assertEquals((up - down) / (2 * h), grad[j], REL_FD * scale, "dX/dθ_" + j);
        }
    }

    @Test
    void steadyStatePredictionOfAModelWithEventsIsAUserError() {
        EstimationProblem p = problem();
        UserInputException e = assertThrows(UserInputException.class,
                () -> ObservablePrediction.of(p, TIGHT, SteadyState.defaults(), "obs@inf"));
        assertTrue(e.getMessage().contains("obs@inf") && e.getMessage().contains("events")
                && e.getMessage().contains("give a finite time"), e.getMessage());
    }

    @Test
    void steadyStateMeasurementOfAModelWithEventsIsEvaluatedWithTheEventsActive() {
        // supported since the eighth session (closed forms in EventSteadyStateTest); here the Jacobian of this
        // problem against central differences
        EstimationProblem p = problem("obs | c0 | 1.5 | 1\nobs | c0 | 0.1 | inf");
        LikelihoodObjective obj = LikelihoodObjective.of(p, TIGHT);
        GradientCheck.assertJacobian(obj, p.nominalTheta(), 1e-5);
    }
}
