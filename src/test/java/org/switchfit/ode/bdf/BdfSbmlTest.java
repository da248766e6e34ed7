package org.switchfit.ode.bdf;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.net.URISyntaxException;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.ModelCompiler;
import org.switchfit.ode.ModelOutputs;
import org.switchfit.ode.SolverSettings;
import org.switchfit.ode.Simulator;
import org.switchfit.ode.Trajectory;
import org.switchfit.sbml.SbmlReader;

/** The BDF session driven by the project's SBML simulator (events, resets, compiled Jacobians). */
class BdfSbmlTest {

    private static Path resource(String name) {
        try {
            return Path.of(BdfSbmlTest.class.getResource("/sbml/" + name).toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    private static CompiledModel compile(String file) {
        return ModelCompiler.compile(SbmlReader.read(resource(file)));
    }

    @Test
    void eventModelResetsAtThresholds() {
        // X' = 1 from 0; the event X >= 2 resets X to 0.5 at t = 2, 3.5, 5, ... (period 1.5), derived by hand.
        CompiledModel cm = compile("event.xml");
        double[] times = {0, 1, 1.9, 2.1, 3.4, 3.6, 6};
        Trajectory tr = new Simulator(cm, new BdfIntegrator(SolverSettings.defaults().withTolerances(1e-10, 1e-14)))
                .simulate(times, cm.parameterValues(), ModelOutputs.of(cm, List.of("X")));
        double[] expected = {0, 1, 1.9, 0.6, 1.9, 0.6, 1.5};
        for (int r = 0; r < times.length; r++) {
            // Root located to ~1e-12 (session contract); X' = 1 is integrated exactly by BDF up to the Newton
            // tolerance, so 1e-8 absolute is generous.
            assertEquals(expected[r], tr.value(r, 0), 1e-8, "X at t=" + times[r]);
        }
    }

    @Test
    void decayModelWithSensitivityMatchesClosedForm() {
        // decay.xml: amount a(t) = a0 exp(-k t), a0 = 10, k = 0.3 => da/dk = -t a0 exp(-k t) (derived by hand).
        CompiledModel cm = compile("decay.xml");
        int k = cm.parameterIndex("k");
        double[] p = cm.parameterValues();
        double[] y0 = new double[1];
        double[] pe = new double[p.length];
        cm.initialValues(0, p, y0, pe);
        IntegrationSession s = new BdfIntegrator(SolverSettings.defaults().withTolerances(1e-10, 1e-12))
                .start(cm, 0, y0, pe, null, new int[] {k}, new double[1]);
        double[] y = new double[1];
        double[] sens = new double[1];
        s.advance(2.0, y, sens);
        // 100 x (rtol x max|value| + atol): max a = 10, max |da/dk| = a0 / (e k) ~ 12.3.
        assertEquals(10 * Math.exp(-0.6), y[0], 100 * (1e-10 * 10 + 1e-12));
        assertEquals(-2.0 * 10 * Math.exp(-0.6), sens[0], 100 * (1e-10 * 12.3 + 1e-12));
    }
}
