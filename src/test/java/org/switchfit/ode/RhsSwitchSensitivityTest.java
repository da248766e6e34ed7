package org.switchfit.ode;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import org.switchfit.ode.bdf.BdfIntegrator;
import org.switchfit.sbml.SbmlReader;
import org.switchfit.testsystems.DecaySbml;

/**
 * Piecewise switches in the right-hand side ({@link CompiledModel#rhsSwitchCount}): the integration stops at them
 * and the forward sensitivities take the jump of a parameter-dependent switching time
 * ({@link Simulator#simulateSensitivities}); checked against closed forms derived by hand and against central
 * differences of plain simulations.
 *
 * <p>Tolerance of the closed-form checks, {@link #REL_CLOSED}: integration at rtol 1e-10, atol 1e-14; the global
 * error of states and sensitivities may exceed the local tolerance by one to two orders of magnitude (common
 * practice), the switching time is located to about 1e-12 relative and the jump is algebraically exact, so 1e-6
 * relative leaves a margin of 100 or more.
 */
class RhsSwitchSensitivityTest {
    /** Relative tolerance against closed forms (see class comment). */
    static final double REL_CLOSED = 1e-6;
    /**
     * Relative tolerance (to the column's largest entry) against central differences with step
     * h = 1e-4 max(1, |p|): differencing noise about rtol / h = 1e-6, truncation about h² = 1e-8; 2e-5 leaves a
     * margin of 20 on the noise.
     */
    static final double REL_FD = 2e-5;

    private static final String TIME = "<csymbol encoding=\"text\" "
            + "definitionURL=\"http://www.sbml.org/sbml/symbols/time\">time</csymbol>";
    private static final String MATH = "<math xmlns=\"http://www.w3.org/1998/Math/MathML\">";

    @TempDir
    Path dir;

    /**
     * The decay model X' = -k X, X(0) = x0 (k = 0.3, x0 = 2) with extra parameters, the rate law multiplied by
     * {@code factor}, and optional rules.
     */
    private CompiledModel model(String params, String factor, String rules) throws IOException {
        String xml = DecaySbml.MODEL
                .replace("<parameter id=\"x0\" value=\"2\" constant=\"true\"/>",
                        "<parameter id=\"x0\" value=\"2\" constant=\"true\"/>" + params)
                .replace("<apply><times/><ci>k</ci><ci>X</ci></apply>",
                        "<apply><times/><ci>k</ci><ci>X</ci>" + factor + "</apply>")
                .replace("<listOfReactions>", rules + "<listOfReactions>");
        Path f = dir.resolve("m" + System.nanoTime() + ".xml");
        Files.writeString(f, xml);
        return ModelCompiler.compile(SbmlReader.read(f));
    }

    /** Beer-style delayed onset: assignment rule on = piecewise(0, time - tau &lt; 0, 1), rate k X on. */
    private CompiledModel delayedOnset() throws IOException {
        return model("<parameter id=\"tau\" value=\"2\" constant=\"true\"/>"
                        + "<parameter id=\"on\" value=\"0\" constant=\"false\"/>", "<ci>on</ci>",
                "<listOfRules><assignmentRule variable=\"on\">" + MATH + "<piecewise><piece><cn>0</cn><apply><lt/>"
                        + "<apply><minus/>" + TIME + "<ci>tau</ci></apply><cn>0</cn></apply></piece>"
                        + "<otherwise><cn>1</cn></otherwise></piecewise></math></assignmentRule></listOfRules>");
    }

    /** Decay that stops at a threshold: rate k X piecewise(1, X &gt; cth, 0). */
    private CompiledModel decayToThreshold() throws IOException {
        return model("<parameter id=\"cth\" value=\"0.5\" constant=\"true\"/>",
                "<piecewise><piece><cn>1</cn><apply><gt/><ci>X</ci><ci>cth</ci></apply></piece>"
                        + "<otherwise><cn>0</cn></otherwise></piecewise>", "");
    }

    private static SolverSettings tight() {
        return SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    }

    private static Integrator integrator(String method) {
        return method.equals("bdf") ? BdfIntegrator.of(tight()) : new DormandPrinceIntegrator(tight());
    }

