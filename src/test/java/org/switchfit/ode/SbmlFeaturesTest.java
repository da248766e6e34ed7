package org.switchfit.ode;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.switchfit.model.Model;
import org.switchfit.sbml.SbmlReader;

/** Delay, algebraic rules and hierarchical composition on small models with hand-derived solutions. */
class SbmlFeaturesTest {

    private static Trajectory run(String file, double[] times, List<String> outputs) {
        Model m = SbmlReader.read(SbmlSimulationTest.resource(file));
        CompiledModel cm = ModelCompiler.compile(m);
        SolverSettings s = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
        return new Simulator(cm, new DormandPrinceIntegrator(s)).simulate(times, cm.parameterValues(),
                ModelOutputs.of(cm, outputs));
    }

    @Test
    void delayedDecayFollowsMethodOfSteps() {
        // x' = -k x(t-1), x = 2 before and at t = 0, k = 0.5 (method of steps, derived by hand):
        // t in [0,1]: x = 2 - k*2*t;  t in [1,2]: x = x(1) - 2k(t-1) + 2k^2 (t-1)^2 / 2.
        double[] times = {0, 0.5, 1, 1.5, 2};
        Trajectory tr = run("delay.xml", times, List.of("x"));
        double k = 0.5;
        double x1 = 2 - 2 * k;
        double[] expected = {2, 2 - k, x1, x1 - 2 * k * 0.5 + k * k * 0.25, x1 - 2 * k + k * k};
        for (int r = 0; r < times.length; r++) {
            // history interpolated by cubic Hermite on chunks of a quarter lag: the solution is a polynomial of
            // degree <= 2 here, so only the integrator tolerance (1e-10 relative) remains; 1e-8 absolute
            assertEquals(expected[r], tr.value(r, 0), 1e-8, "x at t=" + times[r]);
        }
    }

    @Test
    void linearAlgebraicRuleIsSolvedForItsUnknown() {
        // 0 = twiceA - 2 A with A' = -0.4 A, A(0) = 3 => twiceA = 6 exp(-0.4 t) (derived by hand)
        double[] times = {0, 1, 4};
        Trajectory tr = run("algebraic.xml", times, List.of("twiceA"));
        for (int r = 0; r < times.length; r++) {
            assertEquals(6 * Math.exp(-0.4 * times[r]), tr.value(r, 0), 1e-8);
        }
    }

    @Test
    void submodelParameterReplacedByParentParameter() {
        // comp: parent kfast = 0.8 replaces cell's k, so cell__A = exp(-0.8 t) (derived by hand)
        double[] times = {0, 1, 2};
        Trajectory tr = run("comp.xml", times, List.of("cell__A"));
        for (int r = 0; r < times.length; r++) {
            assertEquals(Math.exp(-0.8 * times[r]), tr.value(r, 0), 1e-8);
        }
    }
}
