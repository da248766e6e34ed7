package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.ObjectMapper;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The check and fit commands on the tiny PEtab problem of the data package's test resources. */
class FitCheckCommandTest {
    @TempDir
    Path dir;

    private static Path tiny() throws URISyntaxException {
        return Path.of(FitCheckCommandTest.class.getResource("/org/switchfit/data/petab-tiny/problem.yaml").toURI());
    }

    private static int run(StringWriter out, StringWriter err, String... args) {
        return Main.execute(args, new PrintWriter(out, true), new PrintWriter(err, true));
    }

    @Test
    void checkWritesJsonAndSimulationTable() throws Exception {
        Path json = dir.resolve("check.json");
        Path sims = dir.resolve("sims.tsv");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = run(out, err, "check", tiny().toString(), "--json", json.toString(), "--simulations",
                sims.toString());
        assertEquals(0, code, err.toString());
        JsonNode j = new ObjectMapper().readTree(json.toFile());
        assertTrue(j.get("nllAtNominal").isNumber());
        assertEquals(4, j.get("measurements").asInt());
        List<String> lines = Files.readAllLines(sims);
        assertEquals(5, lines.size(), "header + one row per measurement row");
        List<String> header = List.of(lines.get(0).split("\t"));
        assertEquals(header.indexOf("measurement") + 1, header.indexOf("simulation"));
        // row order kept: the last measurement row is p_log at t = 1; its simulation is exp(-0.5) (closed form:
        // P' = -0.5 P, P(0) = 1)
        String[] last = lines.get(4).split("\t", -1);
        assertEquals("p_log", last[0]);
        assertEquals(Math.exp(-0.5), Double.parseDouble(last[header.indexOf("simulation")]), 1e-6);
    }

    @Test
    void checkReportsMismatchAgainstReference() throws Exception {
        Path ref = dir.resolve("sim.tsv");
        Files.writeString(ref, "observableId\tsimulationConditionId\tsimulation\ttime\n"
                + "p_log\tstarved\t0.5\t1\n");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = run(out, err, "check", tiny().toString(), "--reference", ref.toString());
        assertEquals(CheckCommand.EXIT_MISMATCH, code, out.toString());
    }

    /**
     * Decay X' = -k X (k = 0.3, X(0) = x0) in two conditions x0 = 1 and x0 = 2, measured at t = 1; closed form
     * X(1) = x0 e^{-0.3} (derived by hand). The reference lists the conditions in the other order and names the
     * observable without its prefix, as reference tables of some tools do: matched by keys, not by row.
     */
    @Test
    void referenceInAnotherRowOrderAndWithShortObservableIdsIsMatchedByKeys() throws Exception {
        Path yaml = org.switchfit.testsystems.PetabFiles.write(dir.resolve("two"),
                org.switchfit.testsystems.DecaySbml.MODEL,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "k | lin | 0.01 | 2 | 0.3 | 1",
                "conditionId | x0\nlow | 1.0\nhigh | 2.0",
                "observableId | observableFormula | noiseFormula | observableTransformation | noiseDistribution\n"
                        + "observable_X | X | 0.1 | lin | normal",
                "observableId | simulationConditionId | measurement | time\n"
                        + "observable_X | low | 0.7 | 1\nobservable_X | high | 1.5 | 1");
        Path ref = dir.resolve("ref.tsv");
        Files.writeString(ref, "observableId\tsimulationConditionId\tsimulation\ttime\n"
                + "X\thigh\t" + 2 * Math.exp(-0.3) + "\t1\n"
                + "X\tlow\t" + Math.exp(-0.3) + "\t1\n");
        Path json = dir.resolve("check.json");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = run(out, err, "check", yaml.toString(), "--reference", ref.toString(), "--json", json.toString());
        assertEquals(0, code, out + "\n" + err);
        assertEquals(2, new ObjectMapper().readTree(json.toFile()).get("matched").asInt(), out.toString());
        // full ids, other order: the two conditions must not be taken for a renaming of each other
        Files.writeString(ref, "observableId\tsimulationConditionId\tsimulation\ttime\n"
                + "observable_X\thigh\t" + 2 * Math.exp(-0.3) + "\t1\n"
                + "observable_X\tlow\t" + Math.exp(-0.3) + "\t1\n");
        code = run(out, err, "check", yaml.toString(), "--reference", ref.toString(), "--json", json.toString());
        assertEquals(0, code, out + "\n" + err);
        assertEquals(2, new ObjectMapper().readTree(json.toFile()).get("matched").asInt(), out.toString());
    }

