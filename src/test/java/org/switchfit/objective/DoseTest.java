package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.util.UserInputException;

/**
 * Doses of the switchfit problem format ({@code doses:} of an experiment) in the likelihood: values and exact
 * residual Jacobians against closed forms derived by hand, on both simulation routes without events (BDF directly,
 * and the simulator used by models with right-hand-side switches), with and without pre-equilibration.
 *
 * <p>Model: X' = u - k X in a compartment of size 2 (X a concentration, its state the amount 2 X), X(0) = x0.
 * Closed forms (derived by hand): bolus (add d to X at t = 2): X = x0 e^{-kt} before, x0 e^{-kt} + d e^{-k(t-2)}
 * from t = 2 on (a measurement at the dose time sees the dosed state); infusion (set u := v at t = 1): X = x0 e^{-kt}
 * + (v/k)(1 - e^{-k(t-1)}) after; washout (settled at u = 0.6, set u := 0 at t = 3): X = 0.6/k before,
 * (0.6/k) e^{-k(t-3)} after.
 */
class DoseTest {
    /** Integration at rtol 1e-10 (see {@link GradientCheck} for the central-difference tolerance). */
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    /**
     * Relative tolerance against the closed forms: BDF global error of states and sensitivities about 1e-9 to 1e-8
     * at rtol 1e-10 (common practice); 1e-6 leaves a margin of 100.
     */
    private static final double REL = 1e-6;
    private static final double SIGMA = 0.1;
    private static final double K = 0.3;
    private static final double X0 = 2.0;
    private static final double D = 1.5;
    private static final double V = 0.8;

    /** Rows: experiment, time. */
    private static final Object[][] ROWS = {
        {"bolus", 1.0}, {"bolus", 2.0}, {"bolus", 3.0}, {"bolus", 6.0},
        {"infuse", 0.5}, {"infuse", 1.0}, {"infuse", 2.0}, {"infuse", 5.0},
        {"washout", 1.0}, {"washout", 3.0}, {"washout", 4.0}, {"washout", 8.0},
    };

    @TempDir
    Path dir;

    /**
     * The decay model with an inflow u (reaction rate c u) in a compartment of size 2; with {@code switchAbove100} the
     * inflow is multiplied by piecewise(1, X &lt; 100, 0), a right-hand-side switch on the state that X never reaches
     * (X stays below 3.5): it moves the simulation onto the simulator route without changing the closed forms.
     */
    private static String model(boolean switchAbove100) {
        String rate = switchAbove100 ? "<apply><times/><ci>c</ci><ci>u</ci><piecewise><piece><cn>1</cn><apply><lt/>"
                + "<ci>X</ci><cn>100</cn></apply></piece><otherwise><cn>0</cn></otherwise></piecewise></apply>"
                : "<apply><times/><ci>c</ci><ci>u</ci></apply>";
        return DecaySbml.MODEL
                .replace("size=\"1\"", "size=\"2\"")
                .replace("<apply><times/><ci>k</ci><ci>X</ci></apply>",
                        "<apply><times/><ci>c</ci><ci>k</ci><ci>X</ci></apply>")
                .replace("<parameter id=\"x0\" value=\"2\" constant=\"true\"/>",
                        "<parameter id=\"x0\" value=\"2\" constant=\"true\"/>"
                        + "<parameter id=\"u\" value=\"0\" constant=\"true\"/>")
                .replace("</listOfReactions>", "<reaction id=\"inflow\" reversible=\"false\"><listOfProducts>"
                        + "<speciesReference species=\"X\" stoichiometry=\"1\" constant=\"true\"/></listOfProducts>"
                        + "<kineticLaw><math xmlns=\"http://www.w3.org/1998/Math/MathML\">" + rate
                        + "</math></kineticLaw></reaction></listOfReactions>");
    }

    private Path problem(String model, String extraExperiment) throws IOException {
        return problem(model, extraExperiment, true);
    }

