package org.switchfit.arch;

import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;

/**
 * The one-way dependency rule of the package table in DEVELOPERS.md, checked by scanning imports in the main
 * sources (plain source scan; fully qualified references in code are not seen, so prefer imports).
 */
class LayeringTest {

    private static final Map<String, Set<String>> ALLOWED = Map.ofEntries(
            Map.entry("util", Set.of()),
            Map.entry("linalg", Set.of("util")),
            Map.entry("expr", Set.of("util")),
            Map.entry("model", Set.of("expr", "util")),
            Map.entry("sbml", Set.of("model", "expr", "util")),
            Map.entry("ode", Set.of("model", "expr", "linalg", "util")),
            Map.entry("continuation", Set.of("ode", "linalg", "model", "expr", "util")),
            Map.entry("data", Set.of("util")),
            Map.entry("problem", Set.of("data", "model", "expr", "sbml", "ode", "linalg", "util")),
            Map.entry("objective", Set.of("problem", "ode", "continuation", "data", "model", "expr", "linalg",
                    "util")),
            Map.entry("fit", Set.of("objective", "problem", "util")),
            Map.entry("profile", Set.of("fit", "objective", "problem", "continuation", "util", "linalg")),
            Map.entry("report", Set.of("profile", "fit", "objective", "problem", "continuation", "ode", "data",
                    "model", "expr", "sbml", "linalg", "util")),
            Map.entry("audit", Set.of("report", "profile", "fit", "objective", "problem", "data", "util")));

    private static final Pattern IMPORT = Pattern.compile("^import\\s+(?:static\\s+)?org\\.switchfit\\.(\\w+)\\.",
            Pattern.MULTILINE);

    @Test
    void importsPointUpTheTable() throws IOException {
        Path root = Path.of("src/main/java/org/switchfit");
        List<String> violations = new ArrayList<>();
        try (Stream<Path> files = Files.walk(root)) {
            for (Path f : (Iterable<Path>) files.filter(p -> p.toString().endsWith(".java"))::iterator) {
                String pkg = root.relativize(f).getName(0).toString();
                Set<String> allowed = ALLOWED.get(pkg);
                if (allowed == null) {
                    continue; // cli and anything new: may import everything
                }
                Matcher m = IMPORT.matcher(Files.readString(f));
                while (m.find()) {
                    String target = m.group(1);
                    if (!target.equals(pkg) && !allowed.contains(target)) {
                        violations.add(f + " imports org.switchfit." + target);
                    }
                }
            }
        }
        assertTrue(violations.isEmpty(), "layering violations: " + violations);
    }
}
