package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.report.DecayProblem;
import org.switchfit.report.FitDirectory;
import org.switchfit.report.FitFile;
import org.switchfit.report.FitSummary;
import org.switchfit.report.FittedTrajectories;
import org.switchfit.report.ProfilesFile;
import org.switchfit.report.SweepFile;

/** {@code switchfit report}: exit codes, default and explicit output file, one-line errors. */
class ReportCommandTest {
    @TempDir
    Path dir;

    private String[] run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.execute(args, new PrintWriter(out, true), new PrintWriter(err, true));
        return new String[] {Integer.toString(code), out.toString(), err.toString()};
    }

    private static FitSummary summary() {
        return new FitSummary("p.yaml", -1.5, Map.of("k", 2.0), Map.of("k", 0.30103), Map.of("k", "log10"), null, 2,
                0.1, 0, List.of(new FitSummary.Start(0, -1.5, "CONVERGED", "SMALL_STEP", 4, 6, null),
                new FitSummary.Start(1, -1.5, "CONVERGED", "SMALL_STEP", 5, 7, null)),
                new FitSummary.Settings(2, 1, 1e-8, 1e-12, false), 0.2, Map.of("java", "17"),
                List.of(new FitSummary.InputFile("p.yaml", "00")));
    }

    @Test
    void writesReportIntoTheFitDirectoryByDefault() throws Exception {
        FitDirectory d = FitDirectory.of(dir.resolve("fit"));
        d.write(FitFile.RESULT, summary());
        d.write(FitFile.SWEEP, new SweepFile("p", "x", 0.1, List.of(new SweepFile.Run(SweepFile.Direction.UP,
                new double[] {0, 1, 2}, new double[] {0, 0.1, 2}, List.of(new SweepFile.Jump(1.5, 0.1, 2))))));
        String[] r = run("report", d.path().toString());
        assertEquals("0", r[0], r[2]);
        Path html = d.path().resolve("report.html");
        assertTrue(Files.isRegularFile(html));
        String page = Files.readString(html);
        assertTrue(page.contains("content=\"waterfall hysteresis\""), "figure ids in the meta tag");
        assertTrue(r[1].contains("2 figures"), r[1]);

        Path other = dir.resolve("elsewhere").resolve("r.html");
        String[] r2 = run("report", d.path().toString(), "--out", other.toString());
        assertEquals("0", r2[0], r2[2]);
        assertTrue(Files.isRegularFile(other));
    }

    @Test
    void malformedFileIsExitCode2WithOneLine() throws Exception {
        FitDirectory d = FitDirectory.of(dir.resolve("bad"));
        d.write(FitFile.RESULT, summary());
        Files.writeString(d.pathOf(FitFile.BRANCHES), "{\"control\": \"p\", \"range\": [0]}");
        String[] r = run("report", d.path().toString());
        assertEquals("2", r[0]);
        String err = r[2].strip();
        assertFalse(err.contains("\n"), err);
        assertTrue(err.startsWith("error: "), err);
        assertTrue(err.contains("branches.json") && err.contains("'switchfit branches'"), err);
        assertFalse(Files.exists(d.path().resolve("report.html")));
    }

    /**
     * End to end with the real fit command: its result.json must read as {@link FitSummary} (the shared schema),
     * and so must the profiles.json of the real profile command; the report over that output plus trajectories.json
     * computed at the best theta has the expected figures.
     */
    @Test
    void reportsTheOutputOfTheFitCommand() throws Exception {
        Path yaml = DecayProblem.write(dir.resolve("problem"));
        Path fitDir = dir.resolve("fit");
        String[] f = run("fit", yaml.toString(), "--starts", "3", "--seed", "5", "--out", fitDir.toString(),
                "--quiet");
        assertEquals("0", f[0], f[2]);
        FitDirectory d = FitDirectory.of(fitDir);
        FitSummary s = d.read(FitFile.RESULT);
        assertEquals(3, s.starts().size());
        assertEquals(5L, s.settings().seed());
        assertEquals(List.of("k", "x0"), List.copyOf(s.parameters().keySet()));
        EstimationProblem p = ProblemLoader.load(yaml);
        double[] theta = {s.parametersEstimationScale().get("k"), s.parametersEstimationScale().get("x0")};
        d.write(FitFile.TRAJECTORIES, FittedTrajectories.compute(p, theta,
                SolverSettings.defaults().withTolerances(1e-8, 1e-12), FittedTrajectories.DEFAULT_GRID));
        String[] pr = run("profile", fitDir.toString(), "--threads", "1");
        assertEquals("0", pr[0], pr[2]);
        ProfilesFile prof = d.read(FitFile.PROFILES);
        assertEquals(2, prof.profiles().size());
        String[] r = run("report", fitDir.toString());
        assertEquals("0", r[0], r[2]);
        String page = Files.readString(fitDir.resolve("report.html"));
        assertTrue(page.contains("content=\"trajectories waterfall profiles\""), "figure ids in the meta tag");
    }

    @Test
    void missingDirectoryIsExitCode2() {
        String[] r = run("report", dir.resolve("nope").toString());
        assertEquals("2", r[0]);
        assertTrue(r[2].contains("is not a directory"), r[2]);
    }

    /** An empty or unrelated folder is a wrong path, not an empty report (common practice: fail loudly). */
    @Test
    void folderWithoutFitFilesIsExitCode2WithOneLine() throws Exception {
        Path foreign = Files.createDirectories(dir.resolve("foreign"));
        Files.writeString(foreign.resolve("notes.txt"), "not a fit directory");
        String[] r = run("report", foreign.toString());
        assertEquals("2", r[0], r[1]);
        String err = r[2].strip();
        assertFalse(err.contains("\n"), err);
        assertTrue(err.startsWith("error: ") && err.contains("foreign") && err.contains("--out folder"), err);
        assertFalse(Files.exists(foreign.resolve("report.html")));
    }
}
