package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.objective.LikelihoodObjective;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.OnsetSbml;
import org.switchfit.testsystems.PetabFiles;

/**
 * Fitted trajectory of a model whose input switches on at an estimated time, after pre-equilibration ({@link
 * OnsetSbml}): {@code x' = b + u H(t - t_on) - k x}, pre-equilibrated at u = 0 to x_ss = b/k, then u = uOn from
 * time 0. Closed form, derived by hand (linear first-order equation with a step input): x(t) = x_ss for t &lt;= t_on,
 * {@code x(t) = x_ss + (u/k)(1 - exp(-k (t - t_on)))} for t &gt; t_on. The switching time t_on = 3.33 lies between
 * two grid points (grid step 0.05). A second model puts a short pulse inside one grid interval, which only a
 * simulation that stops at each switch (as the likelihood's does) can follow.
 */
class FittedTrajectoriesOnsetTest {
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    private static final double K = 0.5;
    private static final double B = 1.0;
    private static final double U = 2.0;
    private static final double T_ON = 3.33;
    private static final double[] T = {1.0, 4.0, 6.0, 10.0};

    @TempDir
    Path dir;

    private EstimationProblem problem() {
        double[] m = new double[T.length];
        for (int i = 0; i < T.length; i++) {
            m[i] = closedForm(T[i]);
        }
        return ProblemLoader.load(OnsetSbml.writeProblem(dir, K, B, U, T_ON, 0.1, T, m));
    }

    /** Closed form of the class comment at the nominal values. */
    private static double closedForm(double t) {
        return t <= T_ON ? B / K : B / K + U / K * (1 - Math.exp(-K * (t - T_ON)));
    }

    /**
     * Relative tolerance against the closed form. The pre-equilibration stops at |f| &lt;= 1e-12 + 1e-8 |x|
     * (SteadyState.defaults), i.e. |x - b/k| &lt;= 1e-8 |x| / k = 2e-8 relative at k = 0.5; the BDF global error at
     * rtol 1e-10 is about 1e-9 to 1e-8 (one to two orders above the local tolerance, common practice) and the
     * switching time is located to about 1e-12 relative. 1e-6 leaves a margin of 50 over the largest of these.
     */
    private static final double REL = 1e-6;

    @Test
    void curveThroughTheSwitchFollowsTheClosedForm() {
        EstimationProblem p = problem();
        double[] theta = p.nominalTheta();
        TrajectoriesFile tf = FittedTrajectories.compute(p, theta, TIGHT, FittedTrajectories.DEFAULT_GRID);
        TrajectoriesFile.Observable o = tf.experiments().get(0).observables().get(0);
        double[] t = o.time();
        assertEquals(FittedTrajectories.DEFAULT_GRID, t.length, "measurement times 1, 4, 6, 10 lie on the grid");
        assertEquals(10.0, t[t.length - 1], 0.0);
        double worst = 0;
        int after = 0;
        for (int i = 0; i < t.length; i++) {
            double exact = closedForm(t[i]);
            worst = Math.max(worst, Math.abs(o.fitted()[i] - exact) / exact);
            after += t[i] > T_ON ? 1 : 0;
        }
        assertTrue(after > 100, "most of the grid lies after the switch");
        // measured: 4.5e-10
        assertTrue(worst < REL, "largest relative error on the grid " + worst);
        assertArrayEquals(T, o.dataTime(), 0.0);
    }

    @Test
    void statesAndEffectiveParametersFromTheLikelihood() {
        EstimationProblem p = problem();
        LikelihoodObjective obj = LikelihoodObjective.of(p, TIGHT);
        double[] theta = p.nominalTheta();
        double[] times = {0.0, 2.0, T_ON, 3.5, 7.0, Double.POSITIVE_INFINITY};
        LikelihoodObjective.ExperimentStates s = obj.experimentStates(0, theta, times);
        assertEquals(times.length, s.states().length);
        for (int i = 0; i < times.length - 1; i++) {
            double exact = closedForm(times[i]);
            assertEquals(exact, s.states()[i][0], REL * exact, "x at t = " + times[i]);
        }
        // steady state of the simulation condition: x = (b + u)/k (set x' = 0 with the input on)
        assertEquals((B + U) / K, s.states()[times.length - 1][0], REL * (B + U) / K, "x at t = inf");
        // p_eff of the simulation condition: the declared values with u = uOn (no initial assignments here)
        String[] ids = {"k", "b", "u", "t_on"};
        double[] expected = {K, B, U, T_ON};
        for (int i = 0; i < ids.length; i++) {
            int idx = p.compiled().form().parameterIds().indexOf(ids[i]);
            // only the rounding of 10^log10(k) separates them (about 1e-16 relative); 1e-12 is a wide margin
            assertEquals(expected[i], s.effectiveParameters()[idx], 1e-12 * expected[i], ids[i]);
        }
        // the same call through the objective gives the same curve as the convenience form
        TrajectoriesFile a = FittedTrajectories.compute(obj, theta, 11);
        TrajectoriesFile b = FittedTrajectories.compute(p, theta, TIGHT, 11);
        assertEquals(Json.toJson(a), Json.toJson(b));
    }

