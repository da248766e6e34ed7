package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import java.util.TreeMap;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** JSON conventions (non-finite as null, key order, exact round trip) and CSV formatting. */
class JsonCsvTest {

    /** A result-like value: field order deliberately not alphabetical. */
    record Sample(String zeta, double alpha, double[] mid, Double boxed, float small, Map<String, Double> map) {
    }

    @Test
    void writesNonFiniteAsNullWithSortedKeys() {
        Map<String, Double> m = new TreeMap<>(Map.of("b", 1.5, "a", Double.NEGATIVE_INFINITY));
        String json = Json.toJson(new Sample("z", Double.NaN, new double[] {1, Double.POSITIVE_INFINITY, -0.0},
                Double.NaN, Float.NaN, m));
        // Expected text written by hand from the documented conventions: alphabetical keys, two-space indent,
        // "\n" line ends, arrays on one line, non-finite -> null.
        String expected = "{\n"
                + "  \"alpha\" : null,\n"
                + "  \"boxed\" : null,\n"
                + "  \"map\" : {\n"
                + "    \"a\" : null,\n"
                + "    \"b\" : 1.5\n"
                + "  },\n"
                + "  \"mid\" : [ 1.0, null, -0.0 ],\n"
                + "  \"small\" : null,\n"
                + "  \"zeta\" : \"z\"\n"
                + "}\n";
        assertEquals(expected, json);
        assertFalse(json.contains("\r"));
    }

    @Test
    void readsNullBackAsNan(@TempDir Path dir) {
        Path f = dir.resolve("s.json");
        Json.write(f, new Sample("z", Double.NaN, new double[] {2, Double.NaN}, null, 1.25f, Map.of()));
        Sample s = Json.read(f, Sample.class);
        assertTrue(Double.isNaN(s.alpha()));
        assertEquals(2, s.mid()[0]);
        assertTrue(Double.isNaN(s.mid()[1]));
        assertNull(s.boxed(), "boxed Double: null stays null (documented)");
        assertEquals(1.25f, s.small());
    }

    @Test
    void acceptsNonStandardNonFiniteTokensFromOtherTools() throws Exception {
        // Python's json module writes NaN, Infinity and -Infinity as bare tokens (common practice, not RFC 8259).
        double[] v = Json.mapper().readValue("[NaN, Infinity, -Infinity, 1]", double[].class);
        assertTrue(Double.isNaN(v[0]));
        assertEquals(Double.POSITIVE_INFINITY, v[1]);
        assertEquals(Double.NEGATIVE_INFINITY, v[2]);
        assertEquals(1, v[3]);
    }

    @Test
    void finiteDoublesRoundTripBitForBit() throws Exception {
        SplittableRandom rnd = new SplittableRandom(31);
        double[] v = new double[2000];
        for (int i = 0; i < v.length; i++) {
            v[i] = Double.longBitsToDouble(rnd.nextLong());
            if (!Double.isFinite(v[i])) {
                v[i] = rnd.nextGaussian();
            }
        }
        v[0] = Double.MIN_VALUE;
        v[1] = Double.MAX_VALUE;
        v[2] = -0.0;
        v[3] = 0.1;
        String json = Json.toJson(v);
        double[] back = Json.mapper().readValue(json, double[].class);
        for (int i = 0; i < v.length; i++) {
            assertEquals(Double.doubleToRawLongBits(v[i]), Double.doubleToRawLongBits(back[i]), "index " + i);
        }
    }

    @Test
    void unknownPropertiesAndBadFilesFailWithLocation(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("bad.json");
        Files.writeString(f, "{\n  \"alpha\" : 1,\n  \"surprise\" : 2\n}\n");
        Json.JsonReadException e = assertThrows(Json.JsonReadException.class, () -> Json.read(f, Sample.class));
        // Jackson reports where it noticed the problem; for records that is the end of the object (line 4).
        assertTrue(e.getMessage().contains("bad.json, line ") && e.getMessage().contains("surprise"), e.getMessage());
        Files.writeString(f, "{ \"alpha\" : \"text\" }");
        assertThrows(Json.JsonReadException.class, () -> Json.read(f, Sample.class));
    }

    @Test
    void csvQuotesPerRfc4180() {
        // RFC 4180 section 2, rules 6 and 7: fields with commas, quotes or line breaks are enclosed in double
        // quotes, and a double quote inside is escaped by preceding it with another double quote.
        Csv c = new Csv("name", "value").row("plain", 1).row("a,b", "say \"hi\"").row("two\nlines", null)
                .row(" padded", Double.NaN);
        assertEquals("name,value\nplain,1\n\"a,b\",\"say \"\"hi\"\"\"\n\"two\nlines\",\n\" padded\",NaN\n",
                c.toString());
        assertThrows(IllegalArgumentException.class, () -> c.row("x"));
    }

    @Test
    void csvNumbersRoundTrip(@TempDir Path dir) throws Exception {
        SplittableRandom rnd = new SplittableRandom(5);
        double[] t = new double[500];
        double[] y = new double[500];
        for (int i = 0; i < t.length; i++) {
            t[i] = rnd.nextDouble() * 1e3;
            y[i] = Math.exp(rnd.nextGaussian() * 50);
        }
        y[7] = Double.POSITIVE_INFINITY;
        y[8] = Double.NEGATIVE_INFINITY;
        y[9] = Double.NaN;
        Path f = dir.resolve("out/table.csv");
        Csv.ofColumns(List.of("t", "y"), t, y).write(f);
        List<String> lines = Files.readAllLines(f);
        assertEquals("t,y", lines.get(0));
        assertEquals(501, lines.size());
        for (int i = 0; i < t.length; i++) {
            String[] parts = lines.get(i + 1).split(",");
            assertEquals(Double.doubleToRawLongBits(t[i]), Double.doubleToRawLongBits(Double.parseDouble(parts[0])));
            assertEquals(Double.doubleToRawLongBits(y[i]), Double.doubleToRawLongBits(Double.parseDouble(parts[1])));
        }
        assertEquals("Infinity", lines.get(8).split(",")[1]);
        try (var s = Files.list(f.getParent())) {
            assertEquals(1, s.count(), "no temporary files left");
        }
        assertThrows(IllegalArgumentException.class, () -> Csv.ofColumns(List.of("a", "b"), new double[1],
                new double[2]));
        assertArrayEquals(new String[] {"t", "y"}, lines.get(0).split(","));
    }
}