    @Test
    void badProblemGivesOneLineAndExitCode2() throws Exception {
        Path bad = dir.resolve("p.yaml");
        Files.writeString(bad, "hello: 1\n");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(Main.EXIT_USER_ERROR, run(out, err, "check", bad.toString()));
        assertEquals(1, err.toString().strip().lines().count(), err.toString());
        assertTrue(err.toString().startsWith("error: "), err.toString());
    }

    /** A timecourse table with its header only: nothing to fit, so fit refuses instead of reporting NLL 0. */
    @Test
    void fitWithoutDataIsRefused() throws Exception {
        Files.writeString(dir.resolve("model.xml"), org.switchfit.testsystems.DecaySbml.MODEL);
        Files.writeString(dir.resolve("tc.csv"), "experiment,observable,time,value\n");
        Path yaml = Files.writeString(dir.resolve("nodata.yaml"), "switchfit_format: 1\nmodel: model.xml\n"
                + "parameters:\n  - {id: k, lower: 0.01, upper: 10, start: 0.3}\nexperiments:\n  - id: e1\n"
                + "observables:\n  - {id: obs, formula: X, noise: {type: gaussian, sigma: 0.1}}\n"
                + "data:\n  timecourses:\n    - file: tc.csv\n");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(Main.EXIT_USER_ERROR, run(out, err, "fit", yaml.toString(), "--starts", "2", "--seed", "1",
                "--quiet", "--out", dir.resolve("f").toString()), out.toString());
        String e = err.toString().strip();
        assertEquals(1, e.lines().count(), e);
        assertTrue(e.startsWith("error: " + yaml + ": no data") && e.contains("add data rows"), e);
        assertTrue(!Files.exists(dir.resolve("f").resolve("result.json")));
    }

    /** Resuming a fit folder with another problem file names both files instead of calling the new one changed. */
    @Test
    void resumeWithAnotherProblemFileSaysSo() throws Exception {
        Files.writeString(dir.resolve("model.xml"), org.switchfit.testsystems.DecaySbml.MODEL);
        Files.writeString(dir.resolve("tc.csv"), "experiment,observable,time,value\ne1,obs,1,1.5\ne1,obs,2,1.1\n");
        String body = "switchfit_format: 1\nmodel: model.xml\nparameters:\n"
                + "  - {id: k, lower: 0.01, upper: 10, start: START}\nexperiments:\n  - id: e1\n"
                + "observables:\n  - {id: obs, formula: X, noise: {type: gaussian, sigma: 0.1}}\n"
                + "data:\n  timecourses:\n    - file: tc.csv\n";
        Path a = Files.writeString(dir.resolve("p_a.yaml"), body.replace("START", "0.3"));
        Path b = Files.writeString(dir.resolve("p_b.yaml"), body.replace("START", "0.5"));
        Path out = dir.resolve("fa");
        StringWriter o = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(0, run(o, err, "fit", a.toString(), "--starts", "1", "--seed", "1", "--quiet", "--out",
                out.toString()), err.toString());
        err = new StringWriter();
        assertEquals(Main.EXIT_USER_ERROR, run(o, err, "fit", b.toString(), "--starts", "1", "--seed", "1",
                "--quiet", "--resume", "--out", out.toString()));
        String e = err.toString().strip();
        assertEquals(1, e.lines().count(), e);
        assertTrue(e.contains("holds results of another problem file, " + a.toAbsolutePath().normalize() + ", not "
                + b.toAbsolutePath().normalize()) && e.contains("another --out folder"), e);
        assertTrue(!e.contains("changed since"), e);
    }

