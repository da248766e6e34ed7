package org.switchfit.util;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;

/** Writes files atomically: content goes to a temporary file in the same directory, which is then renamed. */
public final class AtomicFiles {
    private AtomicFiles() {
    }

    /** Temp files are created owner-only (0600); results are meant to be shared, so widen to 0644 where POSIX. */
    private static void setReadable(Path tmp) throws IOException {
        try {
            Files.setPosixFilePermissions(tmp, java.nio.file.attribute.PosixFilePermissions.fromString("rw-r--r--"));
        } catch (UnsupportedOperationException e) {
            // not a POSIX file system: keep the platform default
        }
    }

    /** Writes {@code content} (UTF-8) to {@code target} atomically, creating parent directories. */
    public static void writeString(Path target, String content) {
        writeBytes(target, content.getBytes(StandardCharsets.UTF_8));
    }

    /** Writes {@code bytes} to {@code target} atomically, creating parent directories. */
    public static void writeBytes(Path target, byte[] bytes) {
        try {
            Path abs = target.toAbsolutePath();
            Path dir = abs.getParent();
            Files.createDirectories(dir);
            Path tmp = Files.createTempFile(dir, "." + abs.getFileName(), ".tmp");
            try {
                Files.write(tmp, bytes);
                setReadable(tmp);
                try {
                    Files.move(tmp, abs, StandardCopyOption.ATOMIC_MOVE, StandardCopyOption.REPLACE_EXISTING);
                } catch (AtomicMoveNotSupportedException e) {
                    Files.move(tmp, abs, StandardCopyOption.REPLACE_EXISTING);
                }
            } finally {
                Files.deleteIfExists(tmp);
            }
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + target + ": " + e.getMessage(), e);
        }
    }
}
