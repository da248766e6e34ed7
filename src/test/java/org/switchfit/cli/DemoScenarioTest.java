package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.continuation.Branch;
import org.switchfit.data.DoseResponsePoint;
import org.switchfit.data.ProblemFileReader;
import org.switchfit.data.SwitchfitProblem;
import org.switchfit.data.SwitchingThreshold;

/** The synthetic demo data: exact values against the independent sympy/scipy check, and reproducibility. */
class DemoScenarioTest {
    private static final Path MODEL = Path.of("models/stress_switch.xml");
    private static final Path DATASETS = Path.of("datasets");

    // datasets/stress_switch-generator-notes.md: sympy 1.14.0 nsolve at 30 digits on the exact (rational) model,
    // two independent routes agreeing to 30 digits (datasets/stress_switch_check.py); 20 digits printed.
    private static final double FOLD_ON = 2.0675533425302829702;
    private static final double FOLD_OFF = 0.82548611445015955433;
    // Required by the task: 1e-8 relative. The continuation refines folds with Newton at tolerance 1e-11
    // (ContinuationSettings.of), so the error should be far below.
    private static final double REL_TOL_FOLD = 1e-8;

    @Test
    void noiseFreeThresholdsAreTheSympyFolds(@TempDir Path tmp) {
        DemoScenario.Generated g = DemoScenario.generate(MODEL, tmp.resolve("datasets"),
                new DemoScenario.Settings(DemoScenario.DEFAULT_SEED, 0, -1));
        assertEquals(FOLD_ON, g.switchOn(), REL_TOL_FOLD * FOLD_ON);
        assertEquals(FOLD_OFF, g.switchOff(), REL_TOL_FOLD * FOLD_OFF);
        List<SwitchingThreshold> th = g.problem().thresholds();
        assertEquals(2 * DemoScenario.THRESHOLD_REPLICATES, th.size());
        for (SwitchingThreshold t : th) {
            double want = t.direction() == SwitchingThreshold.Direction.UP ? FOLD_ON : FOLD_OFF;
            assertEquals(want, t.value(), REL_TOL_FOLD * want, t.toString());
        }
        // With noise off, the low and high dose-responses differ only inside the bistable range (0.8255, 2.0676).
        List<DoseResponsePoint> dr = g.problem().doseResponses();
        int n = DemoScenario.doses().length;
        for (int i = 0; i < n; i++) {
            DoseResponsePoint lo = dr.get(i);
            DoseResponsePoint hi = dr.get(i + n);
            assertEquals(lo.dose(), hi.dose());
            boolean bistable = lo.dose() > FOLD_OFF && lo.dose() < FOLD_ON;
            assertEquals(bistable, hi.value() - lo.value() > 0.3, "dose " + lo.dose());
        }
    }

    @Test
    void branchAtTheTruthHasTheSympyFoldsAndStability() {
        // The branch the demo's branches stage traces, at the true values: folds as computed independently.
        DemoModel dm = DemoModel.load(MODEL);
        double[] p = dm.nominal();
        Branch br = dm.branch(p, DemoScenario.lowState(dm, p), "stimulus", 0, 4);
        assertEquals(2, br.folds().size());
        double a = br.folds().get(0).parameter();
        double b = br.folds().get(1).parameter();
        assertEquals(FOLD_ON, Math.max(a, b), REL_TOL_FOLD * FOLD_ON);
        assertEquals(FOLD_OFF, Math.min(a, b), REL_TOL_FOLD * FOLD_OFF);
        // Both ends lie on the stimulus bounds and are stable (monostable there, notes table); the middle piece
        // between the folds is unstable (saddle-node: one eigenvalue crosses zero at each fold).
        assertTrue(br.point(0).stable() && br.point(br.size() - 1).stable());
        int mid = (br.folds().get(0).afterPoint() + br.folds().get(1).afterPoint()) / 2;
        assertEquals(1, br.point(mid).unstableCount());
    }

