package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import com.fasterxml.jackson.databind.JsonNode;
import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.continuation.BistableRegion;
import org.switchfit.report.Json;

/**
 * {@code switchfit demo --quick} end to end in a temporary folder: every output of the stages in this build exists,
 * and the continuation results at the true parameters match the independent sympy folds.
 */
class DemoRunTest {
    // datasets/stress_switch-generator-notes.md (sympy nsolve, 30 digits; see DemoScenarioTest).
    private static final double FOLD_ON = 2.0675533425302829702;
    private static final double FOLD_OFF = 0.82548611445015955433;
    // Branch folds are refined by Newton on the extended system at tolerance 1e-11 (ContinuationSettings.of);
    // 1e-8 relative leaves three orders of margin.
    private static final double REL_TOL_FOLD = 1e-8;

    @Test
    void quickDemoWritesEveryAvailableStage(@TempDir Path tmp) throws IOException {
        Path out = tmp.resolve("demo");
        StringWriter o = new StringWriter();
        StringWriter e = new StringWriter();
        int code = Main.execute(new String[] {"demo", "--quick", "--out", out.toString(), "--threads", "1"},
                new PrintWriter(o, true), new PrintWriter(e, true));
        assertEquals(0, code, o + "\n" + e);
        assertTrue(o.toString().contains("report: " + out.resolve("report.html").toAbsolutePath().normalize()),
                o.toString());

        JsonNode stages = Json.mapper().readTree(out.resolve("stages.json").toFile()).get("stages");
        Map<String, String> status = new LinkedHashMap<>();
        for (JsonNode s : stages) {
            status.put(s.get("name").asText(), s.get("status").asText());
        }
        assertEquals(7, status.size(), status.toString());
        for (String done : new String[] {"data", "branches", "region", "sweep", "report"}) {
            assertEquals("DONE", status.get(done), done + ": " + status);
        }
        // The fit and profile stages need the likelihood objective, which this build lacks; they must say so
        // rather than produce anything. When they are wired up, this test must gain the check that the true
        // values of the identifiable parameters lie inside their profile intervals.
        assertEquals("NOT_AVAILABLE", status.get("fit"));
        assertEquals("NOT_AVAILABLE", status.get("profiles"));
        assertTrue(o.toString().contains("not available in this build"), o.toString());
        assertFalse(Files.exists(out.resolve("result.json")), "no fit result without a fit stage");

        // Continuation at the true values finds the two folds of the independent sympy computation.
        JsonNode folds = Json.mapper().readTree(out.resolve("branches.json").toFile()).get("folds");
        assertEquals(2, folds.size());
        double on = Math.max(folds.get(0).get("stimulus").asDouble(), folds.get(1).get("stimulus").asDouble());
        double off = Math.min(folds.get(0).get("stimulus").asDouble(), folds.get(1).get("stimulus").asDouble());
        assertEquals(FOLD_ON, on, REL_TOL_FOLD * FOLD_ON);
        assertEquals(FOLD_OFF, off, REL_TOL_FOLD * FOLD_OFF);

        // The bistable region at the true k_rec = 1 contains the bistable stimulus range between the folds and
        // not the monostable ones (closed form of the definition: two folds bracket the bistable range).
        JsonNode region = Json.mapper().readTree(out.resolve("region.json").toFile());
        JsonNode poly = region.get("polygon");
        assertTrue(poly.size() > 10);
        double[][] v = new double[poly.size()][];
        for (int i = 0; i < v.length; i++) {
            v[i] = new double[] {poly.get(i).get(0).asDouble(), poly.get(i).get(1).asDouble()};
        }
        BistableRegion r = new BistableRegion(v, List.of(), false);
        assertTrue(r.contains(0.5 * (FOLD_ON + FOLD_OFF), 1.0));
        assertFalse(r.contains(0.5 * FOLD_OFF, 1.0));
        assertFalse(r.contains(1.2 * FOLD_ON, 1.0));

        // A finite ramp lags behind the quasi-static folds (Haberman 1979, cited in HysteresisSweep): the upward
        // jump comes after the switch-on fold and the downward one before the switch-off fold.
        JsonNode sweep = Json.mapper().readTree(out.resolve("sweep.json").toFile());
        assertTrue(sweep.get("up").get("jump").asDouble() > FOLD_ON, sweep.get("up").get("jump").toString());
        assertTrue(sweep.get("down").get("jump").asDouble() < FOLD_OFF, sweep.get("down").get("jump").toString());

        String html = Files.readString(out.resolve("report.html"), StandardCharsets.UTF_8);
        assertTrue(html.contains("SYNTHETIC"));
        assertTrue(html.contains("not available in this build"));
        assertTrue(html.contains("<svg"));
    }
}