    /** The problem; without {@code washout} its rows are left out of the data (models with events: no settling). */
    private Path problem(String model, String extraExperiment, boolean washout) throws IOException {
        Files.writeString(dir.resolve("model.xml"), model);
        StringBuilder tc = new StringBuilder("experiment,observable,time,value\n");
        for (Object[] row : ROWS) {
            if (washout || !row[0].equals("washout")) {
                tc.append(row[0]).append(",obs,").append(row[1]).append(",1.0\n");
            }
        }
        Files.writeString(dir.resolve("tc.csv"), tc.toString());
        Path yaml = dir.resolve("problem.yaml");
        Files.writeString(yaml, "switchfit_format: 1\nmodel: model.xml\nparameters:\n"
                + "  - {id: k, lower: 1e-3, upper: 10, scale: log10, start: " + K + "}\n"
                + "  - {id: x0, lower: 0.1, upper: 10, scale: lin, start: " + X0 + "}\n"
                + "  - {id: d, lower: 0.1, upper: 10, scale: lin, start: " + D + "}\n"
                + "  - {id: v, lower: 0.1, upper: 10, scale: lin, start: " + V + "}\n"
                + "experiments:\n"
                + "  - id: bolus\n    doses:\n      - {at: 2, target: X, add: d}\n"
                + "  - id: infuse\n    doses:\n      - {at: 1, target: u, set: v}\n"
                + "  - id: fed\n    parameters: {u: 0.6}\n"
                + "  - id: washout\n    parameters: {u: 0.6}\n    settle_in: fed\n"
                + "    doses:\n      - {at: 3, target: u, set: 0}\n" + extraExperiment
                + "observables:\n  - {id: obs, formula: X, noise: {type: gaussian, sigma: " + SIGMA + "}}\n"
                + "data:\n  timecourses:\n    - file: tc.csv\n");
        return yaml;
    }

    /** X and dX/d(k, x0, d, v) (linear parameters) of a row, from the closed forms. */
    private static double[] closedForm(String exp, double t) {
        double k = K;
        switch (exp) {
            case "bolus": {
                double a = X0 * Math.exp(-k * t);
                if (t < 2) {
                    return new double[] {a, -t * a, a / X0, 0, 0};
                }
                double b = Math.exp(-k * (t - 2));
                return new double[] {a + D * b, -t * a - (t - 2) * D * b, a / X0, b, 0};
            }
            case "infuse": {
                double a = X0 * Math.exp(-k * t);
                if (t < 1) {
                    return new double[] {a, -t * a, a / X0, 0, 0};
                }
                double tau = t - 1;
                double e = Math.exp(-k * tau);
                double x = a + V / k * (1 - e);
                double dk = -t * a - V / (k * k) * (1 - e) + V / k * tau * e;
                return new double[] {x, dk, a / X0, 0, (1 - e) / k};
            }
            default: {
                double s = 0.6 / k;
                if (t < 3) {
                    return new double[] {s, -s / k, 0, 0, 0};
                }
                double e = Math.exp(-k * (t - 3));
                return new double[] {s * e, -s / k * e - s * (t - 3) * e, 0, 0, 0};
            }
        }
    }

    private void assertClosedForms(LikelihoodObjective obj) {
        double[] th = obj.problem().nominalTheta();
        int np = obj.parameterCount();
        double[] r = new double[obj.residualCount()];
        double[] jac = new double[r.length * np];
        obj.evaluate(th, r, jac);
        double[] chain = {K * Math.log(10), 1, 1, 1};
        List<org.switchfit.problem.Measurement> ms = obj.problem().measurements();
        int[] offsets = new int[obj.problem().experiments().size()];
        int off = 0;
        for (int e = 0; e < offsets.length; e++) {
            offsets[e] = off;
            off += obj.problem().experiments().get(e).measurements().length;
        }
        for (int e = 0; e < offsets.length; e++) {
            org.switchfit.problem.SimulationExperiment se = obj.problem().experiments().get(e);
            int[] rows = se.measurements();
            for (int i = 0; i < rows.length; i++) {
                double t = ms.get(rows[i]).time();
                double[] cf = closedForm(se.id(), t);
                int row = offsets[e] + i;
                assertEquals((1.0 - cf[0]) / SIGMA, r[row], REL * cf[0] / SIGMA, se.id() + " at t = " + t);
                for (int j = 0; j < np; j++) {
                    double expected = -cf[1 + j] * chain[j] / SIGMA;
                    assertEquals(expected, jac[row * np + j], REL * Math.max(Math.abs(expected), cf[0] / SIGMA),
                            se.id() + ": dr/dθ_" + j + " at t = " + t);
                }
            }
        }
    }

