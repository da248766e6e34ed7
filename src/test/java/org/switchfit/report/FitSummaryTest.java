package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.fit.FitResult;
import org.switchfit.fit.ParameterScale;
import org.switchfit.fit.StartResult;
import org.switchfit.fit.StartStatus;
import org.switchfit.fit.Termination;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;

/** {@link FitSummary#of}: values, bounds and start order taken over from the problem and the fit result. */
class FitSummaryTest {
    @TempDir
    Path dir;

    @Test
    void summaryOfAFitResult() throws Exception {
        EstimationProblem p = ProblemLoader.load(DecayProblem.write(dir));
        double[] best = {Math.log10(0.3), Math.log10(2.0)};
        StartResult s0 = new StartResult(1, StartStatus.CONVERGED, "small step", new double[] {0, 0}, best, -4.0,
                Termination.STEP_SIZE, 7, 9, 8, 1e-9);
        StartResult s1 = new StartResult(0, StartStatus.FAILED, "integration failed", new double[] {1, 1}, null,
                Double.NaN, null, 0, 2, 0, Double.NaN);
        FitResult r = new FitResult(new String[] {"k", "x0"}, new ParameterScale[] {ParameterScale.LOG10,
            ParameterScale.LOG10}, best, -4.0, List.of(s0, s1), 1, 1234);
        FitSummary s = FitSummary.of(p, r, new FitSummary.Settings(2, 3, 1e-8, 1e-12, false), 1.234,
                Map.of("java", "17"), List.of());
        // 10^log10(0.3) round trip: within 4 ulp of 0.3 (pow of a rounded logarithm)
        assertEquals(0.3, s.parameters().get("k"), 4 * Math.ulp(0.3));
        assertEquals(best[1], s.parametersEstimationScale().get("x0"), 0.0);
        assertEquals("log10", s.scales().get("k"));
        // bounds of the parameter table in DecayProblem: k in [1e-3, 10], x0 in [1e-2, 100]
        assertEquals(new FitSummary.Bounds(1e-3, 10), s.bounds().get("k"));
        assertEquals(new FitSummary.Bounds(1e-2, 100), s.bounds().get("x0"));
        assertEquals(1, s.failedStarts());
        assertEquals(List.of(1, 0), s.starts().stream().map(FitSummary.Start::index).toList());
        assertNull(s.starts().get(1).termination());
        FitDirectory d = FitDirectory.of(dir.resolve("out"));
        d.write(FitFile.RESULT, s);
        assertEquals(Json.toJson(s), Json.toJson(d.read(FitFile.RESULT)));
    }

    /** Paths are recorded absolute and normalised, so a fit directory can be read from any working directory. */
    @Test
    void pathsAreRecordedAbsolute() throws Exception {
        Path yaml = DecayProblem.write(dir);
        Path roundabout = dir.resolve("sub").resolve("..").resolve(yaml.getFileName());
        java.nio.file.Files.createDirectories(dir.resolve("sub"));
        EstimationProblem p = ProblemLoader.load(roundabout);
        FitResult r = new FitResult(new String[] {"k", "x0"}, new ParameterScale[] {ParameterScale.LOG10,
            ParameterScale.LOG10}, null, Double.NaN, List.of(), 0, 1);
        FitSummary s = FitSummary.of(p, r, null, 0, Map.of(), List.of(FitSummary.InputFile.of(roundabout)));
        String expected = yaml.toAbsolutePath().normalize().toString();
        assertEquals(expected, s.problem());
        assertEquals(expected, s.inputs().get(0).file());
    }

    /**
     * Relative paths of older result.json files: the working directory first (here it holds no such file), then
     * the fit directory's parent, then the fit directory; the path as written when none has it.
     */
    @Test
    void relativeRecordedPathsResolveBesideTheFitDirectory() throws Exception {
        Path fit = java.nio.file.Files.createDirectories(dir.resolve("fits").resolve("a"));
        String name = "switchfit-test-" + Long.toHexString(System.nanoTime()) + ".yaml";
        assertEquals(Path.of(name), FitSummary.resolveRecorded(fit, name), "found nowhere");
        java.nio.file.Files.writeString(fit.resolve(name), "x");
        assertEquals(fit.toAbsolutePath().normalize().resolve(name), FitSummary.resolveRecorded(fit, name));
        java.nio.file.Files.writeString(fit.getParent().resolve(name), "x");
        assertEquals(fit.toAbsolutePath().normalize().getParent().resolve(name), FitSummary.resolveRecorded(fit,
                name), "the parent before the fit directory (the older rule)");
        Path abs = dir.resolve("elsewhere.yaml").toAbsolutePath();
        assertEquals(abs, FitSummary.resolveRecorded(fit, abs.toString()));
    }
}
