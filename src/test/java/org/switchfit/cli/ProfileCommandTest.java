package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.stream.Stream;
import org.hipparchus.distribution.continuous.ChiSquaredDistribution;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.report.FitDirectory;
import org.switchfit.report.FitFile;
import org.switchfit.report.Json;
import org.switchfit.report.ProfilesFile;
import org.switchfit.testsystems.PetabFiles;

/**
 * The profile command end to end on a problem whose profiles are known in closed form.
 *
 * <p>Problem (written here as PEtab files): X' = -k X, X(0) = x0, observable X with log-normal noise of known
 * σ = 0.1, so ln m_i = a - k t_i + e_i with a = ln x0: ordinary linear regression of ln m on t. Derived by hand:
 * the NLL is quadratic in (a, k) with Hessian XᵀX/σ², X = [1, -t_i], so every profile of a linear combination
 * c = u·a + v·k is exactly quadratic: Δχ²(c) = (c - ĉ)² / (σ² wᵀ(XᵀX)⁻¹w), w = (u, v). Hence the interval at
 * threshold q is ĉ ± σ sqrt(q · wᵀ(XᵀX)⁻¹w) with
 * (XᵀX)⁻¹ quadratic forms: k: 1/S_tt; a: 1/n + t̄²/S_tt; a - k t*: 1/n + (t* - t̄)²/S_tt (S_tt = Σ(t_i - t̄)²).
 * The prediction y(t*) = x0 e^{-k t*} = exp(a - k t*) is monotone in a - k t*, so its profile interval is exp of
 * that interval: the profile of the reparameterised model with B = y(t*) as parameter (no delta method).
 * q = χ²₁(0.95) pointwise and χ²₂(0.95) simultaneous, computed with Hipparchus (common practice).
 *
 * <p>Tolerance {@link #TOL} = 1e-6 relative: the objective is integrated at rtol 1e-10 / atol 1e-14, so ln X
 * carries errors of about 1e-9 (global error can exceed the local tolerance by one to two orders, common practice),
 * which moves residuals by 1e-8 (÷ σ) and the interval ends by the same relative order; the LM optimum and the
 * crossing refinement (secant to 1e-12) add less. Measured: largest relative error 7.3e-9 (the prediction
 * estimate), interval ends ≤ 4.6e-10, so 1e-6 leaves a margin above 100.
 */
class ProfileCommandTest {
    private static final double[] T = {0, 1, 2, 3, 4, 6};
    private static final double[] M = {2.1, 1.45, 1.12, 0.78, 0.6, 0.33};
    private static final double SIGMA = 0.1;
    private static final double T_STAR = 5.0;
    private static final double TOL = 1e-6;

    @TempDir
    static Path dir;

    private static Path fitDir;
    private static Result profileRun;

    record Result(int code, String out, String err) {
    }

