package org.switchfit.ode;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.switchfit.testsystems.DecaySbml.TIME;
import static org.switchfit.testsystems.DecaySbml.parameter;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.switchfit.ode.bdf.BdfIntegrator;
import org.switchfit.sbml.SbmlReader;
import org.switchfit.testsystems.DecaySbml;

/**
 * Forward sensitivities across events ({@link Simulator#simulateSensitivities}) against closed forms derived by
 * hand and against central differences of plain simulations, on the decay X' = -k X, X(0) = x0 of
 * {@link DecaySbml} (k = 0.3, x0 = 2) with events added.
 *
 * <p>Tolerance of the closed-form checks, {@link #REL_CLOSED}: BDF at rtol 1e-10, atol 1e-14; the global error of
 * states and sensitivities may exceed the local tolerance by one to two orders of magnitude (common practice), the
 * event time is located to about 1e-12 relative and the jump itself is algebraically exact, so 1e-6 relative
 * leaves a margin of 100 or more.
 */
class EventSensitivityTest {
    /** Relative tolerance against closed forms (see class comment). */
    static final double REL_CLOSED = 1e-6;
    /**
     * Relative tolerance against central differences with step h = 1e-4 max(1, |p|): differencing noise about
     * rtol / h = 1e-6, truncation about h² = 1e-8 relative; 2e-5 leaves a margin of 20 on the noise.
     */
    static final double REL_FD = 2e-5;

    @TempDir
    Path dir;

    /** Compiles SBML text (written to a file first, as users load models). */
    private CompiledModel model(String xml) throws IOException {
        Path f = dir.resolve("m" + System.nanoTime() + ".xml");
        Files.writeString(f, xml);
        return ModelCompiler.compile(SbmlReader.read(f));
    }

    /** States and sensitivities at output times, {@code s(r, c, i) = dy_i/dθ_c} at times[r]. */
    private static final class Run {
        final double[] y;
        final double[] s;
        final int n;
        final int nc;

        Run(double[] y, double[] s, int n, int nc) {
            this.y = y;
            this.s = s;
            this.n = n;
            this.nc = nc;
        }

        double y(int r, int i) {
            return y[r * n + i];
        }

        double s(int r, int c, int i) {
            return s[(r * nc + c) * n + i];
        }
    }

    private static SolverSettings tight() {
        return SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    }

    /**
     * States and sensitivities at the times; θ = the named declared parameters, each the initial value of the state
     * named in {@code initialOf} (derivative 1) or of none.
     */
    private static Run sensitivities(CompiledModel cm, double[] pDecl, List<String> theta,
                                     Map<String, String> initialOf, double[] times) {
        return sensitivities(cm, pDecl, theta, initialOf, times, BdfIntegrator.of(tight()));
    }

    private static Run sensitivities(CompiledModel cm, double[] pDecl, List<String> theta,
                                     Map<String, String> initialOf, double[] times, Integrator integrator) {
        int n = cm.stateCount();
        int m = cm.parameterCount();
        int nc = theta.size();
        double[] y0 = new double[n];
        double[] p = new double[m];
        cm.initialValues(0.0, pDecl, y0, p);
        int[] sp = new int[nc];
        double[] s0 = new double[nc * n];
        double[] dP = new double[m * nc];
        for (int c = 0; c < nc; c++) {
            sp[c] = cm.parameterIndex(theta.get(c));
            dP[sp[c] * nc + c] = 1.0;
            String st = initialOf.get(theta.get(c));
            if (st != null) {
                s0[c * n + cm.form().stateIds().indexOf(st)] = 1.0;
            }
        }
        double[] y = new double[times.length * n];
        double[] s = new double[times.length * nc * n];
        new Simulator(cm, integrator).simulateSensitivities(times, cm, 0.0, y0, p, sp, s0, dP, y, s);
        return new Run(y, s, n, nc);
    }

    /** Central differences of the state at the times with respect to declared parameter {@code id}. */
    private static double[] centralDifference(CompiledModel cm, double[] pDecl, String id, double[] times) {
        int n = cm.stateCount();
        ModelOutputs out = ModelOutputs.of(cm, cm.form().stateIds());
        Simulator sim = new Simulator(cm, BdfIntegrator.of(tight()));
        int k = cm.parameterIndex(id);
        double h = 1e-4 * Math.max(1.0, Math.abs(pDecl[k]));
        double[] pp = pDecl.clone();
        pp[k] += h;
        Trajectory up = sim.simulate(times, pp, out);
        pp[k] = pDecl[k] - h;
        Trajectory down = sim.simulate(times, pp, out);
        double[] d = new double[times.length * n];
        for (int r = 0; r < times.length; r++) {
            for (int i = 0; i < n; i++) {
                d[r * n + i] = (up.value(r, i) - down.value(r, i)) / (2 * h);
            }
        }
        return d;
    }