    @Test
    void resumedFitEqualsUninterruptedFit() throws Exception {
        Path full = dir.resolve("full");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        String p = tiny().toString();
        assertEquals(0, run(out, err, "fit", p, "--starts", "4", "--seed", "7", "--threads", "2", "--quiet",
                "--out", full.toString()), err.toString());
        // An interrupted run: only starts 1 and 3 finished before the stop.
        Path part = dir.resolve("part");
        Files.createDirectories(part.resolve("starts"));
        for (String k : new String[] {"start-000001.json", "start-000003.json"}) {
            Files.copy(full.resolve("starts").resolve(k), part.resolve("starts").resolve(k));
        }
        Files.copy(full.resolve("starts-run.json"), part.resolve("starts-run.json"));
        assertEquals(Main.EXIT_USER_ERROR, run(out, err, "fit", p, "--starts", "4", "--seed", "7", "--quiet",
                "--out", part.toString()), "existing starts without --resume");
        assertEquals(0, run(out, err, "fit", p, "--starts", "4", "--seed", "7", "--threads", "1", "--quiet",
                "--resume", "--out", part.toString()), err.toString());
        JsonNode a = read(full.resolve("result.json"));
        JsonNode b = read(part.resolve("result.json"));
        assertEquals(a.get("bestNll").asDouble(), b.get("bestNll").asDouble(), 0.0);
        assertEquals(a.get("parameters"), b.get("parameters"));
        assertEquals(a.get("starts"), b.get("starts"));
        assertEquals(a.get("inputs"), b.get("inputs"));
        assertTrue(Files.isRegularFile(part.resolve("residuals.csv")));
        String sbml = Files.readString(part.resolve("model_fitted.xml"));
        assertTrue(sbml.contains("k_conv"), "fitted model written as SBML");
        assertEquals(64, a.get("inputs").get(0).get("sha256").asText().length());
        // Stored starts are never resumed on other data: a copy of the problem whose measurement table changed
        // by one value is refused with one line naming that file; starts without their run record too.
        Path changed = dir.resolve("changed");
        copyFolder(tiny().getParent(), changed);
        Path table = changed.resolve("measurements.tsv");
        List<String> rows = Files.readAllLines(table);
        String[] cells = rows.get(1).split("\t", -1);
        int col = java.util.Arrays.asList(rows.get(0).split("\t", -1)).indexOf("measurement");
        cells[col] = Double.toString(Double.parseDouble(cells[col]) + 0.5);
        rows.set(1, String.join("\t", cells));
        Files.write(table, rows);
        StringWriter e2 = new StringWriter();
        assertEquals(Main.EXIT_USER_ERROR, run(out, e2, "fit", changed.resolve("problem.yaml").toString(), "--starts",
                "4", "--seed", "7", "--quiet", "--resume", "--out", part.toString()));
        assertTrue(e2.toString().contains("measurements.tsv: changed since the stored results"), e2.toString());
        assertEquals(1, e2.toString().strip().lines().count(), e2.toString());
        Files.delete(part.resolve("starts-run.json"));
        e2 = new StringWriter();
        assertEquals(Main.EXIT_USER_ERROR, run(out, e2, "fit", p, "--starts", "4", "--seed", "7", "--quiet",
                "--resume", "--out", part.toString()));
        assertTrue(e2.toString().contains("no record of the inputs and settings"), e2.toString());
    }

    private static void copyFolder(Path from, Path to) throws IOException {
        Files.createDirectories(to);
        try (var files = Files.list(from)) {
            for (Path f : files.toList()) {
                Files.copy(f, to.resolve(f.getFileName()));
            }
        }
    }

    @Test
    void checkShowsTheModelThresholdsAtTheStartValues() throws Exception {
        Path yaml = Path.of(FitCheckCommandTest.class.getResource("/org/switchfit/cli/toggle/problem.yaml").toURI());
        StringWriter o = new StringWriter();
        StringWriter err = new StringWriter();
        Path json = dir.resolve("toggle-check.json");
        assertEquals(0, run(o, err, "check", yaml.toString(), "--json", json.toString()), err.toString());
        // every kind of data counted (timecourses.csv has 20 rows, problem.yaml two inline thresholds)
        assertEquals(yaml + ": 20 measurements, 0 dose-response points, 2 switching thresholds; 3 estimated "
                + "parameters", o.toString().lines().findFirst().orElse(""));
        assertEquals(2, read(json).get("thresholds").asInt());
        assertEquals(0, read(json).get("doseResponsePoints").asInt());
        JsonNode sw = read(json).get("switchingAtNominal");
        assertEquals(2, sw.size());
        assertEquals("steepest_response", sw.get(0).get("note").asText());
        // closed form, derived by hand: on the steady states ind(U) = d U (1 + V³) - a1 with V = a2 / (d (1 + U³)),
        // so the steepest dU/dind is where dind/dU = d (1 + V³) + 3 d U V² V'(U), V' = -3 a2 U² / (d (1 + U³)²), is
        // smallest; found here by golden-section search (a1 = 0.5, a2 = 1, d = 2: the start values). Tolerance 1e-5
        // relative: the steepest-response point is located with inner differences (see continuation.Thresholds).
        java.util.function.DoubleUnaryOperator slope = u -> {
            double v = 1 / (2 * (1 + u * u * u));
            double dv = -3 * u * u / (2 * (1 + u * u * u) * (1 + u * u * u));
            return 2 * (1 + v * v * v) + 6 * u * v * v * dv;
        };
        double lo = 0.1;
        double hi = 3.0;
        double g = (Math.sqrt(5) - 1) / 2;
        for (int it = 0; it < 200; it++) {
            double a = hi - g * (hi - lo);
            double b = lo + g * (hi - lo);
            if (slope.applyAsDouble(a) < slope.applyAsDouble(b)) {
                hi = b;
            } else {
                lo = a;
            }
        }
        double u = 0.5 * (lo + hi);
        double v = 1 / (2 * (1 + u * u * u));
        double expected = 2 * u * (1 + v * v * v) - 0.5;
        assertEquals(expected, sw.get(0).get("model").asDouble(), 1e-5 * expected);
        // at the start values (a1 0.5, a2 1, d 2) the toggle is monostable: both thresholds are the single
        // branch's steepest response, the same value
        List<String> lines = o.toString().lines().filter(l -> l.startsWith("switch-")).toList();
        assertEquals(2, lines.size(), o.toString());
        assertTrue(lines.get(0).contains("(steepest response)") && lines.get(1).contains("(steepest response)"),
                o.toString());
        assertEquals(lines.get(0).split(" model ")[1].split(" ")[0], lines.get(1).split(" model ")[1].split(" ")[0]);
    }

