package org.switchfit.util;

import java.io.FileDescriptor;
import java.io.FileOutputStream;
import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.AtomicMoveNotSupportedException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardCopyOption;

/**
 * Writes files atomically: content goes to a temporary file in the same directory, which is then renamed.
 *
 * <p>Destinations that a rename would destroy are handled apart. A symbolic link is followed to its final target,
 * which is replaced (the link stays a link). A destination that exists but is not a regular file (a character
 * device, a FIFO) is written directly, without a temporary file. A link into this process's own standard output or
 * error ({@code /dev/stdout -> /proc/self/fd/1} on Linux) is written to that open stream: when the shell redirected
 * it to a file, renaming over that file or reopening it would lose what the command printed around it.
 */
public final class AtomicFiles {
    /** Longest chain of symbolic links followed, as Linux's {@code MAXSYMLINKS} (40; from memory). */
    private static final int MAX_LINKS = 40;

    private AtomicFiles() {
    }

    /** Writes {@code content} (UTF-8) to {@code target} atomically, creating parent directories. */
    public static void writeString(Path target, String content) {
        writeBytes(target, content.getBytes(StandardCharsets.UTF_8));
    }

    /**
     * Writes {@code bytes} to {@code target} atomically, creating parent directories.
     *
     * @throws UserInputException   if {@code target} is a directory
     * @throws UncheckedIOException if writing fails
     */
    public static void writeBytes(Path target, byte[] bytes) {
        try {
            Path abs = target.toAbsolutePath();
            if (Files.isDirectory(abs)) {
                throw new UserInputException(SourceLocation.ofFile(target.toString()),
                        "is a directory, not a file; give a file name for the output");
            }
            int stream = standardStream(abs);
            if (stream > 0) {
                // not closed: closing would close the process's own descriptor
                FileOutputStream out = new FileOutputStream(stream == 1 ? FileDescriptor.out : FileDescriptor.err);
                out.write(bytes);
                out.flush();
                return;
            }
            if (Files.exists(abs) && !Files.isRegularFile(abs)) {
                Files.write(abs, bytes); // a device or FIFO (through any links): renaming would replace it
                return;
            }
            replace(finalTarget(abs), bytes);
        } catch (IOException e) {
            throw new UncheckedIOException("cannot write " + target + ": " + e.getMessage(), e);
        }
    }

    /** Writes {@code bytes} to a temporary file beside {@code abs} and renames it to {@code abs}. */
    private static void replace(Path abs, byte[] bytes) throws IOException {
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
    }

    /** Temp files are created owner-only (0600); results are meant to be shared, so widen to 0644 where POSIX. */
    private static void setReadable(Path tmp) throws IOException {
        try {
            Files.setPosixFilePermissions(tmp, java.nio.file.attribute.PosixFilePermissions.fromString("rw-r--r--"));
        } catch (UnsupportedOperationException e) {
            // not a POSIX file system: keep the platform default
        }
    }

    /**
     * Follows {@code link} while it is a symbolic link (also a dangling one, whose target is then created) and
     * returns the absolute path of the last one's target; relative links resolve against the link's directory.
     */
    private static Path finalTarget(Path link) throws IOException {
        Path p = link;
        for (int i = 0; Files.isSymbolicLink(p); i++) {
            if (i == MAX_LINKS) {
                throw new IOException("too many levels of symbolic links from " + link);
            }
            p = p.getParent().resolve(Files.readSymbolicLink(p)); // not normalized: '..' after a linked directory
        }
        return p;
    }

    /**
     * 1 or 2 if {@code abs} is, or leads by symbolic links to, this process's descriptor 1 or 2 in Linux's
     * {@code /proc/self/fd} (so {@code /dev/stdout}, {@code /dev/fd/1}); otherwise -1, also where there is no
     * {@code /proc}. Package-private for the test.
     */
    static int standardStream(Path abs) throws IOException {
        Path selfFd = Path.of("/proc/self/fd");
        if (!Files.isDirectory(selfFd)) {
            return -1;
        }
        Path ownFd = selfFd.toRealPath(); // /proc/<pid>/fd
        Path p = abs;
        for (int i = 0; i <= MAX_LINKS; i++) {
            Path dir = p.getParent();
            if (dir != null && Files.isDirectory(dir) && dir.toRealPath().equals(ownFd)) {
                String name = p.getFileName().toString();
                return name.equals("1") ? 1 : name.equals("2") ? 2 : -1;
            }
            if (!Files.isSymbolicLink(p)) {
                return -1;
            }
            p = dir.resolve(Files.readSymbolicLink(p));
        }
        return -1;
    }
}
