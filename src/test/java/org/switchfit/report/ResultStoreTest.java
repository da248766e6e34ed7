package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.util.UserInputException;

/** ResultStore: round trip, listing, resumption semantics, error messages. */
class ResultStoreTest {

    /** Shape of a finished fit start, as the fit package might report it. */
    record StartResult(int index, String status, double nll, double[] params, String message) {
    }

    @Test
    void roundTripAndListing(@TempDir Path dir) throws Exception {
        ResultStore store = new ResultStore(dir.resolve("starts"));
        assertEquals(List.of(), store.keys(), "missing directory = empty store");
        StartResult a = new StartResult(3, "converged", -12.5, new double[] {0.1, Double.NaN, 1e300}, null);
        StartResult b = new StartResult(11, "failed", Double.NaN, new double[0], "step size < 1e-12");
        store.put(ResultStore.indexKey("start", 11), b);
        store.put(ResultStore.indexKey("start", 3), a);
        // Stray files a killed writer or a user could leave: ignored.
        Files.writeString(dir.resolve("starts/.start-000004.json12345.tmp"), "{ trunc");
        Files.writeString(dir.resolve("starts/notes.txt"), "hello");
        assertEquals(List.of("start-000003", "start-000011"), store.keys());
        assertTrue(store.contains("start-000003"));
        assertFalse(store.contains("start-000004"));
        StartResult back = store.get("start-000003", StartResult.class).orElseThrow();
        assertEquals(a.index(), back.index());
        assertEquals(a.nll(), back.nll());
        assertArrayEquals(new double[] {0.1, Double.NaN, 1e300}, back.params());
        Map<String, StartResult> all = store.readAll(StartResult.class);
        assertEquals(List.of("start-000003", "start-000011"), new ArrayList<>(all.keySet()));
        assertTrue(Double.isNaN(all.get("start-000011").nll()));
        assertEquals("step size < 1e-12", all.get("start-000011").message());
        assertTrue(store.get("start-000099", StartResult.class).isEmpty());
        List<String> wanted = new ArrayList<>();
        for (int i = 0; i < 12; i++) {
            wanted.add(ResultStore.indexKey("start", i));
        }
        List<String> todo = store.missing(wanted);
        assertEquals(10, todo.size());
        assertFalse(todo.contains("start-000003") || todo.contains("start-000011"));
        assertEquals("start-000000", todo.get(0));
    }

    @Test
    void concurrentPutsWithDistinctKeysAllLand(@TempDir Path dir) throws Exception {
        ResultStore store = new ResultStore(dir);
        ExecutorService pool = Executors.newFixedThreadPool(4);
        try {
            List<Future<?>> fs = new ArrayList<>();
            for (int i = 0; i < 64; i++) {
                int k = i;
                fs.add(pool.submit(() -> store.put(ResultStore.indexKey("p", k),
                        new StartResult(k, "ok", k, new double[] {k}, null))));
            }
            for (Future<?> f : fs) {
                f.get();
            }
        } finally {
            pool.shutdown();
        }
        assertEquals(64, store.keys().size());
        try (Stream<Path> s = Files.list(dir)) {
            assertEquals(64, s.count(), "no temporary files left behind");
        }
        assertEquals(17.0, store.get("p-000017", StartResult.class).orElseThrow().nll());
    }

    @Test
    void corruptFileNamesTheFileAndTheRemedy(@TempDir Path dir) throws Exception {
        ResultStore store = new ResultStore(dir);
        Files.writeString(dir.resolve("start-000001.json"), "{ \"index\" : \"one\" }");
        UserInputException e = assertThrows(UserInputException.class,
                () -> store.get("start-000001", StartResult.class));
        assertTrue(e.getMessage().contains("start-000001.json"), e.getMessage());
        assertTrue(e.getMessage().contains("delete the file"), e.getMessage());
        assertEquals(1, e.getMessage().lines().count(), "one-line message");
    }

    /** A file of the wrong shape names the place in the file, not the Java class it should have become. */
    @Test
    void wrongShapeNamesLineAndColumnButNoJavaType(@TempDir Path dir) throws Exception {
        ResultStore store = new ResultStore(dir);
        Files.writeString(dir.resolve("start-000002.json"), "[1, 2]");
        UserInputException e = assertThrows(UserInputException.class,
                () -> store.get("start-000002", StartResult.class));
        String m = e.getMessage();
        assertTrue(m.contains("start-000002.json, line 1, column 1"), m);
        assertTrue(m.contains("delete the file"), m);
        assertFalse(m.contains("org.switchfit") || m.contains("StartResult") || m.contains("`")
                || m.contains("JsonToken"), m);
        assertTrue(m.contains("Cannot deserialize the expected value from Array value"), m);
        assertEquals(1, m.lines().count(), "one-line message");
    }

    @Test
    void keysMustBePortableFileNames(@TempDir Path dir) {
        ResultStore store = new ResultStore(dir);
        for (String bad : new String[] {"", "../x", "a/b", ".hidden", "sp ace", "x".repeat(129), null}) {
            assertThrows(IllegalArgumentException.class, () -> store.put(bad, 1), String.valueOf(bad));
        }
        assertEquals("profile-k_on-000007", ResultStore.indexKey("profile-k_on", 7));
        assertThrows(IllegalArgumentException.class, () -> ResultStore.indexKey("start", -1));
    }
}
