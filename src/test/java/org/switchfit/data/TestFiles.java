package org.switchfit.data;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.stream.Stream;

/** Locating and copying the test resources of this package. */
final class TestFiles {

    private TestFiles() {
    }

    /** The resource folder or file {@code name} under {@code org/switchfit/data}. */
    static Path resource(String name) {
        try {
            return Path.of(TestFiles.class.getResource(name).toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Copies a resource folder recursively into {@code target}. */
    static Path copyFolder(String name, Path target) {
        Path src = resource(name);
        try (Stream<Path> s = Files.walk(src)) {
            for (Path p : (Iterable<Path>) s::iterator) {
                Path t = target.resolve(src.relativize(p).toString());
                if (Files.isDirectory(p)) {
                    Files.createDirectories(t);
                } else {
                    Files.copy(p, t);
                }
            }
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return target;
    }

    /** Writes a text file, creating folders. */
    static Path write(Path file, String content) {
        try {
            Files.createDirectories(file.getParent());
            Files.writeString(file, content);
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
        return file;
    }
}