    /**
     * Sensitivities {@code s[(r * nc + c) * n + i]} at the times to the named declared parameters; the parameter
     * named {@code initial} is X's initial value (through the initial assignment, derivative 1).
     */
    private static double[] sensitivities(CompiledModel cm, List<String> theta, String initial, double[] times,
                                          Integrator integrator, double[] yOut) {
        int n = cm.stateCount();
        int m = cm.parameterCount();
        int nc = theta.size();
        double[] y0 = new double[n];
        double[] p = new double[m];
        cm.initialValues(0.0, cm.parameterValues(), y0, p);
        int[] sp = new int[nc];
        double[] s0 = new double[nc * n];
        double[] dP = new double[m * nc];
        for (int c = 0; c < nc; c++) {
            sp[c] = cm.parameterIndex(theta.get(c));
            dP[sp[c] * nc + c] = 1.0;
            if (theta.get(c).equals(initial)) {
                s0[c * n + cm.form().stateIds().indexOf("X")] = 1.0;
            }
        }
        double[] s = new double[times.length * nc * n];
        new Simulator(cm, integrator).simulateSensitivities(times, cm, 0.0, y0, p, sp, s0, dP, yOut, s);
        return s;
    }

    /** Central differences of X at the times with respect to declared parameter {@code id} (plain simulations). */
    private static double[] centralDifference(CompiledModel cm, String id, double[] times) {
        ModelOutputs out = ModelOutputs.of(cm, List.of("X"));
        Simulator sim = new Simulator(cm, BdfIntegrator.of(tight()));
        double[] pDecl = cm.parameterValues();
        int k = cm.parameterIndex(id);
        double h = 1e-4 * Math.max(1.0, Math.abs(pDecl[k]));
        double[] pp = pDecl.clone();
        pp[k] += h;
        Trajectory up = sim.simulate(times, pp, out);
        pp[k] = pDecl[k] - h;
        Trajectory down = sim.simulate(times, pp, out);
        double[] d = new double[times.length];
        for (int r = 0; r < times.length; r++) {
            d[r] = (up.value(r, 0) - down.value(r, 0)) / (2 * h);
        }
        return d;
    }

    private static void assertMatchesCentralDifferences(CompiledModel cm, List<String> theta, double[] s,
                                                        double[] times) {
        int nc = theta.size();
        for (int c = 0; c < nc; c++) {
            double[] fd = centralDifference(cm, theta.get(c), times);
            double scale = 1e-3;
            for (double v : fd) {
                scale = Math.max(scale, Math.abs(v));
            }
            for (int r = 0; r < times.length; r++) {
                assertEquals(fd[r], s[r * nc + c], REL_FD * scale, "dX/d" + theta.get(c) + " at t = " + times[r]);
            }
        }
    }

    @Test
    void onlyConditionsOnTimeOrStatesBecomeSwitches() throws IOException {
        // a condition on parameters only cannot change during a simulation: no root is needed
        CompiledModel constant = model("", "<piecewise><piece><cn>1</cn><apply><gt/><ci>k</ci><cn>0.5</cn>"
                + "</apply></piece><otherwise><cn>2</cn></otherwise></piecewise>", "");
        assertEquals(0, constant.rhsSwitchCount());
        assertEquals(1, delayedOnset().rhsSwitchCount());
        assertEquals(1, decayToThreshold().rhsSwitchCount());
    }

    @ParameterizedTest
    @ValueSource(strings = {"bdf", "dormand-prince"})
    void delayedOnsetThroughAssignmentRule(String method) throws IOException {
        // Closed form, derived by hand: X' = -k X [t >= tau], X(0) = x0. For t < tau: X = x0, dX/dx0 = 1, the
        // other derivatives 0. For t > tau: X = x0 e^{-k(t - tau)}, dX/dk = -(t - tau) X, dX/dx0 = X / x0,
        // dX/dtau = k X (the onset moves with tau: the jump (f⁻ - f⁺) dtau/dtau = k X(tau) = k x0 at the switch).
        CompiledModel cm = delayedOnset();
        List<String> theta = List.of("k", "x0", "tau");
        double[] times = {1.0, 2.5, 4.0, 7.0};
        double[] y = new double[times.length];
        double[] s = sensitivities(cm, theta, "x0", times, integrator(method), y);
        double k = 0.3;
        double x0 = 2;
        double tau = 2;
        for (int r = 0; r < times.length; r++) {
            double t = times[r];
            double x = t < tau ? x0 : x0 * Math.exp(-k * (t - tau));
            double[] ds = t < tau ? new double[] {0, 1, 0} : new double[] {-(t - tau) * x, x / x0, k * x};
            assertEquals(x, y[r], REL_CLOSED * x, "X at " + t);
            for (int c = 0; c < 3; c++) {
                assertEquals(ds[c], s[r * 3 + c], REL_CLOSED * Math.max(Math.abs(ds[c]), x),
                        "dX/d" + theta.get(c) + " at " + t);
            }
        }
        assertMatchesCentralDifferences(cm, theta, s, times);
    }

