package org.switchfit.report;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;
import java.util.Set;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.switchfit.util.UserInputException;

/**
 * A directory of finished-task results, one JSON file per task ({@code <key>.json}, written with {@link Json}),
 * so an interrupted run of fit starts or profiles can resume by skipping the keys already present.
 *
 * <p>Each {@link #put} writes atomically (temporary file in the same directory, then rename), so a file either
 * holds a complete result or does not exist; temporary files left by a killed process start with '.' and are
 * ignored. Concurrent puts from several threads are safe for distinct keys; for the same key the last rename wins.
 * Keys are 1-128 characters from {@code [A-Za-z0-9._-]}, starting with a letter or digit, so they are portable file
 * names.
 */
public final class ResultStore {
    private static final Pattern KEY = Pattern.compile("[A-Za-z0-9][A-Za-z0-9._-]{0,127}");
    private static final String SUFFIX = ".json";

    private final Path dir;

    /** A store in {@code dir}; the directory is created on the first {@link #put}. */
    public ResultStore(Path dir) {
        if (dir == null) {
            throw new IllegalArgumentException("directory must not be null");
        }
        this.dir = dir;
    }

    /** The directory. */
    public Path dir() {
        return dir;
    }

    /** A key for the index-th task with the given prefix, zero-padded to six digits: {@code start-000042}. */
    public static String indexKey(String prefix, int index) {
        if (index < 0) {
            throw new IllegalArgumentException("index must be >= 0, got " + index);
        }
        return checkKey(String.format(Locale.ROOT, "%s-%06d", prefix, index));
    }

    private static String checkKey(String key) {
        if (key == null || !KEY.matcher(key).matches()) {
            throw new IllegalArgumentException("result key must match " + KEY.pattern() + ", got '" + key + "'");
        }
        return key;
    }

    private Path file(String key) {
        return dir.resolve(checkKey(key) + SUFFIX);
    }

    /** Writes {@code value} as {@code <key>.json} atomically, replacing any earlier result for the key. */
    public void put(String key, Object value) {
        Json.write(file(key), value);
    }

    /** Whether a result for {@code key} exists. */
    public boolean contains(String key) {
        return Files.isRegularFile(file(key));
    }

    /**
     * The stored result for {@code key}, if any.
     *
     * @throws UserInputException if the file exists but does not hold a {@code type} (names the file and says to
     *                            delete it to recompute that task)
     */
    public <T> Optional<T> get(String key, Class<T> type) {
        Path f = file(key);
        if (!Files.isRegularFile(f)) {
            return Optional.empty();
        }
        return Optional.of(read(f, type));
    }

    private static <T> T read(Path f, Class<T> type) {
        try {
            return Json.read(f, type);
        } catch (Json.JsonReadException e) {
            throw new UserInputException(null, e.getMessage().lines().findFirst().orElse(f.toString())
                    + "; not a valid stored result of this command: delete the file to recompute that task, or use a"
                    + " fresh output directory", e);
        }
    }

    /** Keys of all stored results, sorted. Empty if the directory does not exist. */
    public List<String> keys() {
        if (!Files.isDirectory(dir)) {
            return List.of();
        }
        List<String> keys = new ArrayList<>();
        try (Stream<Path> s = Files.list(dir)) {
            s.forEach(p -> {
                String name = p.getFileName().toString();
                if (name.endsWith(SUFFIX) && Files.isRegularFile(p)) {
                    String key = name.substring(0, name.length() - SUFFIX.length());
                    if (KEY.matcher(key).matches()) {
                        keys.add(key);
                    }
                }
            });
        } catch (IOException e) {
            throw new UncheckedIOException("cannot list " + dir + ": " + e.getMessage(), e);
        }
        Collections.sort(keys);
        return keys;
    }

    /**
     * The keys among {@code wanted} that have no stored result yet, in the order given: the tasks a resumed run
     * still has to do.
     */
    public List<String> missing(List<String> wanted) {
        Set<String> have = new HashSet<>(keys());
        List<String> out = new ArrayList<>();
        for (String k : wanted) {
            if (!have.contains(checkKey(k))) {
                out.add(k);
            }
        }
        return out;
    }

    /** All stored results read as {@code type}, keyed and ordered by key. */
    public <T> Map<String, T> readAll(Class<T> type) {
        Map<String, T> out = new LinkedHashMap<>();
        for (String k : keys()) {
            out.put(k, read(file(k), type));
        }
        return out;
    }
}