    private static void assertRel(double expected, double actual, double rel, String what) {
        assertEquals(expected, actual, rel * Math.max(1e-12, Math.abs(expected)), what);
    }

    /** Every sensitivity column against central differences (relative to the column's largest entry). */
    private static void assertMatchesCentralDifferences(CompiledModel cm, double[] pDecl, List<String> theta,
                                                        Run run, double[] times) {
        int n = cm.stateCount();
        for (int c = 0; c < theta.size(); c++) {
            double[] fd = centralDifference(cm, pDecl, theta.get(c), times);
            double scale = 0;
            for (double v : fd) {
                scale = Math.max(scale, Math.abs(v));
            }
            for (int r = 0; r < times.length; r++) {
                for (int i = 0; i < n; i++) {
                    assertEquals(fd[r * n + i], run.s(r, c, i), REL_FD * Math.max(scale, 1e-3),
                            "d" + cm.form().stateIds().get(i) + "/d" + theta.get(c) + " at t = " + times[r]);
                }
            }
        }
    }

    @Test
    void timeTriggeredBolusOnExponentialDecay() throws IOException {
        // x' = -k x, x(0) = x0; at t = t1: x += d. Derived by hand: for t > t1, x = x0 e^{-kt} + d e^{-k(t-t1)};
        // dx/dk = -t x0 e^{-kt} - (t-t1) d e^{-k(t-t1)}, dx/dx0 = e^{-kt}, dx/dd = e^{-k(t-t1)},
        // dx/dt1 = k d e^{-k(t-t1)} (the bolus time is a parameter: τ = dt1/dθ from g = t - t1).
        CompiledModel cm = model(DecaySbml.BOLUS);
        double[] pDecl = cm.parameterValues();
        List<String> theta = List.of("k", "x0", "d", "t1");
        double[] times = {1.0, 3.0, 7.5};
        Run run = sensitivities(cm, pDecl, theta, Map.of("x0", "X"), times);
        double k = 0.3;
        double x0 = 2;
        double d = 1.5;
        double t1 = 2;
        int x = cm.form().stateIds().indexOf("X");
        for (int r = 0; r < times.length; r++) {
            double t = times[r];
            double after = t > t1 ? 1 : 0;
            double e1 = Math.exp(-k * t);
            double e2 = after * Math.exp(-k * (t - t1));
            assertRel(x0 * e1 + d * e2, run.y(r, x), REL_CLOSED, "x at " + t);
            assertRel(-t * x0 * e1 - (t - t1) * d * e2, run.s(r, 0, x), REL_CLOSED, "dx/dk at " + t);
            assertRel(e1, run.s(r, 1, x), REL_CLOSED, "dx/dx0 at " + t);
            assertEquals(e2, run.s(r, 2, x), REL_CLOSED * e1, "dx/dd at " + t);
            assertEquals(k * d * e2, run.s(r, 3, x), REL_CLOSED * e1, "dx/dt1 at " + t);
        }
        assertMatchesCentralDifferences(cm, pDecl, theta, run, times);
    }

