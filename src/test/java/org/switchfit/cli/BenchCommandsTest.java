package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * The benchmark commands: user errors (one line, exit code 2, nothing run), the gradient check's point and step,
 * bench-fits progress and resume.
 */
class BenchCommandsTest {

    @TempDir
    Path dir;

    @Test
    void unknownProblemNameIsAUserError() throws Exception {
        Files.createDirectories(dir.resolve("Alpha_2020"));
        Files.createDirectories(dir.resolve("Beta_2021"));
        for (String cmd : new String[] {"bench-fits", "bench-petab"}) {
            StringWriter out = new StringWriter();
            StringWriter err = new StringWriter();
            String[] args = cmd.equals("bench-fits")
                    ? new String[] {cmd, dir.toString(), "--problems", "Alpha_2020,Gamma", "--out",
                            dir.resolve("out").toString()}
                    : new String[] {cmd, dir.toString(), "--problems", "Gamma"};
            int code = Main.execute(args, new PrintWriter(out, true), new PrintWriter(err, true));
            assertEquals(2, code, cmd + ": " + err);
            String msg = err.toString().strip();
            assertEquals(1, msg.split("\n").length, msg);
            assertTrue(msg.contains("'Gamma'") && msg.contains("Alpha_2020, Beta_2021"), msg);
        }
    }

    /**
     * The gradient check moves θ by 1 % of each box width toward the centre; where the NLL is undefined there it
     * takes the next smaller shift. Noise spread 1 - sd (sd linear in [0, 100], nominal 0.5): at 1 % sd = 1.5 and
     * the spread is -0.5 (undefined), at 0.1 % sd = 0.6 and the spread 0.4 (hand arithmetic).
     */
    @Test
    void gradientCheckPointFallsBackWhereTheNllIsUndefined() {
        Path yaml = decayProblem("p", "sd | lin | 0 | 100 | 0.5 | 1", "obs | X | 1 - sd | lin | normal",
                new double[] {0.9, 0.7, 0.5});
        java.util.Map<String, Object> r = new java.util.LinkedHashMap<>();
        double err = BenchPetabCommand.gradientError(yaml, r);
        assertEquals(0.001, (Double) r.get("gradientPointShift"), 0.0, r.toString());
        java.util.List<?> rejected = (java.util.List<?>) r.get("gradientPointRejected");
        assertEquals(1, rejected.size(), r.toString());
        assertTrue(rejected.get(0).toString().contains("noise spread"), r.toString());
        // Forward sensitivities vs central differences at rtol 1e-10 (the check's own bar is 1e-4).
        assertTrue(err < 1e-6, "gradient error " + err);
    }

    /**
     * A linear-scale factor of tiny size (s in [0, 2e-10], about 1e-10) on a log-transformed observable: the
     * difference step must follow the factor's own size. The earlier step 1e-4 max(1, |θ|) = 1e-4 made s negative
     * and the log of the observable undefined, so the check failed; the step 1e-4 |θ| is 1e-14 here.
     */
    @Test
    void differenceStepFollowsTheSizeOfATinyLinearParameter() {
        double[] m = new double[TIMES.length];
        for (int i = 0; i < m.length; i++) {
            m[i] = 1e-10 * Math.exp(-0.25 * TIMES[i]);
        }
        Path yaml = decayProblem("tiny", "s | lin | 0 | 2e-10 | 1.1e-10 | 1", "obs | s * X | 0.1 | log | normal", m);
        java.util.Map<String, Object> r = new java.util.LinkedHashMap<>();
        double err = BenchPetabCommand.gradientError(yaml, r);
        assertEquals(1e-14 * 1.08, BenchPetabCommand.differenceStep(1.08e-10,
                org.switchfit.problem.ProblemLoader.load(yaml).parameters().get(2)), 1e-28);
        assertEquals(0.01, (Double) r.get("gradientPointShift"), 0.0, r.toString());
        assertTrue(err < 1e-6, "gradient error " + err + " " + r);
    }

