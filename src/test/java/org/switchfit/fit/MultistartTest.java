package org.switchfit.fit;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.switchfit.objective.Objective;
import org.switchfit.objective.ObjectiveException;
import org.switchfit.util.UserInputException;

/** Reproducibility, resume and failure handling of {@link Multistart}. */
class MultistartTest {

    private static final long SEED = 20261202L;

    /**
     * y = A sin(ω t) on t = 0..9.5 step 0.5, exact data from A = 1.5, ω = 2.3: the cost in ω has many local minima,
     * so starts end in different places. Throws for ω > 9 (a region where "the model cannot be evaluated").
     */
    private static FitProblem sine() {
        double[] t = new double[20];
        double[] y = new double[20];
        for (int i = 0; i < t.length; i++) {
            t[i] = 0.5 * i;
            y[i] = 1.5 * Math.sin(2.3 * t[i]);
        }
        CurveObjective base = new CurveObjective(t, y, 0.1, 2, (x, b, g) -> {
            g[0] = Math.sin(b[1] * x);
            g[1] = b[0] * x * Math.cos(b[1] * x);
            return b[0] * Math.sin(b[1] * x);
        });
        Objective guarded = new Objective() {
            @Override
            public int parameterCount() {
                return 2;
            }

            @Override
            public int residualCount() {
                return base.residualCount();
            }

            @Override
            public double evaluate(double[] theta, double[] residuals, double[] jacobian) {
                if (theta[1] > 9) {
                    throw new ObjectiveException("model undefined for omega > 9");
                }
                return base.evaluate(theta, residuals, jacobian);
            }
        };
        return FitProblem.of(guarded, new String[] {"A", "omega"}, new double[] {0.1, 0.1},
                new double[] {5, 10});
    }

    @Test
    void sameResultsForOneAndFourThreads() {
        Multistart ms = Multistart.defaults().withStarts(24).withSeed(SEED);
        FitResult one = ms.run(sine(), null, LocalTaskExecutor.sequential());
        FitResult four = ms.run(sine(), null, LocalTaskExecutor.ofThreads(4));
        assertSameStarts(one.starts(), four.starts());
        assertArrayEquals(one.bestTheta(), four.bestTheta());
        assertEquals(one.startsNearBest(), four.startsNearBest());
        // The global optimum is the data-generating (1.5, 2.3) with zero residual; tolerance 1e-8 absolute on an
        // exact-data fit (LM converges to rounding level on a zero-residual problem).
        assertEquals(1.5, one.bestTheta()[0], 1e-8);
        assertEquals(2.3, one.bestTheta()[1], 1e-8);
        // Starts are sorted by NLL.
        for (int i = 1; i < one.starts().size(); i++) {
            StartResult a = one.starts().get(i - 1);
            StartResult b = one.starts().get(i);
            assertTrue(b.status() == StartStatus.FAILED || a.nll() <= b.nll());
        }
    }

    @Test
    void sobolSamplingIsReproducibleToo() {
        Multistart ms = Multistart.defaults().withStarts(16).withSeed(SEED).withSampling(StartSampling.SOBOL);
        FitResult one = ms.run(sine(), null, LocalTaskExecutor.sequential());
        FitResult three = ms.run(sine(), null, LocalTaskExecutor.ofThreads(3));
        assertSameStarts(one.starts(), three.starts());
        double[][] pts = ms.startPoints(sine(), null);
        double[][] other = ms.withSeed(SEED + 1).startPoints(sine(), null);
        assertTrue(pts[3][0] != other[3][0], "different seeds must shift the design");
    }

    @Test
    void latinHypercubeUsesEveryStratumOnce() {
        int n = 37;
        double[][] pts = Multistart.defaults().withStarts(n).withSeed(SEED).startPoints(sine(), null);
        for (int k = 0; k < 2; k++) {
            double lo = k == 0 ? 0.1 : 0.1;
            double hi = k == 0 ? 5 : 10;
            boolean[] used = new boolean[n];
            for (double[] p : pts) {
                int s = (int) Math.floor((p[k] - lo) / (hi - lo) * n);
                assertTrue(s >= 0 && s < n && !used[s], "stratum " + s + " of axis " + k);
                used[s] = true;
            }
        }
    }

    @Test
    void resumeGivesTheUninterruptedResult() {
        Multistart ms = Multistart.defaults().withStarts(12).withSeed(SEED);
        FitResult full = ms.run(sine(), null, LocalTaskExecutor.sequential());
        List<StartResult> partial = new ArrayList<>();
        for (StartResult r : full.starts()) {
            if (r.index() % 3 != 1) {
                partial.add(r);
            }
        }
        List<Integer> reported = Collections.synchronizedList(new ArrayList<>());
        FitResult resumed = ms.run(sine(), null, LocalTaskExecutor.ofThreads(2), r -> reported.add(r.index()),
                partial);
        assertSameStarts(full.starts(), resumed.starts());
        Collections.sort(reported);
        assertEquals(List.of(1, 4, 7, 10), reported);

        // A stored start from another seed is refused with a message saying what to do.
        FitResult otherSeed = ms.withSeed(SEED + 7).run(sine(), null, LocalTaskExecutor.sequential());
        UserInputException e = assertThrows(UserInputException.class, () -> ms.run(sine(), null,
                LocalTaskExecutor.sequential(), null, List.of(otherSeed.starts().get(0))));
        assertTrue(e.getMessage().contains("rerun with the same settings"), e.getMessage());
    }