    @Test
    void bolusInAShortTriggerWindowFiresAndItsTimeHasADerivative() throws IOException {
        // The bolus of timeTriggeredBolusOnExponentialDecay with the trigger t1 <= time && time < t1 + 0.001:
        // same closed form. Asked only at t = 1 and 7.5, the integrator's steps are far longer than the window, and
        // the trigger's min(time - t1, t1 + 0.001 - time) is negative at both ends of such a step; each relation
        // is a root of its own, so the window is found and the firing time still moves with t1.
        String trigger = "<apply><and/><apply><geq/>" + DecaySbml.TIME + "<ci>t1</ci></apply><apply><lt/>"
                + DecaySbml.TIME + "<apply><plus/><ci>t1</ci><cn>0.001</cn></apply></apply></apply>";
        CompiledModel cm = model(DecaySbml.withEvents(parameter("d", 1.5, true) + parameter("t1", 2.0, true),
                DecaySbml.event("bolus", false, trigger, null, "X", "<apply><plus/><ci>X</ci><ci>d</ci></apply>")));
        double[] pDecl = cm.parameterValues();
        List<String> theta = List.of("k", "d", "t1");
        double[] times = {1.0, 7.5};
        Run run = sensitivities(cm, pDecl, theta, Map.of(), times);
        double k = 0.3;
        double d = 1.5;
        double t1 = 2;
        int x = cm.form().stateIds().indexOf("X");
        double t = 7.5;
        double e1 = Math.exp(-k * t);
        double e2 = Math.exp(-k * (t - t1));
        assertRel(2 * e1 + d * e2, run.y(1, x), REL_CLOSED, "x at 7.5");
        assertRel(-t * 2 * e1 - (t - t1) * d * e2, run.s(1, 0, x), REL_CLOSED, "dx/dk at 7.5");
        assertRel(e2, run.s(1, 1, x), REL_CLOSED, "dx/dd at 7.5");
        assertRel(k * d * e2, run.s(1, 2, x), REL_CLOSED, "dx/dt1 at 7.5");
        assertMatchesCentralDifferences(cm, pDecl, theta, run, times);
    }

    @ParameterizedTest
    @ValueSource(strings = {"bdf", "dormand-prince"})
    void stateTriggeredResetAtThreshold(String method) throws IOException {
        // x' = -k x, x(0) = x0; when x < c: x = xr. Derived by hand: first firing t1 = ln(x0/c)/k, then
        // x = xr e^{-k(t-t1)}; second firing t2 = t1 + ln(xr/c)/k, then x = xr e^{-k(t-t2)}.
        // Between t1 and t2: dx/dk = -x t (since k dt1/dk = -t1), dx/dx0 = x/x0, dx/dc = -x/c, dx/dxr = x/xr.
        // After t2: dx/dk = -x t, dx/dx0 = x/x0, dx/dc = -2x/c, dx/dxr = 2x/xr.
        double k = 0.3;
        double x0 = 2;
        double c = 0.5;
        double xr = 1;
        CompiledModel cm = model(DecaySbml.RESET);
        double[] pDecl = cm.parameterValues();
        List<String> theta = List.of("k", "x0", "cth", "xr");
        double t1 = Math.log(x0 / c) / k;
        double t2 = t1 + Math.log(xr / c) / k;
        double[] times = {3.0, 5.0, 6.5, 8.0, 9.0};
        Integrator integrator = method.equals("bdf") ? BdfIntegrator.of(tight())
                : new DormandPrinceIntegrator(tight());
        Run run = sensitivities(cm, pDecl, theta, Map.of("x0", "X"), times, integrator);
        int xi = cm.form().stateIds().indexOf("X");
        for (int r = 0; r < times.length; r++) {
            double t = times[r];
            double x;
            double[] ds;
            if (t < t1) {
                x = x0 * Math.exp(-k * t);
                ds = new double[] {-x * t, x / x0, 0, 0};
            } else if (t < t2) {
                x = xr * Math.exp(-k * (t - t1));
                ds = new double[] {-x * t, x / x0, -x / c, x / xr};
            } else {
                x = xr * Math.exp(-k * (t - t2));
                ds = new double[] {-x * t, x / x0, -2 * x / c, 2 * x / xr};
            }
            assertRel(x, run.y(r, xi), REL_CLOSED, "x at " + t);
            for (int col = 0; col < 4; col++) {
                assertEquals(ds[col], run.s(r, col, xi), REL_CLOSED * Math.max(Math.abs(ds[col]), x),
                        "dx/d" + theta.get(col) + " at " + t);
            }
        }
        assertMatchesCentralDifferences(cm, pDecl, theta, run, times);
    }

    @Test
    void strictTriggerFiresAtTheLocatedRootInPlainSimulation() throws IOException {
        // Regression (x < c located by BDF at rtol 1e-10 landed on x = c exactly, where the strict trigger is still
        // false, and the reset waited for the next output time). Closed form as in stateTriggeredResetAtThreshold:
        // t1 = ln(x0/c)/k = 4.6210, x(4.7) = xr e^{-k(4.7 - t1)}.
        double k = 0.3;
        double x0 = 2;
        double c = 0.5;
        double xr = 1;
        CompiledModel cm = model(DecaySbml.RESET);
        double[] times = {4.5, 4.7};
        Trajectory tr = new Simulator(cm, BdfIntegrator.of(tight())).simulate(times, cm.parameterValues(),
                ModelOutputs.of(cm, List.of("X")));
        double t1 = Math.log(x0 / c) / k;
        assertRel(x0 * Math.exp(-k * 4.5), tr.value(0, 0), REL_CLOSED, "x(4.5)");
        assertRel(xr * Math.exp(-k * (4.7 - t1)), tr.value(1, 0), REL_CLOSED, "x(4.7)");
    }

