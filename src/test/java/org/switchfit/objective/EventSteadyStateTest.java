package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;

/**
 * Steady-state measurements (PEtab time = inf) of a model with SBML events: the simulation runs on with its events
 * active until the state and the sensitivities settle. Model (derived from the decay test system): X' = u - k X,
 * X(0) = x0, u = 0 until the event "on" (time &gt;= 3) sets u := w. Closed forms, derived by hand: X(1) = x0 e^{-k};
 * the steady state after the event is w / k (dX/dk = -w/k², dX/dw = 1/k, dX/dx0 = 0).
 */
class EventSteadyStateTest {
    /** Integration at rtol 1e-10 (see {@link GradientCheck} for the central-difference tolerance). */
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    /**
     * Steady state reached to |f| <= atol + rtol |y| with the default criterion rtol 1e-8 (SteadyState.defaults):
     * the distance to the true steady state is then about 1e-8 / k relative; 1e-6 leaves a margin.
     */
    private static final double REL = 1e-6;
    private static final double K = 0.3;
    private static final double X0 = 2.0;
    private static final double W = 0.9;
    private static final double SIGMA = 0.1;

    @TempDir
    Path dir;

    private static String model() {
        return DecaySbml.withEvents(DecaySbml.parameter("u", 0, false) + DecaySbml.parameter("w", W, true),
                DecaySbml.event("on", false, "<apply><geq/>" + DecaySbml.TIME + "<cn>3</cn></apply>", null, "u",
                        "<ci>w</ci>"))
                .replace("</listOfReactions>", "<reaction id=\"inflow\" reversible=\"false\"><listOfProducts>"
                        + "<speciesReference species=\"X\" stoichiometry=\"1\" constant=\"true\"/></listOfProducts>"
                        + "<kineticLaw><math xmlns=\"http://www.w3.org/1998/Math/MathML\"><ci>u</ci></math>"
                        + "</kineticLaw></reaction></listOfReactions>");
    }

    @Test
    void steadyStateAfterAnEventMatchesTheClosedForm() {
        Path yaml = PetabFiles.write(dir, model(),
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "k | log10 | 1e-3 | 10 | " + K + " | 1\n"
                        + "x0 | lin | 0.1 | 10 | " + X0 + " | 1\n"
                        + "w | lin | 0.1 | 10 | " + W + " | 1",
                "conditionId\nc0",
                "observableId | observableFormula | noiseFormula\nobs | X | " + SIGMA,
                "observableId | simulationConditionId | measurement | time\nobs | c0 | 1.0 | 1\nobs | c0 | 2.5 | inf");
        EstimationProblem p = ProblemLoader.load(yaml);
        assertTrue(p.hasEvents());
        LikelihoodObjective obj = LikelihoodObjective.of(p, TIGHT);
        double[] th = p.nominalTheta();
        int np = obj.parameterCount();
        double[] r = new double[obj.residualCount()];
        double[] jac = new double[r.length * np];
        obj.evaluate(th, r, jac);
        double[] chain = {K * Math.log(10), 1, 1};
        double x1 = X0 * Math.exp(-K);
        double[] d1 = {-x1, x1 / X0, 0};
        double xs = W / K;
        double[] ds = {-W / (K * K), 0, 1 / K};
        assertEquals((1.0 - x1) / SIGMA, r[0], REL * x1 / SIGMA, "X(1)");
        assertEquals((2.5 - xs) / SIGMA, r[1], REL * xs / SIGMA, "steady state");
        for (int j = 0; j < np; j++) {
            assertEquals(-d1[j] * chain[j] / SIGMA, jac[j], REL * Math.max(1, Math.abs(d1[j] * chain[j])) / SIGMA,
                    "dr/dθ_" + j + " at t = 1");
            assertEquals(-ds[j] * chain[j] / SIGMA, jac[np + j], REL * Math.max(1, Math.abs(ds[j] * chain[j]))
                    / SIGMA, "dr/dθ_" + j + " at the steady state");
        }
        th[0] += 0.1;
        GradientCheck.assertJacobian(obj, th, 1e-5);
    }
}