    @Test
    void dosesMatchClosedFormsOnTheDirectRoute() throws IOException {
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(problem(model(false), "")), TIGHT);
        assertClosedForms(obj);
        double[] th = obj.problem().nominalTheta();
        th[0] += 0.1;
        th[2] -= 0.4;
        GradientCheck.assertJacobian(obj, th, 1e-5);
    }

    @Test
    void plottedStatesSeeTheDosedParameterFromTheDoseOn() throws IOException {
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(problem(model(false), "")), TIGHT);
        int infuse = -1;
        for (int e = 0; e < obj.problem().experiments().size(); e++) {
            infuse = obj.problem().experiments().get(e).id().equals("infuse") ? e : infuse;
        }
        double[] times = {0.5, 1.0, 2.0, 5.0};
        LikelihoodObjective.ExperimentStates s = obj.experimentStates(infuse, obj.problem().nominalTheta(), times);
        int u = obj.problem().compiled().parameterIndex("u");
        double[] expectedU = {0, V, V, V}; // u := v at t = 1; a sample at the dose time sees the dose
        for (int i = 0; i < times.length; i++) {
            assertEquals(expectedU[i], s.parametersAt()[i][u], 0.0, "u at t = " + times[i]);
            double x = closedForm("infuse", times[i])[0];
            assertEquals(x * 2, s.states()[i][0], REL * x * 2, "amount of X (compartment size 2) at " + times[i]);
        }
    }

    @Test
    void dosesMatchClosedFormsOnTheSimulatorRoute() throws IOException {
        EstimationProblem p = ProblemLoader.load(problem(model(true), ""));
        assertTrue(p.compiled().rhsSwitchCount() > 0, "the piecewise inflow must make a right-hand-side switch");
        LikelihoodObjective obj = LikelihoodObjective.of(p, TIGHT);
        assertClosedForms(obj);
        double[] th = obj.problem().nominalTheta();
        th[1] += 0.3;
        th[3] += 0.5;
        GradientCheck.assertJacobian(obj, th, 1e-5);
    }

    /**
     * A model with an SBML event (one that fires at t = 100, after every measurement, so the closed forms hold):
     * the doses become events of the model and run on the simulator's event route, with exact sensitivities; the
     * washout experiment is settled first (pre-equilibration by the steady-state run, then the event route).
     */
    @Test
    void dosesMatchClosedFormsInAModelWithEvents() throws IOException {
        String late = model(false).replace("<parameter id=\"u\" value=\"0\" constant=\"true\"/>",
                "<parameter id=\"u\" value=\"0\" constant=\"true\"/>"
                + DecaySbml.parameter("z", 0, false))
                .replace("</listOfReactions>", "</listOfReactions><listOfEvents>" + DecaySbml.event("late", false,
                        "<apply><geq/>" + DecaySbml.TIME + "<cn>100</cn></apply>", null, "z", "<cn>1</cn>")
                        + "</listOfEvents>");
        EstimationProblem p = ProblemLoader.load(problem(late, "", true));
        assertTrue(p.hasEvents());
        assertEquals(List.of(), p.experiments().get(0).doses(), "doses are events of the model here");
        LikelihoodObjective obj = LikelihoodObjective.of(p, TIGHT);
        assertClosedForms(obj);
        double[] th = obj.problem().nominalTheta();
        th[0] -= 0.1;
        th[2] += 0.3;
        GradientCheck.assertJacobian(obj, th, 1e-5);
    }

    @Test
    void dosesOfRuleVariablesAreRefusedWithTheirLocation() throws IOException {
        UserInputException e;
        String rule = model(false).replace("<listOfReactions>", "<listOfRules><assignmentRule variable=\"w\">"
                + "<math xmlns=\"http://www.w3.org/1998/Math/MathML\"><apply><times/><cn>2</cn><ci>k</ci></apply>"
                + "</math></assignmentRule></listOfRules><listOfReactions>")
                .replace("<parameter id=\"u\" value=\"0\" constant=\"true\"/>",
                        "<parameter id=\"u\" value=\"0\" constant=\"true\"/><parameter id=\"w\" constant=\"false\"/>");
        Path ruleDose = problem(rule, "  - id: ruled\n    doses:\n      - {at: 1, target: w, set: 3}\n");
        e = assertThrows(UserInputException.class, () -> ProblemLoader.load(ruleDose));
        assertTrue(e.getMessage().contains("dose target 'w'"), e.getMessage());
        assertTrue(e.getMessage().contains("line"), e.getMessage());
    }
}
