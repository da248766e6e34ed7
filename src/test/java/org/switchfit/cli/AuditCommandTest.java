package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.BeforeAll;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.report.Json;
import org.switchfit.testsystems.PetabFiles;

/**
 * The audit command on small fit directories produced here: the decay problem of {@link PetabFiles#writeDecay}
 * (X' = -k X, log-normal noise of known σ = 0.1), fitted, profiled (parameters and one prediction), then audited;
 * then the same after editing one data value, and after moving the recorded optimum.
 *
 * <p>What must happen follows from the definitions, no outside number is needed: an unchanged directory makes
 * every claim hold (the NLL is recomputed by the same deterministic code, so the difference is 0; the fit stopped
 * by its cost or gradient rule, which bounds the scaled gradient, see FitAudit.gradientTolerance); an edited data
 * value changes the file's SHA-256 and the NLL at the optimum (that residual changes by Δln m / σ = ln(1.45/1.2)
 * / 0.1 ≈ 1.9, so the NLL by far more than 1e-8 relative); moving k by 0.05 (several standard errors; SE(k) ≈ 0.016
 * for these data) changes the NLL and leaves a gradient of order 1 in Moré's scaled measure.
 */
class AuditCommandTest {
    private static final double[] T = {0, 1, 2, 3, 4, 6};
    private static final double[] M = {2.1, 1.45, 1.12, 0.78, 0.6, 0.33};
    private static final double SIGMA = 0.1;

    @TempDir
    static Path dir;

    private static Path fitDir;

    @BeforeAll
    static void fitAndProfile() {
        fitDir = fit("ok");
        ProfileCommandTest.Result p = ProfileCommandTest.run("profile", fitDir.toString(), "--predict", "obs@5",
                "--threads", "2");
        assertEquals(0, p.code(), p.err());
    }

    private static Path fit(String name) {
        Path yaml = PetabFiles.writeDecay(dir.resolve(name).resolve("problem"), M, T, SIGMA);
        Path out = dir.resolve(name).resolve("fit");
        ProfileCommandTest.Result f = ProfileCommandTest.run("fit", yaml.toString(), "--out", out.toString(),
                "--starts", "3", "--threads", "1", "--rtol", "1e-10", "--atol", "1e-14", "--quiet");
        assertEquals(0, f.code(), f.err());
        return out;
    }

    private static List<String> lines(String out, String prefix) {
        return out.lines().filter(l -> l.startsWith(prefix)).toList();
    }

    @Test
    void everyClaimHoldsOnAnUntouchedFit() throws IOException {
        Path json = dir.resolve("ok").resolve("audit.json");
        ProfileCommandTest.Result a = ProfileCommandTest.run("audit", fitDir.toString(), "--starts", "3", "--threads",
                "2", "--json", json.toString());
        assertEquals(0, a.code(), a.out() + a.err());
        assertTrue(lines(a.out(), "fails").isEmpty(), a.out());
        // 4 inputs (yaml, parameters, conditions, observables, measurements, model: counted from the files), nll,
        // optimality, fresh starts, and 2 ends for each of 3 profiles (k, x0, obs@5).
        assertEquals(1, lines(a.out(), "holds  nll:").size(), a.out());
        assertEquals(1, lines(a.out(), "holds  optimality:").size(), a.out());
        assertEquals(1, lines(a.out(), "holds  fresh starts:").size(), a.out());
        assertEquals(6, lines(a.out(), "holds  profile ").size(), a.out());
        assertTrue(lines(a.out(), "holds  input ").size() >= 5, a.out());
        JsonNode j = Json.mapper().readTree(json.toFile());
        assertTrue(j.get("allHold").asBoolean());
        assertEquals(lines(a.out(), "holds").size(), j.get("claims").size());
        assertTrue(j.get("claims").get(0).get("holds").asBoolean());
    }

    @Test
    void editedDataValueFailsTheHashAndTheNll() throws IOException {
        Path fit = fit("edited");
        Path data = dir.resolve("edited").resolve("problem").resolve("measurements.tsv");
        String s = Files.readString(data);
        Files.writeString(data, s.replace("obs\tc0\t1.45\t", "obs\tc0\t1.2\t"));
        ProfileCommandTest.Result a = ProfileCommandTest.run("audit", fit.toString(), "--starts", "2", "--threads",
                "1");
        assertEquals(1, a.code(), a.out() + a.err());
        List<String> failed = lines(a.out(), "fails");
        assertTrue(failed.stream().anyMatch(l -> l.startsWith("fails  input ") && l.contains("measurements.tsv")
                && l.contains("changed since the fit")), a.out());
        assertTrue(failed.stream().anyMatch(l -> l.startsWith("fails  nll:")), a.out());
        assertTrue(lines(a.out(), "holds  input ").size() >= 4, "the other input files still match: " + a.out());
    }

    @Test
    void alteredOptimumFailsTheNllAndOptimality() throws IOException {
        Path fit = fit("moved");
        Path result = fit.resolve("result.json");
        ObjectNode root = (ObjectNode) Json.mapper().readTree(result.toFile());
        ObjectNode est = (ObjectNode) root.get("parametersEstimationScale");
        est.put("k", est.get("k").asDouble() + 0.05);
        Files.writeString(result, Json.mapper().writeValueAsString(root));
        ProfileCommandTest.Result a = ProfileCommandTest.run("audit", fit.toString(), "--starts", "2", "--threads",
                "1");
        assertEquals(1, a.code(), a.out() + a.err());
        assertTrue(lines(a.out(), "fails  nll:").size() == 1, a.out());
        assertTrue(lines(a.out(), "fails  optimality:").size() == 1, a.out());
        assertFalse(a.out().contains("fails  input"), "the inputs are unchanged: " + a.out());
    }

    @Test
    void missingDirectoryIsAUserError() {
        ProfileCommandTest.Result a = ProfileCommandTest.run("audit", dir.resolve("nowhere").toString());
        assertEquals(2, a.code());
        assertTrue(a.err().contains("nowhere") && a.err().contains("not a fit directory"), a.err());
    }

    @Test
    void theFitSeedIsRejected() {
        ProfileCommandTest.Result a = ProfileCommandTest.run("audit", fitDir.toString(), "--seed", "1");
        assertEquals(2, a.code(), a.out() + a.err());
        assertTrue(a.err().contains("--seed 1 is the seed of the fit itself"), a.err());
    }
}