    @ParameterizedTest
    @ValueSource(strings = {"bdf", "dormand-prince"})
    void decayStopsAtStateThreshold(String method) throws IOException {
        // Closed form, derived by hand: X' = -k X while X > c, else 0; X(0) = x0 > c. The switch comes at
        // t* = ln(x0 / c) / k. Before: X = x0 e^{-kt}, dX/dk = -t X, dX/dx0 = e^{-kt}, dX/dc = 0. After: X = c,
        // so dX/dk = 0, dX/dx0 = 0, dX/dc = 1 (the jump (f⁻ - f⁺) dt*/dθ = -k c dt*/dθ cancels the flow part).
        CompiledModel cm = decayToThreshold();
        List<String> theta = List.of("k", "x0", "cth");
        double k = 0.3;
        double x0 = 2;
        double c = 0.5;
        double tStar = Math.log(x0 / c) / k;
        double[] times = {2.0, 4.0, tStar + 0.5, 9.0};
        double[] y = new double[times.length];
        double[] s = sensitivities(cm, theta, "x0", times, integrator(method), y);
        for (int r = 0; r < times.length; r++) {
            double t = times[r];
            double x = t < tStar ? x0 * Math.exp(-k * t) : c;
            double[] ds = t < tStar ? new double[] {-t * x, Math.exp(-k * t), 0} : new double[] {0, 0, 1};
            assertEquals(x, y[r], REL_CLOSED * x, "X at " + t);
            for (int col = 0; col < 3; col++) {
                assertEquals(ds[col], s[r * 3 + col], REL_CLOSED * Math.max(Math.abs(ds[col]), x),
                        "dX/d" + theta.get(col) + " at " + t);
            }
        }
        assertMatchesCentralDifferences(cm, theta, s, times);
    }

    @Test
    void slidingModeEndsLikeAnIntegrationWithoutTheSwitch() throws IOException {
        // x' = -1 while x > 0, else +1; x(0) = 1: x = 1 - t until t = 1 (derived by hand), then a sliding mode
        // (the flow points into x = 0 from both sides), which the switch roots must not turn into an endless
        // sequence of stops. BDF at rtol 1e-6 exhausts its step budget in the chattering, as it did before switch
        // roots existed (measured with the simulate command on the parent commit: the same error at t = 1.00043).
        String xml = """
                <?xml version="1.0" encoding="UTF-8"?>
                <sbml xmlns="http://www.sbml.org/sbml/level3/version2/core" level="3" version="2">
                  <model id="slide">
                    <listOfParameters><parameter id="x" value="1" constant="false"/></listOfParameters>
                    <listOfRules><rateRule variable="x"><math xmlns="http://www.w3.org/1998/Math/MathML">
                      <piecewise><piece><cn>-1</cn><apply><gt/><ci>x</ci><cn>0</cn></apply></piece>
                      <otherwise><cn>1</cn></otherwise></piecewise></math></rateRule></listOfRules>
                  </model>
                </sbml>
                """;
        Path f = dir.resolve("slide.xml");
        Files.writeString(f, xml);
        CompiledModel cm = ModelCompiler.compile(SbmlReader.read(f));
        assertEquals(1, cm.rhsSwitchCount());
        Simulator sim = new Simulator(cm, BdfIntegrator.of(SolverSettings.defaults().withTolerances(1e-6, 1e-8)));
        ModelOutputs out = ModelOutputs.of(cm, List.of("x"));
        // before the sliding mode: x = 1 - t; 1e-8 absolute is 100 rtol on values of order 1 (common practice)
        assertEquals(0.5, sim.simulate(new double[] {0.5}, cm.parameterValues(), out).value(0, 0), 1e-8);
        IntegrationException e = assertThrows(IntegrationException.class,
                () -> sim.simulate(new double[] {0.5, 2.0}, cm.parameterValues(), out));
        assertTrue(e.getMessage().contains("steps in one advance call"), e.getMessage());
    }

