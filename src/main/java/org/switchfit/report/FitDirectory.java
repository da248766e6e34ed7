package org.switchfit.report;

import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Optional;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * A fit directory: the folder {@code switchfit fit --out DIR} creates, which the other commands extend with their
 * own files ({@link FitFile#ALL}). Typed reads and atomic writes of each file with the shared JSON conventions of
 * {@link Json}. Immutable and thread-safe (concurrent writers of the same file: the last rename wins).
 */
public final class FitDirectory {
    private final Path dir;

    private FitDirectory(Path dir) {
        this.dir = dir;
    }

    /** The fit directory at {@code dir} (not checked until a file is read). */
    public static FitDirectory of(Path dir) {
        if (dir == null) {
            throw new IllegalArgumentException("dir must not be null");
        }
        return new FitDirectory(dir);
    }

    /** The directory. */
    public Path path() {
        return dir;
    }

    /** Path of {@code file} inside the directory. */
    public Path pathOf(FitFile<?> file) {
        return dir.resolve(file.fileName());
    }

    /** Whether {@code file} exists. */
    public boolean has(FitFile<?> file) {
        return Files.isRegularFile(pathOf(file));
    }

    /**
     * Reads {@code file}.
     *
     * @throws UserInputException (one line) when the file is missing, unreadable or not a valid file of its kind;
     *                            the message names the file and the command that writes it
     */
    public <T> T read(FitFile<T> file) {
        Path p = pathOf(file);
        if (!Files.isRegularFile(p)) {
            throw new UserInputException(SourceLocation.ofFile(p.toString()), "not found; it is written by '"
                    + file.producer() + "', run that first (or check the fit directory)");
        }
        try {
            return Json.read(p, file.type());
        } catch (Json.JsonReadException e) {
            throw new UserInputException(null, oneLine(e.getMessage()) + "; not a valid " + file.fileName()
                    + ", rerun '" + file.producer() + "' to rewrite it", e);
        } catch (UncheckedIOException e) {
            throw new UserInputException(SourceLocation.ofFile(p.toString()), "cannot be read ("
                    + oneLine(e.getCause().getMessage()) + "); check its permissions", e);
        }
    }

    /** Reads {@code file} when it exists (errors as {@link #read(FitFile)}), else empty. */
    public <T> Optional<T> find(FitFile<T> file) {
        return has(file) ? Optional.of(read(file)) : Optional.empty();
    }

    /** Writes {@code content} as {@code file} atomically, creating the directory when needed. */
    public <T> void write(FitFile<T> file, T content) {
        if (!file.type().isInstance(content)) {
            throw new IllegalArgumentException(file + " holds " + file.type().getSimpleName() + ", not "
                    + (content == null ? "null" : content.getClass().getSimpleName()));
        }
        Json.write(pathOf(file), content);
    }

    /** Collapses line breaks so a message stays on one line. */
    static String oneLine(String s) {
        return s == null ? "" : s.replaceAll("\\s*[\\r\\n]+\\s*", " ").trim();
    }

    @Override
    public String toString() {
        return dir.toString();
    }
}