    /**
     * bench-fits tells about every finished start and, when resuming, how many starts it reused: after a full run
     * of 3 starts with one stored start removed (an interrupted run), --resume reuses 2 and computes the third.
     */
    @Test
    void benchFitsReportsFinishedAndResumedStarts() throws Exception {
        decayProblem("decay", "sd | lin | 0.01 | 1 | 0.1 | 0", "obs | X | 0.1 | lin | normal",
                new double[] {0.9, 0.75, 0.55});
        Path out = dir.resolve("out");
        String[] args = {"bench-fits", dir.toString(), "--problems", "decay", "--starts", "3", "--threads", "1",
                "--out", out.toString(), "--resume"};
        StringWriter err = new StringWriter();
        assertEquals(0, Main.execute(args, new PrintWriter(new StringWriter(), true), new PrintWriter(err, true)));
        for (int k = 1; k <= 3; k++) {
            assertTrue(err.toString().contains("done (" + k + "/3)"), err.toString());
        }
        Path starts = out.resolve("decay").resolve("starts");
        try (var files = Files.list(starts)) {
            Files.delete(files.sorted().toList().get(1));
        }
        err = new StringWriter();
        assertEquals(0, Main.execute(args, new PrintWriter(new StringWriter(), true), new PrintWriter(err, true)));
        String msg = err.toString();
        assertTrue(msg.contains("decay: 2 of 3 starts resumed"), msg);
        assertTrue(msg.contains("decay: start 1 done (3/3)"), msg);
        assertEquals(1, msg.split("done \\(").length - 1, msg);
        // The stored starts against other settings, and without --resume: one line, exit 2, no start run.
        String[][] wrong = {{"bench-fits", dir.toString(), "--problems", "decay", "--starts", "4", "--threads", "1",
                "--out", out.toString(), "--resume"}, {"bench-fits", dir.toString(), "--problems", "decay", "--starts",
                "3", "--threads", "1", "--out", out.toString()}};
        String[] expected = {"holds results computed with starts = 3, but this run has 4",
            "already holds finished starts"};
        for (int w = 0; w < wrong.length; w++) {
            StringWriter e2 = new StringWriter();
            int code = Main.execute(wrong[w], new PrintWriter(new StringWriter(), true), new PrintWriter(e2, true));
            String m2 = e2.toString().strip();
            assertEquals(2, code, m2);
            assertEquals(1, m2.split("\n").length, m2);
            assertTrue(m2.contains(expected[w]) && !m2.contains("resumed") && !m2.contains("done ("), m2);
        }
        try (var files = Files.list(starts)) {
            assertEquals(3, files.count());
        }
    }

    /**
     * A broken problem in a benchmark folder is a row naming its file and line; the other problems still run, and
     * the exit code is 2 so scripts notice.
     */
    @Test
    void unreadableProblemGivesItsRowAndExitTwo() throws Exception {
        decayProblem("decay", "sd | lin | 0.01 | 1 | 0.1 | 0", "obs | X | 0.1 | lin | normal",
                new double[] {0.9, 0.75, 0.55});
        Files.createDirectories(dir.resolve("broken"));
        Files.writeString(dir.resolve("broken").resolve("problem.yaml"),
                "format_version: 1\nparameter_file: parameters.tsv\nproblems:\n  - sbml_files: [model.xml\n");
        StringWriter out = new StringWriter();
        int code = Main.execute(new String[] {"bench-petab", dir.toString(), "--no-gradient"},
                new PrintWriter(out, true), new PrintWriter(new StringWriter(), true));
        assertEquals(2, code, out.toString());
        String brokenRow = out.toString().lines().filter(l -> l.startsWith("broken")).findFirst().orElse("");
        assertTrue(brokenRow.contains("problem.yaml, line 4"), out.toString());
        assertTrue(out.toString().lines().anyMatch(l -> l.startsWith("decay") && !l.contains("failed")),
                out.toString());
    }

    private static final double[] TIMES = {0.5, 1.5, 3};

    /**
     * The decay problem of {@link org.switchfit.testsystems.DecaySbml#MODEL} (k, x0 estimated) with one more
     * parameter row, one observable row and data m at {@link #TIMES}.
     */
    private Path decayProblem(String name, String parameterRow, String observableRow, double[] m) {
        StringBuilder meas = new StringBuilder("observableId | simulationConditionId | measurement | time");
        for (int i = 0; i < m.length; i++) {
            meas.append(String.format(java.util.Locale.ROOT, "%nobs | c0 | %s | %s", m[i], TIMES[i]));
        }
        return org.switchfit.testsystems.PetabFiles.write(dir.resolve(name), org.switchfit.testsystems.DecaySbml.MODEL,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "k | lin | 0.01 | 2 | 0.2 | 1\n"
                        + "x0 | log10 | 0.01 | 100 | 1.0 | 1\n"
                        + parameterRow,
                "conditionId\nc0",
                "observableId | observableFormula | noiseFormula | observableTransformation | noiseDistribution\n"
                        + observableRow,
                meas.toString());
    }
}