    /**
     * A short pulse: {@code x' = b + u·[t_on <= t < t_off] - k x}, pre-equilibrated at u = 0 (x_ss = b/k), pulse
     * u = 50 from t_on = 3.31 to t_off = 3.33, inside one grid interval [3.30, 3.35]. Closed form, derived by hand:
     * x = x_ss before t_on, {@code x_ss + (u/k)(1 - e^{-k (t - t_on)})} during the pulse and
     * {@code x_ss + (u/k)(1 - e^{-k (t_off - t_on)}) e^{-k (t - t_off)}} after it; the pulse adds about u·0.02 = 1
     * to x_ss = 2. An integrator that steps over both switches without stopping can miss the pulse entirely.
     */
    static final String PULSE = """
            <?xml version="1.0" encoding="UTF-8"?>
            <sbml xmlns="http://www.sbml.org/sbml/level3/version2/core" level="3" version="2">
              <model id="pulse">
                <listOfParameters>
                  <parameter id="k" value="0.5" constant="true"/>
                  <parameter id="b" value="1" constant="true"/>
                  <parameter id="u" value="0" constant="true"/>
                  <parameter id="t_on" value="3.31" constant="true"/>
                  <parameter id="t_off" value="3.33" constant="true"/>
                  <parameter id="x" value="0" constant="false"/>
                </listOfParameters>
                <listOfRules>
                  <rateRule variable="x"><math xmlns="http://www.w3.org/1998/Math/MathML">
                    <apply><minus/><apply><plus/><ci>b</ci>
                    <piecewise><piece><cn>0</cn><apply><lt/>%1$s<ci>t_on</ci></apply></piece>
                    <piece><ci>u</ci><apply><lt/>%1$s<ci>t_off</ci></apply></piece>
                    <otherwise><cn>0</cn></otherwise></piecewise></apply>
                    <apply><times/><ci>k</ci><ci>x</ci></apply></apply></math></rateRule>
                </listOfRules>
              </model>
            </sbml>
            """.formatted(DecaySbml.TIME);

    private static double pulse(double t) {
        double u = 50.0;
        double on = 3.31;
        double off = 3.33;
        if (t <= on) {
            return B / K;
        }
        if (t <= off) {
            return B / K + u / K * (1 - Math.exp(-K * (t - on)));
        }
        return B / K + u / K * (1 - Math.exp(-K * (off - on))) * Math.exp(-K * (t - off));
    }

    @Test
    void shortPulseInsideOneGridIntervalIsNotMissed() {
        EstimationProblem p = ProblemLoader.load(PetabFiles.write(dir, PULSE,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "k | log10 | 1e-2 | 10 | " + K + " | 1\n"
                        + "b | lin | 0.1 | 10 | " + B + " | 1",
                "conditionId | u\npre | 0\nc0 | 50",
                "observableId | observableFormula | noiseFormula\nobs | x | 0.1",
                "observableId | preequilibrationConditionId | simulationConditionId | measurement | time\n"
                        + "obs | pre | c0 | 2 | 1\nobs | pre | c0 | 2.9 | 4\nobs | pre | c0 | 2.2 | 10"));
        TrajectoriesFile.Observable o = FittedTrajectories.compute(p, p.nominalTheta(), TIGHT,
                FittedTrajectories.DEFAULT_GRID).experiments().get(0).observables().get(0);
        double[] t = o.time();
        double worst = 0;
        for (int i = 0; i < t.length; i++) {
            double exact = pulse(t[i]);
            worst = Math.max(worst, Math.abs(o.fitted()[i] - exact) / exact);
        }
        // REL as for the step input; the switching times, located to about 1e-12 relative, move x by at most
        // u·3.3e-12 ≈ 2e-10 here. Measured: 1.4e-9 on the simulator route; stepping across both switches without
        // stopping (the former grid simulation) missed the pulse: error 0.33, its whole contribution after t_off.
        assertTrue(worst < REL, "largest relative error on the grid " + worst);
    }
}