    @Test
    void fitReportsTheModelThresholdsBesideTheMeasuredOnes() throws Exception {
        Path yaml = Path.of(FitCheckCommandTest.class.getResource("/org/switchfit/cli/toggle/problem.yaml").toURI());
        Path out = dir.resolve("toggle");
        StringWriter o = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(0, run(o, err, "fit", yaml.toString(), "--starts", "3", "--seed", "1", "--threads", "1",
                "--quiet", "--out", out.toString()), err.toString());
        assertEquals(3, o.toString().lines().filter(l -> l.matches("  (a1|a2|d) +[0-9.e+-]+")).count(),
                "one line per fitted parameter: " + o);
        List<String> printed = o.toString().lines().filter(l -> l.startsWith("switch-")).toList();
        assertEquals(2, printed.size(), o.toString());
        assertTrue(printed.get(0).startsWith("switch-on threshold of ind in rest: model "), printed.get(0));
        assertTrue(printed.get(0).contains("(fold), measured 9.70000 +- 0.300"), printed.get(0));
        assertTrue(printed.get(1).startsWith("switch-off threshold of ind in rest: model "), printed.get(1));
        List<String> csv = Files.readAllLines(out.resolve("switching_residuals.csv"));
        assertEquals("data,experiment,control,direction,observable,dose,measurement,model,sigma,residual,note",
                csv.get(0));
        assertEquals(3, csv.size(), String.join("\n", csv));
        for (String line : csv.subList(1, 3)) {
            String[] f = line.split(",", -1);
            assertEquals("threshold", f[0]);
            assertEquals("fold", f[10]);
            double meas = Double.parseDouble(f[6]);
            double model = Double.parseDouble(f[7]);
            double sigma = Double.parseDouble(f[8]);
            // the fitted thresholds lie within 2 sigma of the measured ones (both are consistent with the data)
            assertTrue(Math.abs(meas - model) < 2 * sigma, line);
            assertEquals((meas - model) / sigma, Double.parseDouble(f[9]), 1e-12);
        }
        // the fit directory as the model of branches: model_fitted.xml traced, branches.json written into the
        // folder with the measured thresholds attached to the folds of their direction
        StringWriter bo = new StringWriter();
        assertEquals(0, run(bo, err, "branches", out.toString(), "--vary", "ind", "--from", "0", "--to", "20",
                "--quiet"), err.toString());
        JsonNode br = read(out.resolve("branches.json"));
        assertEquals(2, br.get("thresholds").size(), bo.toString());
        for (JsonNode t : br.get("thresholds")) {
            String fold = t.get("fold").asText();
            JsonNode special = null;
            for (JsonNode f : br.get("folds")) {
                special = f.get("id").asText().equals(fold) ? f : special;
            }
            // the traced fold is the fitted model's threshold (switching_residuals.csv), up to the fold refinement
            double model = Double.parseDouble(csv.get(t.get("direction").asText().equals("up") ? 1 : 2)
                    .split(",")[7]);
            assertEquals(model, special.get("value").asDouble(), 1e-8 * model, t.toString());
        }
        assertEquals(0, run(bo, err, "region", out.toString(), "--vary", "ind", "--from", "0", "--to", "20",
                "--and", "a2", "--from2", "1", "--to2", "6", "--quiet"), err.toString());
        assertTrue(Files.isRegularFile(out.resolve("region.json")));
        Path empty = Files.createDirectories(dir.resolve("empty"));
        StringWriter ee = new StringWriter();
        assertEquals(Main.EXIT_USER_ERROR, run(bo, ee, "branches", empty.toString(), "--vary", "ind", "--from",
                "0", "--to", "20"));
        assertTrue(ee.toString().contains("without model_fitted.xml"), ee.toString());
        // a folder with the fitted model but no readable result.json: the branch is still written, with a warning
        Files.copy(out.resolve("model_fitted.xml"), empty.resolve("model_fitted.xml"));
        ee = new StringWriter();
        assertEquals(0, run(bo, ee, "branches", empty.toString(), "--vary", "ind", "--from", "0", "--to", "20",
                "--quiet"), ee.toString());
        assertTrue(ee.toString().startsWith("warning: measured thresholds not attached"), ee.toString());
        assertEquals(0, read(empty.resolve("branches.json")).get("thresholds").size());
    }

