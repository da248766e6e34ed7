package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;

/**
 * Exact residual Jacobians of a PEtab problem whose model switches its right-hand side at an estimated time (an
 * assignment rule {@code on = piecewise(0, time - tau < 0, 1)} in the rate law, as in delayed-onset models): the
 * sensitivities take the jump of the switching time, against a closed form derived by hand and against central
 * differences.
 */
class RhsSwitchGradientTest {
    /** Integration at rtol 1e-10 (see {@link GradientCheck} for the central-difference tolerance). */
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    /**
     * Relative tolerance against the closed form: BDF global error of states and sensitivities about 1e-9 to 1e-8
     * at rtol 1e-10 (common practice), switching time located to 1e-12 relative; 1e-6 leaves a margin of 100.
     */
    private static final double REL = 1e-6;

    private static final String TIME = "<csymbol encoding=\"text\" "
            + "definitionURL=\"http://www.sbml.org/sbml/symbols/time\">time</csymbol>";

    /** X' = -k X on, on = [time &gt;= tau], X(0) = x0. */
    private static final String ONSET_MODEL = DecaySbml.MODEL
            .replace("<parameter id=\"x0\" value=\"2\" constant=\"true\"/>",
                    "<parameter id=\"x0\" value=\"2\" constant=\"true\"/>"
                    + "<parameter id=\"tau\" value=\"2\" constant=\"true\"/>"
                    + "<parameter id=\"on\" value=\"0\" constant=\"false\"/>")
            .replace("<apply><times/><ci>k</ci><ci>X</ci></apply>",
                    "<apply><times/><ci>k</ci><ci>X</ci><ci>on</ci></apply>")
            .replace("<listOfReactions>", "<listOfRules><assignmentRule variable=\"on\">"
                    + "<math xmlns=\"http://www.w3.org/1998/Math/MathML\"><piecewise><piece><cn>0</cn><apply><lt/>"
                    + "<apply><minus/>" + TIME + "<ci>tau</ci></apply><cn>0</cn></apply></piece>"
                    + "<otherwise><cn>1</cn></otherwise></piecewise></math></assignmentRule></listOfRules>"
                    + "<listOfReactions>");

    private static final double[] T = {1.0, 2.5, 4.0, 7.0};
    private static final double[] M = {1.9, 1.8, 1.2, 0.5};
    private static final double SIGMA = 0.1;

    @TempDir
    Path dir;

    private Path problem() {
        StringBuilder meas = new StringBuilder("observableId | simulationConditionId | measurement | time");
        for (int i = 0; i < T.length; i++) {
            meas.append("\nobs | c0 | ").append(M[i]).append(" | ").append(T[i]);
        }
        return PetabFiles.write(dir, ONSET_MODEL,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "k | log10 | 1e-3 | 10 | 0.3 | 1\n"
                        + "x0 | lin | 0.1 | 10 | 2 | 1\n"
                        + "tau | lin | 0.1 | 5 | 2 | 1",
                "conditionId\nc0",
                "observableId | observableFormula | noiseFormula\nobs | X | " + SIGMA,
                meas.toString());
    }

    @Test
    void jacobianMatchesClosedFormAcrossTheOnset() {
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(problem()), TIGHT);
        double[] th = obj.problem().nominalTheta();
        int np = obj.parameterCount();
        double[] r = new double[obj.residualCount()];
        double[] jac = new double[r.length * np];
        obj.evaluate(th, r, jac);
        // Derived by hand: for t < tau, X = x0 (dX/dx0 = 1, else 0); for t > tau, X = x0 e^{-k(t - tau)},
        // dX/dk = -(t - tau) X, dX/dx0 = X / x0, dX/dtau = k X. Residual (m - X)/σ, so dr/dθ = -dX/dθ · dlin/dθ / σ
        // with dlin/dθ = lin ln 10 on the log10 scale (k) and 1 on the linear scale.
        double k = 0.3;
        double x0 = 2;
        double tau = 2;
        double[] chain = {k * Math.log(10), 1, 1};
        for (int i = 0; i < T.length; i++) {
            double t = T[i];
            double x = t < tau ? x0 : x0 * Math.exp(-k * (t - tau));
            double[] dx = t < tau ? new double[] {0, 1, 0} : new double[] {-(t - tau) * x, x / x0, k * x};
            assertEquals((M[i] - x) / SIGMA, r[i], REL * x / SIGMA, "residual at t = " + t);
            for (int j = 0; j < np; j++) {
                double expected = -dx[j] * chain[j] / SIGMA;
                assertEquals(expected, jac[i * np + j], REL * Math.max(Math.abs(expected), x / SIGMA),
                        "dr/dθ at t = " + t + ", parameter " + j);
            }
        }
    }

    @Test
    void jacobianMatchesCentralDifferencesAwayFromNominal() {
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(problem()), TIGHT);
        double[] th = obj.problem().nominalTheta();
        th[0] += 0.05;
        th[1] -= 0.2;
        th[2] += 0.7;
        GradientCheck.assertJacobian(obj, th, 1e-5);
    }
}