    static Result run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.execute(args, new PrintWriter(out, true), new PrintWriter(err, true));
        return new Result(code, out.toString(), err.toString());
    }

    @BeforeAll
    static void fitAndProfile() throws IOException {
        Path yaml = PetabFiles.writeDecay(dir.resolve("problem"), M, T, SIGMA);
        fitDir = dir.resolve("fit");
        Result f = run("fit", yaml.toString(), "--out", fitDir.toString(), "--starts", "3", "--threads", "1",
                "--rtol", "1e-10", "--atol", "1e-14", "--quiet");
        assertEquals(0, f.code(), f.err());
        profileRun = run("profile", fitDir.toString(), "--predict", "obs@" + T_STAR, "--threads", "2");
        assertEquals(0, profileRun.code(), profileRun.err());
    }

    /** Closed-form regression quantities of ln m on t. */
    private static final class Regression {
        final int n = T.length;
        double tb;
        double stt;
        double a;
        double k;

        Regression() {
            double yb = 0;
            for (int i = 0; i < n; i++) {
                tb += T[i] / n;
                yb += Math.log(M[i]) / n;
            }
            double sty = 0;
            for (int i = 0; i < n; i++) {
                stt += (T[i] - tb) * (T[i] - tb);
                sty += (T[i] - tb) * (Math.log(M[i]) - yb);
            }
            k = -sty / stt;
            a = yb + k * tb;
        }
    }

    private static JsonNode profiles() throws IOException {
        return Json.mapper().readTree(fitDir.resolve("profiles.json").toFile());
    }

    private static JsonNode entry(JsonNode root, String id) {
        for (JsonNode e : root.get("profiles")) {
            if (e.get("id").asText().equals(id)) {
                return e;
            }
        }
        throw new AssertionError("no profile " + id);
    }

    private static void assertRel(double expected, JsonNode actual, String what) {
        assertNotNull(actual, what);
        assertFalse(actual.isNull(), what + " is open");
        assertEquals(expected, actual.asDouble(), TOL * Math.abs(expected), what);
    }

    @Test
    void parameterIntervalsEqualClosedForm() throws IOException {
        Regression g = new Regression();
        double q1 = new ChiSquaredDistribution(1).inverseCumulativeProbability(0.95);
        double q2 = new ChiSquaredDistribution(2).inverseCumulativeProbability(0.95);
        JsonNode root = profiles();
        assertEquals(0.95, root.get("level").asDouble());
        assertEquals(q1, root.get("thresholds").get("pointwise").asDouble(), 1e-12);
        assertEquals(q2, root.get("thresholds").get("simultaneous").asDouble(), 1e-12);
        JsonNode k = entry(root, "k");
        double hk = SIGMA * Math.sqrt(q1 / g.stt);
        double hk2 = SIGMA * Math.sqrt(q2 / g.stt);
        assertEquals("parameter", k.get("kind").asText());
        assertRel(g.k, k.get("estimate"), "k estimate");
        assertRel(g.k - hk, k.get("lower"), "k lower");
        assertRel(g.k + hk, k.get("upper"), "k upper");
        assertRel(g.k - hk2, k.get("lowerSimultaneous"), "k lower simultaneous");
        assertRel(g.k + hk2, k.get("upperSimultaneous"), "k upper simultaneous");
        assertEquals("identifiable", k.get("class").asText());
        JsonNode x0 = entry(root, "x0");
        double ha = SIGMA * Math.sqrt(q1 * (1.0 / g.n + g.tb * g.tb / g.stt));
        assertRel(Math.exp(g.a), x0.get("estimate"), "x0 estimate");
        assertRel(Math.exp(g.a - ha), x0.get("lower"), "x0 lower (linear scale)");
        assertRel(Math.exp(g.a + ha), x0.get("upper"), "x0 upper (linear scale)");
        assertEquals("log10", x0.get("scale").asText());
        // the profile of k moves x0 along: a(k) = ȳ + k t̄, so x0 compensates
        assertEquals("x0", k.get("compensating").get(0).asText());
        assertFalse(root.get("betterOptimumFound").asBoolean());
        assertEquals(2, root.get("rankCheck").get("atOptimum").get("rank").asInt());
        for (JsonNode p : k.get("points")) {
            assertTrue(p.has("value") && p.has("nll"));
        }
    }

    @Test
    void reportSchemaReadsTheFile() {
        ProfilesFile f = FitDirectory.of(fitDir).read(FitFile.PROFILES);
        assertEquals(3, f.profiles().size());
        assertEquals(ProfilesFile.Kind.PREDICTION, f.profiles().get(2).kind());
        assertEquals(ProfilesFile.Identifiability.IDENTIFIABLE, f.profiles().get(0).classification());
        assertNotNull(f.rankCheck().atOptimum());
        assertEquals(ProfileCommand.RANK_POINTS, f.rankCheck().random().size());
        assertEquals("pinned", f.profiles().get(2).bounds());
    }

    @Test
    void observablePredictionIntervalEqualsReparameterisedProfile() throws IOException {
        Regression g = new Regression();
        double q1 = new ChiSquaredDistribution(1).inverseCumulativeProbability(0.95);
        JsonNode e = entry(profiles(), "obs@" + T_STAR);
        assertEquals("prediction", e.get("kind").asText());
        double c = g.a - g.k * T_STAR;
        double h = SIGMA * Math.sqrt(q1 * (1.0 / g.n + (T_STAR - g.tb) * (T_STAR - g.tb) / g.stt));
        assertRel(Math.exp(c), e.get("estimate"), "y(t*)");
        assertRel(Math.exp(c - h), e.get("lower"), "y(t*) lower");
        assertRel(Math.exp(c + h), e.get("upper"), "y(t*) upper");
        assertEquals("pinned", e.get("bounds").asText());
    }

    @Test
    void resumeAfterDeletingProfilesJsonGivesIdenticalOutput() throws IOException {
        byte[] before = Files.readAllBytes(fitDir.resolve("profiles.json"));
        List<Path> csvs;
        try (Stream<Path> s = Files.list(fitDir.resolve("profiles"))) {
            csvs = s.filter(p -> p.toString().endsWith(".csv")).sorted().toList();
        }
        assertEquals(3, csvs.size());
        byte[] csvBefore = Files.readAllBytes(csvs.get(0));
        Files.delete(fitDir.resolve("profiles.json"));
        Files.delete(csvs.get(0));
        Result again = run("profile", fitDir.toString(), "--predict", "obs@" + T_STAR, "--resume", "--threads", "1");
        assertEquals(0, again.code(), again.err());
        assertFalse(again.err().contains("finished"), "nothing should be recomputed: " + again.err());
        assertEquals(new String(before), Files.readString(fitDir.resolve("profiles.json")));
        assertEquals(new String(csvBefore), Files.readString(csvs.get(0)));
    }

    @Test
    void storedProfilesOfAnotherOptimumAreNotResumed() throws IOException {
        // a refit (here: the recorded optimum moved) must not reuse the profiles of the old optimum
        Path d = copyFit("moved", 0.0);
        Result first = run("profile", d.toString(), "--parameters", "k", "--threads", "1");
        assertEquals(0, first.code(), first.err());
        Path moved = copyFit("moved-again", 1e-3);
        copyTree(d.resolve("profiles"), moved.resolve("profiles"));
        Files.copy(d.resolve("profiles-run.json"), moved.resolve("profiles-run.json"));
        Result r = run("profile", moved.toString(), "--parameters", "k", "--resume");
        assertEquals(2, r.code(), r.err());
        // the moved optimum also changes the NLL, which the command warns about before refusing
        String last = r.err().strip().lines().reduce((a, b) -> b).orElse("");
        assertTrue(last.startsWith("error: ") && last.contains("holds results computed with optimum"), r.err());
    }

    /**
     * A resumed run asking for other profiles keeps the earlier ones of the same optimum in profiles.json (in the
     * fit's parameter order, unchanged), and leaves out with a warning those of another confidence level.
     */
    @Test
    void resumeWithOtherProfilesKeepsTheEarlierOnes() throws IOException {
        Path d = copyFit("partial", 0.0);
        Result first = run("profile", d.toString(), "--parameters", "k", "--threads", "1");
        assertEquals(0, first.code(), first.err());
        JsonNode k = entry(Json.mapper().readTree(d.resolve("profiles.json").toFile()), "k");
        Result second = run("profile", d.toString(), "--parameters", "x0", "--resume", "--threads", "1");
        assertEquals(0, second.code(), second.err());
        JsonNode both = Json.mapper().readTree(d.resolve("profiles.json").toFile());
        List<String> ids = new java.util.ArrayList<>();
        both.get("profiles").forEach(e -> ids.add(e.get("id").asText()));
        List<String> fitOrder = new java.util.ArrayList<>();
        Json.mapper().readTree(d.resolve("result.json").toFile()).get("parametersEstimationScale").fieldNames()
                .forEachRemaining(fitOrder::add);
        assertEquals(fitOrder, ids, "both parameters, in the fit's order");
        assertEquals(k, entry(both, "k"), "the earlier profile, as it was");
        Path d2 = copyFit("partial-levels", 0.0);
        assertEquals(0, run("profile", d2.toString(), "--parameters", "k", "--threads", "1").code());
        Result other = run("profile", d2.toString(), "--parameters", "x0", "--resume", "--level", "0.9",
                "--threads", "1");
        assertEquals(0, other.code(), other.err());
        assertTrue(other.err().contains("was computed at level 0.95, not 0.9; not included in profiles.json"),
                other.err());
        JsonNode p = Json.mapper().readTree(d2.resolve("profiles.json").toFile()).get("profiles");
        assertEquals(1, p.size(), p.toString());
        assertEquals("x0", p.get(0).get("id").asText());
    }

    private static void copyTree(Path from, Path to) throws IOException {
        Files.createDirectories(to);
        try (Stream<Path> s = Files.list(from)) {
            for (Path f : s.toList()) {
                Files.copy(f, to.resolve(f.getFileName()));
            }
        }
    }

    @Test
    void existingProfilesWithoutResumeIsUserError() {
        assertUserError(run("profile", fitDir.toString()), "profiles", "--resume");
    }

    @Test
    void badFitDirIsOneLineUserError() {
        assertUserError(run("profile", dir.resolve("nope").toString()), "nope", "switchfit fit");
        assertUserError(run("profile", dir.resolve("problem").toString()), "result.json", "switchfit fit");
    }

    @Test
    void repeatedParameterIdIsProfiledOnce() throws IOException {
        Path d = copyFit("repeated", 0.0);
        Result r = run("profile", d.toString(), "--parameters", "k,k", "--threads", "2");
        assertEquals(0, r.code(), r.err());
        long rows = r.out().lines().filter(l -> l.startsWith("parameter ")).count();
        assertEquals(1, rows, r.out());
        assertTrue(r.out().contains("1 profiles in") || r.out().contains("1 profile in"), r.out());
    }

    @Test
    void negativeThreadCountIsUserError() {
        assertUserError(run("profile", fitDir.toString(), "--resume", "--threads", "-1"), "--threads", "-1");
    }

    @Test
    void unknownPredictionObservableIsUserError() {
        assertUserError(run("profile", fitDir.toString(), "--resume", "--predict", "nosuch@1"), "nosuch",
                "observables: obs");
    }

    @Test
    void foldsWithoutThresholdsAreAOneLineUserError() throws IOException {
        // This build registers a FoldPredictionSource (objective.FoldPredictions); the decay problem has no
        // switching thresholds, so --folds is a user error (exit 2) rather than an empty or faked profile.
        Result r = run("profile", copyFit("nofolds", 0.0).toString(), "--folds");
        assertEquals(2, r.code(), r.err());
        assertTrue(r.err().contains("has no switching thresholds"), r.err());
        // the prediction profile that observablePredictionIntervalEqualsReparameterisedProfile reads
        Result p = run("profile", fitDir.toString(), "--resume", "--predict", "obs@" + T_STAR);
        assertEquals(0, p.code(), p.err());
    }

    /** A copy of the fit directory holding only result.json, optionally with θ_k shifted. */
    private static Path copyFit(String name, double shiftK) throws IOException {
        Path d = dir.resolve(name);
        Files.createDirectories(d);
        com.fasterxml.jackson.databind.node.ObjectNode root =
                (com.fasterxml.jackson.databind.node.ObjectNode) Json.mapper().readTree(
                        fitDir.resolve("result.json").toFile());
        com.fasterxml.jackson.databind.node.ObjectNode est =
                (com.fasterxml.jackson.databind.node.ObjectNode) root.get("parametersEstimationScale");
        est.put("k", est.get("k").asDouble() + shiftK);
        Json.write(d.resolve("result.json"), root);
        return d;
    }

    @Test
    void resultsDoNotDependOnTheThreadCount() throws IOException {
        Path d = copyFit("one-thread", 0.0);
        Result r = run("profile", d.toString(), "--parameters", "k", "--threads", "1");
        assertEquals(0, r.code(), r.err());
        // Compared node by node (JsonNode equality of doubles is exact): the first directory was profiled on two
        // threads together with x0 and the prediction.
        JsonNode a = profiles();
        JsonNode b = Json.mapper().readTree(d.resolve("profiles.json").toFile());
        assertEquals(entry(a, "k"), entry(b, "k"));
        assertEquals(a.get("rankCheck"), b.get("rankCheck"));
        assertEquals(a.get("bestNll"), b.get("bestNll"));
    }

    @Test
    void startingOffTheOptimumIsReportedLoudly() throws IOException {
        // k moved by 0.05 with x0 at its optimum: the first re-optimisation returns k to k̂ and lands below the
        // recorded NLL by 0.5 · 0.05² · S_tt / σ² ≈ 2.9 NLL units (derived by hand, S_tt = 23.33).
        Path d = copyFit("off-optimum", 0.05);
        Result r = run("profile", d.toString(), "--parameters", "x0", "--threads", "1");
        assertEquals(0, r.code(), r.err());
        assertTrue(r.err().contains("A BETTER OPTIMUM WAS FOUND"), r.err());
        JsonNode root = Json.mapper().readTree(d.resolve("profiles.json").toFile());
        assertTrue(root.get("betterOptimumFound").asBoolean());
        assertTrue(root.get("bestNllFound").asDouble() < root.get("bestNll").asDouble() - 1.0);
        JsonNode x0 = entry(root, "x0");
        assertTrue(x0.get("betterOptimumFound").asBoolean());
        // after the restart the interval is the closed-form one again
        Regression g = new Regression();
        double q1 = new ChiSquaredDistribution(1).inverseCumulativeProbability(0.95);
        double ha = SIGMA * Math.sqrt(q1 * (1.0 / g.n + g.tb * g.tb / g.stt));
        assertRel(Math.exp(g.a - ha), x0.get("lower"), "x0 lower after restart");
        assertRel(Math.exp(g.a + ha), x0.get("upper"), "x0 upper after restart");
    }

    static void assertUserError(Result r, String... fragments) {
        assertEquals(2, r.code(), "stderr: " + r.err());
        String err = r.err().strip();
        assertEquals(1, err.lines().count(), "one line expected, got: " + err);
        assertTrue(err.startsWith("error: "), err);
        for (String f : fragments) {
            assertTrue(err.contains(f), "expected '" + f + "' in: " + err);
        }
    }
}
