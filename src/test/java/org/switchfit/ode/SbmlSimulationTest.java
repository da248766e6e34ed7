package org.switchfit.ode;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.net.URISyntaxException;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.switchfit.model.Model;
import org.switchfit.sbml.SbmlReader;

/** SBML models with closed-form solutions, read, compiled and integrated end to end. */
class SbmlSimulationTest {
    /** Solver runs at rtol 1e-10; global error stays within ~100x the local tolerance (common practice). */
    private static final double REL_TOL = 1e-8;

    static Path resource(String name) {
        try {
            return Path.of(SbmlSimulationTest.class.getResource("/sbml/" + name).toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    private static Trajectory run(String file, double[] times, List<String> outputs) {
        Model m = SbmlReader.read(resource(file));
        CompiledModel cm = ModelCompiler.compile(m);
        SolverSettings s = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
        return new Simulator(cm, new DormandPrinceIntegrator(s)).simulate(times, cm.parameterValues(),
                ModelOutputs.of(cm, outputs));
    }

    @Test
    void firstOrderDecay() {
        // Closed form: rate = k*[A]*V (amount/time), d(amount)/dt = -k*amount => [A](t) = 5*exp(-0.3 t);
        // amount = [A] * V with V = 2.
        double[] times = {0, 0.5, 1, 2, 5, 10};
        Trajectory tr = run("decay.xml", times, List.of("A", "amount(A)", "deg"));
        for (int r = 0; r < times.length; r++) {
            double c = 5 * Math.exp(-0.3 * times[r]);
            assertEquals(c, tr.value(r, 0), REL_TOL * 5, "concentration at t=" + times[r]);
            assertEquals(2 * c, tr.value(r, 1), REL_TOL * 10, "amount at t=" + times[r]);
            assertEquals(0.3 * c * 2, tr.value(r, 2), REL_TOL * 3, "reaction rate at t=" + times[r]);
        }
    }

    @Test
    void reversibleConversionWithLocalParameters() {
        // Closed form for A <-> B, kf = 2, kr = 0.5, A0 = 1, B0 = 0: A(t) = (kr + kf*exp(-(kf+kr)t))/(kf+kr).
        double[] times = {0, 0.1, 0.4, 1, 3};
        Trajectory tr = run("reversible.xml", times, List.of("A", "B"));
        for (int r = 0; r < times.length; r++) {
            double a = (0.5 + 2 * Math.exp(-2.5 * times[r])) / 2.5;
            assertEquals(a, tr.value(r, 0), REL_TOL, "A at t=" + times[r]);
            assertEquals(1 - a, tr.value(r, 1), REL_TOL, "B at t=" + times[r]);
        }
        // local parameters are renamed reactionId.paramId and appear in p
        CompiledModel cm = ModelCompiler.compile(SbmlReader.read(resource("reversible.xml")));
        assertTrue(cm.parameterIndex("r.kf") >= 0, "parameters: " + cm.parameterIds());
        assertEquals(2.0, cm.parameterValues()[cm.parameterIndex("r.kf")], 0.0);
    }

    @Test
    void growingCompartmentKeepsAmountAndDilutesConcentration() {
        // V' = g V, V(0) = 1 => V = exp(0.2 t). No reaction changes S, so its amount stays 4 * V(0) = 4 and its
        // concentration is 4 / V(t) (SBML L3V2 section 4.13.6: reactions and rules change amounts).
        double[] times = {0, 1, 2.5, 5};
        Trajectory tr = run("growing.xml", times, List.of("V", "S", "amount(S)"));
        for (int r = 0; r < times.length; r++) {
            double v = Math.exp(0.2 * times[r]);
            assertEquals(v, tr.value(r, 0), REL_TOL * v);
            assertEquals(4 / v, tr.value(r, 1), REL_TOL * 4);
            assertEquals(4.0, tr.value(r, 2), REL_TOL * 4);
        }
    }

    @Test
    void eventResetsWhenThresholdIsCrossed() {
        // X' = 1 from 0; the event X >= 2 resets X to 0.5 at t = 2, 3.5, 5, ... (period 1.5), derived by hand.
        double[] times = {0, 1, 1.9, 2.1, 3.4, 3.6, 6};
        Trajectory tr = run("event.xml", times, List.of("X"));
        double[] expected = {0, 1, 1.9, 0.6, 1.9, 0.6, 1.5};
        for (int r = 0; r < times.length; r++) {
            // event time located to ~1e-12 (session contract); the solution error is at solver tolerance
            assertEquals(expected[r], tr.value(r, 0), 1e-8, "X at t=" + times[r]);
        }
    }

    @Test
    void jacobiansMatchFiniteDifferences() {
        CompiledModel cm = ModelCompiler.compile(SbmlReader.read(resource("reversible.xml")));
        int n = cm.stateCount();
        int m = cm.parameterCount();
        double[] y = {0.7, 0.4};
        double[] p = cm.parameterValues();
        double[] jy = new double[n * n];
        double[] jp = new double[n * m];
        cm.jacobianY(0, y, p, jy);
        cm.jacobianP(0, y, p, jp);
        double h = 1e-6;
        double[] fp = new double[n];
        double[] fm = new double[n];
        for (int j = 0; j < n; j++) {
            double[] yp = y.clone();
            double[] ym = y.clone();
            yp[j] += h;
            ym[j] -= h;
            cm.rhs(0, yp, p, fp);
            cm.rhs(0, ym, p, fm);
            for (int i = 0; i < n; i++) {
                // linear right-hand side: central differences exact up to rounding ~1e-10
                assertEquals((fp[i] - fm[i]) / (2 * h), jy[i * n + j], 1e-8);
            }
        }
        for (int k = 0; k < m; k++) {
            double[] pp = p.clone();
            double[] pm = p.clone();
            pp[k] += h;
            pm[k] -= h;
            cm.rhs(0, y, pp, fp);
            cm.rhs(0, y, pm, fm);
            for (int i = 0; i < n; i++) {
                assertEquals((fp[i] - fm[i]) / (2 * h), jp[i * m + k], 1e-8);
            }
        }
    }

    @Test
    void forwardSensitivitiesMatchClosedForm() {
        // decay: amount a(t) = a0 exp(-k t) with a0 = 10 => da/dk = -t a0 exp(-k t) (derived by hand)
        CompiledModel cm = ModelCompiler.compile(SbmlReader.read(resource("decay.xml")));
        int k = cm.parameterIndex("k");
        double[] p = cm.parameterValues();
        double[] y0 = new double[1];
        double[] pe = new double[p.length];
        cm.initialValues(0, p, y0, pe);
        IntegrationSession s = new DormandPrinceIntegrator(SolverSettings.defaults().withTolerances(1e-10, 1e-12))
                .start(cm, 0, y0, pe, null, new int[] {k}, new double[1]);
        double[] y = new double[1];
        double[] sens = new double[1];
        s.advance(2.0, y, sens);
        double expected = -2.0 * 10 * Math.exp(-0.6);
        assertEquals(expected, sens[0], 1e-7 * Math.abs(expected));
        assertEquals(10 * Math.exp(-0.6), y[0], 1e-8 * 10);
    }
}
