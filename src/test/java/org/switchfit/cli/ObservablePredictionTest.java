package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.objective.ObservablePrediction;
import org.switchfit.objective.SteadyState;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.PetabFiles;
import org.switchfit.util.UserInputException;

/**
 * {@link ObservablePrediction} on X' = -k X, X(0) = x0 (k linear, x0 on log10 scale). Closed form, derived by hand:
 * g = x0 e^{-k t}, ∂g/∂k = -t g, ∂g/∂(log10 x0) = ln(10) g. Tolerance 1e-8 relative: BDF at rtol 1e-10, whose
 * global error can exceed the local tolerance by one to two orders (common practice); the sensitivities are
 * integrated with the same error control.
 */
class ObservablePredictionTest {
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    private static final double REL = 1e-8;

    @TempDir
    Path dir;

    private EstimationProblem problem() {
        return ProblemLoader.load(PetabFiles.writeDecay(dir, new double[] {2.0, 1.0}, new double[] {0, 1}, 0.1));
    }

    @Test
    void valueAndGradientEqualClosedForm() {
        EstimationProblem p = problem();
        double k = 0.37;
        double x0 = 3.2;
        double[] theta = {k, Math.log10(x0)};
        for (double t : new double[] {0.0, 0.5, 5.0}) {
            ObservablePrediction g = ObservablePrediction.of(p, TIGHT, SteadyState.defaults(), "obs@" + t);
            double[] grad = new double[2];
            double v = g.evaluate(theta, grad);
            double e = x0 * Math.exp(-k * t);
            assertEquals(e, v, REL * e, "g at t=" + t);
            assertEquals(-t * e, grad[0], REL * e * Math.max(t, 1), "dg/dk at t=" + t);
            assertEquals(Math.log(10) * e, grad[1], REL * e * Math.log(10), "dg/dlog10x0 at t=" + t);
            // Sensitivities are always integrated, so the value does not depend on the gradient request.
            assertEquals(v, g.evaluate(theta, null), 0.0, "value with and without gradient");
        }
    }

    @Test
    void experimentPrefixSelectsTheExperiment() {
        ObservablePrediction g = ObservablePrediction.of(problem(), TIGHT, SteadyState.defaults(), "c0/obs@2");
        assertEquals("c0", g.experimentId());
        assertEquals(2.0, g.time());
    }

    @Test
    void malformedOrUnknownSpecsAreUserErrors() {
        EstimationProblem p = problem();
        UserInputException a = assertThrows(UserInputException.class,
                () -> ObservablePrediction.of(p, TIGHT, SteadyState.defaults(), "obs"));
        assertTrue(a.getMessage().contains("obs@t"), a.getMessage());
        UserInputException b = assertThrows(UserInputException.class,
                () -> ObservablePrediction.of(p, TIGHT, SteadyState.defaults(), "obs@soon"));
        assertTrue(b.getMessage().contains("'soon' is not a number"), b.getMessage());
        UserInputException c = assertThrows(UserInputException.class,
                () -> ObservablePrediction.of(p, TIGHT, SteadyState.defaults(), "other/obs@1"));
        assertTrue(c.getMessage().contains("no experiment 'other'"), c.getMessage());
        // NaN is no time at all: the message must not claim it is a negative one.
        UserInputException d = assertThrows(UserInputException.class,
                () -> ObservablePrediction.of(p, TIGHT, SteadyState.defaults(), "obs@NaN"));
        assertTrue(d.getMessage().contains("time NaN is not a number") && d.getMessage().contains("give a time >= 0"),
                d.getMessage());
        UserInputException n = assertThrows(UserInputException.class,
                () -> ObservablePrediction.of(p, TIGHT, SteadyState.defaults(), "obs@-1"));
        assertTrue(n.getMessage().contains("time -1 is negative"), n.getMessage());
    }
}