    @Test
    void plainSimulationStopsAtTheSwitch() throws IOException {
        // Closed form as in delayedOnsetThroughAssignmentRule: X(t) = x0 e^{-k(t - tau)} for t > tau.
        CompiledModel cm = delayedOnset();
        double[] times = {1.0, 2.0000001, 2.5, 7.0};
        Trajectory tr = new Simulator(cm, BdfIntegrator.of(tight())).simulate(times, cm.parameterValues(),
                ModelOutputs.of(cm, List.of("X")));
        for (int r = 0; r < times.length; r++) {
            double x = times[r] < 2 ? 2 : 2 * Math.exp(-0.3 * (times[r] - 2));
            assertEquals(x, tr.value(r, 0), REL_CLOSED * x, "X at " + times[r]);
        }
    }

    /**
     * An output exactly at the switching time of {@code time - t_on < 0}, where the switching function is 0 and
     * counts as the old side while the condition is already false, for x' = a [t &gt;= t_on] - k x, x(0) = 1.
     * Two failures to step-size underflow are covered: the stop before the switch fell on the switching time
     * itself, so the last implicit step evaluated f on the new branch (t_on = 10, 7); the step after the restart
     * started below the resolution of t when x was within atol of 0 and f large (t_on = 1 and 30). Closed form,
     * derived by hand: x = e^{-kt} up to t_on, x = e^{-kt} + (a/k)(1 - e^{-k(t - t_on)}) after.
     *
     * @param spec "t_on a k"
     */
    @ParameterizedTest
    @ValueSource(strings = {"10 1e6 1", "7 1e9 1e3", "1 1e3 1e3", "30 1e3 1"})
    void outputExactlyAtTheSwitchingTime(String spec) throws IOException {
        String[] v = spec.split(" ");
        double tOn = Double.parseDouble(v[0]);
        double a = Double.parseDouble(v[1]);
        double k = Double.parseDouble(v[2]);
        String xml = """
                <?xml version="1.0" encoding="UTF-8"?>
                <sbml xmlns="http://www.sbml.org/sbml/level3/version2/core" level="3" version="2">
                  <model id="step">
                    <listOfParameters>
                      <parameter id="a" value="%s" constant="true"/>
                      <parameter id="k" value="%s" constant="true"/>
                      <parameter id="t_on" value="%s" constant="true"/>
                      <parameter id="x" value="1" constant="false"/>
                    </listOfParameters>
                    <listOfRules><rateRule variable="x">%s<apply><minus/><apply><times/><ci>a</ci>
                      <piecewise><piece><cn>0</cn><apply><lt/><apply><minus/>%s<ci>t_on</ci></apply><cn>0</cn>
                      </apply></piece><otherwise><cn>1</cn></otherwise></piecewise></apply>
                      <apply><times/><ci>k</ci><ci>x</ci></apply></apply></math></rateRule></listOfRules>
                  </model>
                </sbml>
                """.formatted(v[1], v[2], v[0], MATH, TIME);
        Path f = dir.resolve("step.xml");
        Files.writeString(f, xml);
        CompiledModel cm = ModelCompiler.compile(SbmlReader.read(f));
        assertEquals(1, cm.rhsSwitchCount());
        double[] times = {tOn, 10 * tOn + 5};
        // rtol 1e-8, atol 1e-12 as in the benchmark check that found the first failure (Isensee_JCB2018)
        Trajectory tr = new Simulator(cm, BdfIntegrator.of(SolverSettings.defaults().withTolerances(1e-8, 1e-12)))
                .simulate(times, cm.parameterValues(), ModelOutputs.of(cm, List.of("x")));
        // Tolerance: 1e-6 relative, 100 times rtol (common practice for the global error), or 1e-9 absolute,
        // 1000 times atol, for values near 0 (e^{-1000}); the stop lies 1e-12 relative before the switch and
        // the state moves by |f| = k x times that, far below both.
        for (int r = 0; r < times.length; r++) {
            double t = times[r];
            double x = Math.exp(-k * t) + (t > tOn ? a / k * (1 - Math.exp(-k * (t - tOn))) : 0.0);
            assertEquals(x, tr.value(r, 0), Math.max(1e-6 * x, 1e-9), "x at " + t);
        }
    }
}