    @Test
    void failingStartIsRecordedNotFatal() {
        // Start 0 is placed where the objective throws; the other starts run normally.
        Multistart ms = Multistart.defaults().withStarts(8).withSeed(SEED);
        FitResult r = ms.run(sine(), new double[] {1.0, 9.5}, LocalTaskExecutor.ofThreads(2));
        StartResult failed = null;
        for (StartResult s : r.starts()) {
            if (s.index() == 0) {
                failed = s;
            }
        }
        assertNotNull(failed);
        assertEquals(StartStatus.FAILED, failed.status());
        assertTrue(failed.reason().contains("omega > 9"), failed.reason());
        assertNull(failed.theta());
        int expectedFailures = 0;
        for (StartResult s : r.starts()) {
            expectedFailures += s.start()[1] > 9 ? 1 : 0;
        }
        assertEquals(expectedFailures, r.failedCount(), "exactly the starts placed at omega > 9 fail");
        assertEquals(StartStatus.FAILED, r.starts().get(r.starts().size() - 1).status(), "failed starts sort last");
        assertNotNull(r.bestTheta());
    }

    @Test
    void infiniteBoundsAreAUserErrorForSampling() {
        FitProblem p = FitProblem.of(sine().objective(), new String[] {"A", "omega"},
                new double[] {0.1, Double.NEGATIVE_INFINITY}, new double[] {5, 10});
        UserInputException e = assertThrows(UserInputException.class,
                () -> Multistart.defaults().startPoints(p, null));
        assertTrue(e.getMessage().contains("'omega'") && e.getMessage().contains("finite bounds"), e.getMessage());
    }

    @Test
    void everyStartFailingGivesAnEmptyBest() {
        FitProblem ok = sine();
        Objective always = new Objective() {
            @Override
            public int parameterCount() {
                return 2;
            }

            @Override
            public int residualCount() {
                return ok.objective().residualCount();
            }

            @Override
            public double evaluate(double[] theta, double[] residuals, double[] jacobian) {
                throw new ObjectiveException("solver diverged");
            }
        };
        FitResult r = Multistart.defaults().withStarts(5).run(ok.withObjective(always), null,
                LocalTaskExecutor.ofThreads(2));
        assertNull(r.bestTheta());
        assertTrue(Double.isNaN(r.bestNll()));
        assertEquals(5, r.failedCount());
        assertEquals(0, r.startsNearBest());
    }

    @Test
    void singleStartEntryPointMatchesTheRun() {
        Multistart ms = Multistart.defaults().withStarts(6).withSeed(SEED);
        FitResult all = ms.run(sine(), null, LocalTaskExecutor.sequential());
        for (StartResult s : all.starts()) {
            assertSameStarts(List.of(s), List.of(ms.runStart(sine(), null, s.index())));
        }
    }

    @Test
    void startPointsLieInTheBoxAndFixedValuesAreKept() {
        FitProblem p = sine().withFixed(0, true);
        for (StartSampling s : StartSampling.values()) {
            double[][] pts = Multistart.defaults().withStarts(50).withSampling(s).startPoints(p,
                    new double[] {1.25, 3});
            assertEquals(1.25, pts[0][0], 0.0);
            for (double[] x : pts) {
                assertEquals(1.25, x[0], 0.0, "fixed parameter");
                assertTrue(x[1] >= 0.1 && x[1] <= 10, "inside bounds: " + x[1]);
            }
        }
    }

    @Test
    void uniformStartsAreInTheBoxAndDoNotDependOnTheStartCount() {
        // StartSampling.UNIFORM draws start i from stream (seed, i) alone (by construction), so the first 5 of 12
        // starts equal the 5 starts of a 5-start design, exactly.
        FitProblem p = FitProblem.of(new CurveObjective(new double[] {0, 1}, new double[] {0, 1}, 1.0, 3,
                (x, b, g) -> b[0] + b[1] * x + b[2]), new String[] {"a", "b", "c"}, new double[] {-5, 0, 10},
                new double[] {5, 1, 11});
        double[][] twelve = StartSampling.UNIFORM.sample(p, new double[3], 12, 3L);
        double[][] five = StartSampling.UNIFORM.sample(p, new double[3], 5, 3L);
        for (int i = 0; i < 5; i++) {
            assertArrayEquals(five[i], twelve[i], 0.0);
        }
        for (double[] x : twelve) {
            for (int k = 0; k < 3; k++) {
                assertTrue(x[k] >= p.lower(k) && x[k] <= p.upper(k), java.util.Arrays.toString(x));
            }
        }
    }

    static void assertSameStarts(List<StartResult> a, List<StartResult> b) {
        assertEquals(a.size(), b.size());
        for (int i = 0; i < a.size(); i++) {
            StartResult x = a.get(i);
            StartResult y = b.get(i);
            String where = "start at rank " + i;
            assertEquals(x.index(), y.index(), where);
            assertEquals(x.status(), y.status(), where);
            assertEquals(x.reason(), y.reason(), where);
            assertArrayEquals(x.start(), y.start(), where);
            assertArrayEquals(x.theta(), y.theta(), where);
            assertEquals(Double.doubleToLongBits(x.nll()), Double.doubleToLongBits(y.nll()), where);
            assertEquals(x.termination(), y.termination(), where);
            assertEquals(x.iterations(), y.iterations(), where);
            assertEquals(x.evaluations(), y.evaluations(), where);
        }
    }
}