    @Test
    void delayedResetMovesWithTriggerTimeAndDelay() throws IOException {
        // x' = -k x, x(0) = x0; trigger x < c fires at ts = ln(x0/c)/k, executes x = xr at te = ts + delta.
        // Derived by hand, for te < t < next firing: x = xr e^{-k(t-te)}; dx/dk = -x (t - delta),
        // dx/ddelta = k x, dx/dc = -x/c, dx/dx0 = x/x0, dx/dxr = x/xr. Before te (t > ts): x = x0 e^{-kt} unchanged.
        double k = 0.3;
        double x0 = 2;
        double c = 0.5;
        double xr = 1;
        double delta = 0.7;
        CompiledModel cm = model(DecaySbml.withEvents(parameter("cth", c, true) + parameter("xr", xr, true)
                        + parameter("delta", delta, true),
                DecaySbml.event("reset", false, "<apply><lt/><ci>X</ci><ci>cth</ci></apply>", "<ci>delta</ci>", "X",
                        "<ci>xr</ci>")));
        double[] pDecl = cm.parameterValues();
        List<String> theta = List.of("k", "x0", "cth", "xr", "delta");
        double ts = Math.log(x0 / c) / k;
        double te = ts + delta;
        double[] times = {5.0, 5.5, 6.5};
        assertTrue(times[0] > ts && times[0] < te && times[1] > te && times[2] < te + Math.log(xr / c) / k);
        Run run = sensitivities(cm, pDecl, theta, Map.of("x0", "X"), times);
        int xi = cm.form().stateIds().indexOf("X");
        double xb = x0 * Math.exp(-k * times[0]);
        double[] before = {-xb * times[0], xb / x0, 0, 0, 0};
        for (int col = 0; col < 5; col++) {
            assertEquals(before[col], run.s(0, col, xi), REL_CLOSED * xb, "before execution, d/d" + theta.get(col));
        }
        for (int r = 1; r < times.length; r++) {
            double t = times[r];
            double x = xr * Math.exp(-k * (t - te));
            double[] ds = {-x * (t - delta), x / x0, -x / c, x / xr, k * x};
            assertRel(x, run.y(r, xi), REL_CLOSED, "x at " + t);
            for (int col = 0; col < 5; col++) {
                assertRel(ds[col], run.s(r, col, xi), REL_CLOSED, "dx/d" + theta.get(col) + " at " + t);
            }
        }
        assertMatchesCentralDifferences(cm, pDecl, theta, run, times);
    }

    @Test
    void eventAssignedRateConstantBecomesStateLike() throws IOException {
        // k is assigned by an event (so it is a state with k' = 0): x' = -k x, k(0) = k1, at t = t1: k = k2.
        // Derived by hand, t > t1: x = x0 exp(-k1 t1 - k2 (t - t1)); dx/dk1 = -t1 x, dx/dk2 = -(t - t1) x,
        // dx/dt1 = (k2 - k1) x; the state k has dk/dk2 = 1 after t1 and dk/dk1 = 1 before.
        double k1 = 0.3;
        double k2 = 0.8;
        double t1 = 1.5;
        double x0 = 2;
        CompiledModel cm = model(DecaySbml.withEvents(parameter("k2", k2, true) + parameter("t1", t1, true),
                DecaySbml.event("switch", false, "<apply><geq/>" + TIME + "<ci>t1</ci></apply>", null, "k",
                        "<ci>k2</ci>"), false));
        double[] pDecl = cm.parameterValues();
        List<String> theta = List.of("k", "k2", "t1");
        double[] times = {1.0, 2.0, 4.0};
        Run run = sensitivities(cm, pDecl, theta, Map.of("k", "k"), times);
        int xi = cm.form().stateIds().indexOf("X");
        int ki = cm.form().stateIds().indexOf("k");
        assertTrue(ki >= 0, "k is a state of the ODE form");
        for (int r = 0; r < times.length; r++) {
            double t = times[r];
            boolean after = t > t1;
            double x = after ? x0 * Math.exp(-k1 * t1 - k2 * (t - t1)) : x0 * Math.exp(-k1 * t);
            double[] ds = after ? new double[] {-t1 * x, -(t - t1) * x, (k2 - k1) * x} : new double[] {-t * x, 0, 0};
            assertRel(x, run.y(r, xi), REL_CLOSED, "x at " + t);
            for (int col = 0; col < 3; col++) {
                assertEquals(ds[col], run.s(r, col, xi), REL_CLOSED * x, "dx/d" + theta.get(col) + " at " + t);
            }
            assertEquals(after ? 0.0 : 1.0, run.s(r, 0, ki), 1e-12, "dk/dk1");
            assertEquals(after ? 1.0 : 0.0, run.s(r, 1, ki), 1e-12, "dk/dk2");
        }
        assertMatchesCentralDifferences(cm, pDecl, theta, run, times);
    }

