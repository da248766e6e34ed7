package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;

/**
 * trajectories.json content from a PEtab problem: first-order decay X' = -k X, X(0) = x0, whose solution
 * X(t) = x0 exp(-k t) is known in closed form, with a linear and a log-transformed observable in two conditions.
 */
class FittedTrajectoriesTest {
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);

    @TempDir
    Path dir;

    @Test
    void fittedCurvesFollowTheClosedForm() throws IOException {
        EstimationProblem p = ProblemLoader.load(DecayProblem.write(dir));
        double k = 0.3;
        double x0 = 2.0;
        double[] theta = {Math.log10(k), Math.log10(x0)};
        TrajectoriesFile tf = FittedTrajectories.compute(p, theta, TIGHT, 41);
        assertNull(tf.bandLevel());
        assertEquals(2, tf.experiments().size());
        TrajectoriesFile.Experiment c0 = tf.experiments().get(0);
        assertEquals(2, c0.observables().size());
        // Closed form X(t) = x0 exp(-k t); linObs = 2 X. BDF at rtol 1e-10: 1e-7 relative allows the usual one to
        // two orders of global error growth over the local tolerance (common practice), plus margin.
        double worst = 0;
        for (TrajectoriesFile.Observable o : c0.observables()) {
            double f = o.id().equals("linObs") ? 2.0 : 1.0;
            double[] t = o.time();
            double[] y = o.fitted();
            assertEquals(0.0, t[0], 0.0);
            assertEquals(8.0, t[t.length - 1], 0.0);
            assertEquals(41, t.length, "grid of 41 contains the measurement times 0, 1, 2, 4, 8 (multiples of 0.2)");
            for (int i = 0; i < t.length; i++) {
                double exact = f * x0 * Math.exp(-k * t[i]);
                worst = Math.max(worst, Math.abs(y[i] - exact) / exact);
            }
        }
        assertTrue(worst < 1e-7, "relative error " + worst);
        TrajectoriesFile.Observable lin = c0.observables().get(0);
        assertEquals("linObs", lin.id());
        assertArrayEquals(new double[] {0, 1, 2, 4, 8}, lin.dataTime(), 0.0);
        assertArrayEquals(new double[] {0.1, 0.1, 0.1, 0.1, 0.1}, lin.dataSigma(), 0.0);
        assertEquals(4 * Math.exp(-0.3 * 2) + 0.01, lin.dataValue()[2], 0.0);
        // log-transformed: sd on the data scale = value * sigma (first-order propagation, derived by hand)
        TrajectoriesFile.Observable lg = c0.observables().get(1);
        for (int i = 0; i < lg.dataTime().length; i++) {
            assertEquals(lg.dataValue()[i] * 0.2, lg.dataSigma()[i], 1e-15 * lg.dataValue()[i]);
        }
        // condition 'fast' fixes k = 0.9: linObs = 2 x0 exp(-0.9 t) on [0, 3]
        TrajectoriesFile.Observable fast = tf.experiments().get(1).observables().get(0);
        double[] t = fast.time();
        assertEquals(3.0, t[t.length - 1], 0.0);
        assertEquals(2 * x0 * Math.exp(-0.9 * 3), fast.fitted()[t.length - 1], 1e-7 * 2 * x0 * Math.exp(-2.7));
        // round trip through the fit directory
        FitDirectory d = FitDirectory.of(dir.resolve("out"));
        d.write(FitFile.TRAJECTORIES, tf);
        assertEquals(Json.toJson(tf), Json.toJson(d.read(FitFile.TRAJECTORIES)));
    }
}