    @Test
    void steadyStatesFromBothStatesMatchTheScipyCheck() {
        // datasets/stress_switch-generator-notes.md, output of stress_switch_check.py (scipy 1.17.1 BDF, rtol 1e-10,
        // atol 1e-12, integrated to t = 2000 from the low and the high state), printed to 6 decimals. ZarnI + ZarnA
        // = 1, so act_frac = ZarnA. Stimuli: 0, s_off/2, (s_on + s_off)/2, 1.2 s_on, 4 with the sympy folds.
        double[] stimulus = {0, 0.5 * FOLD_OFF, 0.5 * (FOLD_ON + FOLD_OFF), 1.2 * FOLD_ON, 4.0};
        double[] fromLow = {0.002016, 0.019951, 0.077765, 0.848174, 0.904903};
        double[] fromHigh = {0.002016, 0.019951, 0.742536, 0.848174, 0.904903};
        // Tolerance: half a unit of the 6th printed decimal plus 1e-7 for the reference integration's error.
        double tol = 5e-7 + 1e-7;
        DemoModel dm = DemoModel.load(MODEL);
        double[] p = dm.nominal();
        for (int i = 0; i < stimulus.length; i++) {
            assertEquals(fromLow[i], DemoScenario.steadyActFrac(dm, p, stimulus[i], DemoScenario.lowState(dm, p)),
                    tol, "from low at " + stimulus[i]);
            assertEquals(fromHigh[i], DemoScenario.steadyActFrac(dm, p, stimulus[i], DemoScenario.highState(dm, p)),
                    tol, "from high at " + stimulus[i]);
        }
    }

    @Test
    void regenerationReproducesTheCheckedInFilesByteForByte(@TempDir Path tmp) throws IOException {
        Path dir = tmp.resolve("datasets");
        Files.createDirectories(dir);
        DemoScenario.Generated g = DemoScenario.generate(MODEL, dir, DemoScenario.Settings.defaults());
        List<Path> files = DemoScenario.write(g, dir, MODEL);
        assertEquals(4, files.size());
        for (Path f : files) {
            Path checkedIn = DATASETS.resolve(f.getFileName());
            assertArrayEquals(Files.readAllBytes(checkedIn), Files.readAllBytes(f),
                    f.getFileName() + " differs from the checked-in copy; regenerate with "
                            + "'switchfit demo --regenerate-data' if the change is intended");
        }
        // The written problem reads back with the reader of the format (docs/problem-format.md).
        Files.createDirectories(tmp.resolve("models"));
        Files.copy(MODEL, tmp.resolve("models/stress_switch.xml"));
        SwitchfitProblem back = ProblemFileReader.read(dir.resolve("stress_switch.yaml"));
        assertEquals(g.problem().timecourses().size(), back.timecourses().size());
        assertEquals(g.problem().doseResponses().size(), back.doseResponses().size());
        assertEquals(g.problem().thresholds(), back.thresholds().stream()
                .map(t -> new SwitchingThreshold(t.experiment(), t.control(), t.direction(), t.value(), t.sigma(),
                        null)).toList());
        assertEquals(7, back.parameters().size());
    }

    @Test
    void noiseWordsAreSplitMix64AndNormalsHaveUnitMoments() {
        // Oracle: java.util.SplittableRandom(seed) draws SplitMix64 words with the same gamma and mixer
        // (JDK 17 API documentation and source); our stream starts at seed XOR FNV-1a(key).
        DemoNoise a = new DemoNoise(42, "");
        SplittableRandom ref = new SplittableRandom(42 ^ 0xcbf29ce484222325L);
        for (int i = 0; i < 1000; i++) {
            assertEquals(ref.nextLong(), a.nextLong(), "word " + i);
        }
        DemoNoise g = new DemoNoise(7, "moments");
        int n = 200_000;
        double s = 0;
        double s2 = 0;
        for (int i = 0; i < n; i++) {
            double z = g.nextGaussian();
            s += z;
            s2 += z * z;
        }
        double mean = s / n;
        double var = s2 / n - mean * mean;
        // Standard errors (common practice): mean 1/sqrt(n) = 0.0022, variance sqrt(2/n) = 0.0032; allow 5 SE.
        assertEquals(0, mean, 5 / Math.sqrt(n));
        assertEquals(1, var, 5 * Math.sqrt(2.0 / n));
        assertTrue(new DemoNoise(1, "x").nextLong() != new DemoNoise(1, "y").nextLong(), "keys give other streams");
    }
}