    @Test
    void simultaneousAndCascadedEvents() throws IOException {
        // Three events at one instant t1: "bolus" (time >= t1: x += d), "copy" (time >= t1, values from the
        // trigger time: y = x, the pre-bolus value) and "cascade" (x > thr, made true by the bolus: z = x, the
        // post-bolus value). Derived by hand: y = x0 e^{-k t1}, z = x0 e^{-k t1} + d for t > t1, so
        // dy/dk = -t1 y, dy/dt1 = -k y, dy/dd = 0, dy/dx0 = e^{-k t1}; dz/dk = -t1 y, dz/dt1 = -k y, dz/dd = 1,
        // dz/dx0 = e^{-k t1}.
        double k = 0.3;
        double x0 = 2;
        double d = 1.5;
        double t1 = 2;
        CompiledModel cm = model(DecaySbml.withEvents(parameter("d", d, true) + parameter("t1", t1, true)
                        + parameter("thr", 2.5, true) + parameter("Y", 0, false) + parameter("Z", 0, false),
                DecaySbml.event("bolus", false, "<apply><geq/>" + TIME + "<ci>t1</ci></apply>", null, "X",
                        "<apply><plus/><ci>X</ci><ci>d</ci></apply>")
                + DecaySbml.event("copy", true, "<apply><geq/>" + TIME + "<ci>t1</ci></apply>", null, "Y",
                        "<ci>X</ci>")
                + DecaySbml.event("cascade", false, "<apply><gt/><ci>X</ci><ci>thr</ci></apply>", null, "Z",
                        "<ci>X</ci>")));
        double[] pDecl = cm.parameterValues();
        List<String> theta = List.of("k", "x0", "d", "t1");
        double[] times = {1.0, 3.0};
        Run run = sensitivities(cm, pDecl, theta, Map.of("x0", "X"), times);
        int yi = cm.form().stateIds().indexOf("Y");
        int zi = cm.form().stateIds().indexOf("Z");
        double y = x0 * Math.exp(-k * t1);
        assertRel(y, run.y(1, yi), REL_CLOSED, "y");
        assertRel(y + d, run.y(1, zi), REL_CLOSED, "z");
        double[] dy = {-t1 * y, Math.exp(-k * t1), 0, -k * y};
        double[] dz = {-t1 * y, Math.exp(-k * t1), 1, -k * y};
        for (int col = 0; col < 4; col++) {
            assertEquals(dy[col], run.s(1, col, yi), REL_CLOSED * y, "dy/d" + theta.get(col));
            assertEquals(dz[col], run.s(1, col, zi), REL_CLOSED * y, "dz/d" + theta.get(col));
            assertEquals(0.0, run.s(0, col, yi), 0.0, "dy/d" + theta.get(col) + " before the events");
        }
        assertMatchesCentralDifferences(cm, pDecl, theta, run, times);
    }

    @Test
    void modelWithDelayFunctionIsRefused() {
        CompiledModel cm = ModelCompiler.compile(SbmlReader.read(SbmlSimulationTest.resource("delay.xml")));
        int n = cm.stateCount();
        Simulator sim = new Simulator(cm, BdfIntegrator.of(tight()));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> sim.simulateSensitivities(
                new double[] {1}, cm, 0, new double[n], cm.parameterValues(), new int[0], new double[0],
                new double[0], new double[n], new double[0]));
        assertTrue(e.getMessage().contains("delay()"), e.getMessage());
    }
}