    private static JsonNode read(Path p) throws IOException {
        return new ObjectMapper().readTree(p.toFile());
    }

    /**
     * An invented phosphorylation cycle with positive feedback (cycle.xml: conserved total X + Xp = 1, compartment
     * of size 2, the feedback in an assignment rule, a local rate constant). On its steady states
     * s(x) = x/(1-x) - kf x^2/(K^2+x^2) with x = Xp, so the folds are the stationary points of s(x) and the cusp in
     * (s, kf) is where s'(x) = s''(x) = 0. Reference values computed with sympy (nroots and nsolve at 30 digits):
     * at kf = 0.8, K = 0.3 the folds lie at s = 0.034030219477663255 and 0.0022752285939395080; the cusp at
     * s = 0.047595083314170279, kf = 0.64414997657352784.
     */
    @Test
    void switchOfAnInventedCycleMatchesItsClosedFormAndItsThresholdsAloneGiveBackTheParameters() throws Exception {
        Path model = Path.of(FitCheckCommandTest.class.getResource("/org/switchfit/cli/cycle/cycle.xml").toURI());
        StringWriter o = new StringWriter();
        StringWriter err = new StringWriter();
        Path bj = dir.resolve("cycle-branches.json");
        assertEquals(0, run(o, err, "branches", model.toString(), "--vary", "s", "--from", "0", "--to", "0.1",
                "--quiet", "--json", bj.toString()), err.toString());
        JsonNode folds = read(bj).get("folds");
        assertEquals(2, folds.size(), o.toString());
        double[] expected = {0.034030219477663255, 0.0022752285939395080};
        for (int k = 0; k < 2; k++) {
            // 1e-10 relative: folds are refined by Newton on the fold system to rounding (the continuation's
            // corrector tolerance is 1e-10; measured agreement 1e-15)
            assertEquals(expected[k], folds.get(k).get("value").asDouble(), 1e-10 * expected[k]);
        }
        Path rj = dir.resolve("cycle-region.json");
        assertEquals(0, run(o, err, "region", model.toString(), "--vary", "s", "--from", "0", "--to", "0.1",
                "--and", "kf", "--from2", "0.3", "--to2", "2", "--quiet", "--json", rj.toString()), err.toString());
        JsonNode cusps = read(rj).get("cusps");
        assertEquals(1, cusps.size(), o.toString());
        assertEquals(0.047595083314170279, cusps.get(0).get("p1").asDouble(), 1e-9);
        assertEquals(0.64414997657352784, cusps.get(0).get("p2").asDouble(), 1e-9);

        // The two thresholds alone, at sigma 0.001: two data for two parameters, so the optimum reproduces them
        // exactly and the NLL is the Gaussian constant 2 (0.5 log 2 pi + log 0.001).
        Path yaml = Path.of(FitCheckCommandTest.class.getResource("/org/switchfit/cli/cycle/thresholds.yaml")
                .toURI());
        Path out = dir.resolve("cycle-fit");
        assertEquals(0, run(o, err, "fit", yaml.toString(), "--starts", "8", "--seed", "1", "--threads", "1",
                "--quiet", "--out", out.toString()), err.toString());
        JsonNode r = read(out.resolve("result.json"));
        assertEquals(2 * (0.5 * Math.log(2 * Math.PI) + Math.log(0.001)), r.get("bestNll").asDouble(), 1e-9);
        // measured error 3e-15 (the residuals are zero at the optimum, so Gauss-Newton converges quadratically);
        // 1e-6 leaves the stopping tests room without admitting a wrong optimum (the others lie decades away)
        assertEquals(0.8, r.get("parameters").get("kf").asDouble(), 1e-6);
        assertEquals(0.3, r.get("parameters").get("K").asDouble(), 1e-6);
    }
}
