package org.switchfit.util;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.CompletableFuture;
import java.util.concurrent.TimeUnit;
import org.junit.jupiter.api.Assumptions;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** Atomic writes keep symbolic links and non-regular destinations (devices, FIFOs) intact. */
class AtomicFilesTest {

    @Test
    void writesThroughASymbolicLinkAndKeepsTheLink(@TempDir Path dir) throws IOException {
        Path target = Files.writeString(dir.resolve("target.tsv"), "old\n");
        Path link = Files.createSymbolicLink(dir.resolve("link.tsv"), Path.of("target.tsv")); // relative link
        AtomicFiles.writeString(link, "new\n");
        assertTrue(Files.isSymbolicLink(link), "the link must stay a link");
        assertEquals(Path.of("target.tsv"), Files.readSymbolicLink(link));
        assertEquals("new\n", Files.readString(target));
    }

    @Test
    void followsAChainOfLinksIntoAnotherDirectory(@TempDir Path dir) throws IOException {
        Path sub = Files.createDirectory(dir.resolve("sub"));
        Path target = Files.writeString(sub.resolve("t.csv"), "old\n");
        Path mid = Files.createSymbolicLink(sub.resolve("mid.csv"), Path.of("t.csv"));
        Path link = Files.createSymbolicLink(dir.resolve("link.csv"), mid);
        AtomicFiles.writeString(link, "new\n");
        assertTrue(Files.isSymbolicLink(link) && Files.isSymbolicLink(mid));
        assertEquals("new\n", Files.readString(target));
        try (var files = Files.list(sub)) {
            assertEquals(2, files.count(), "no temporary file is left beside the target");
        }
    }

    @Test
    void aDanglingLinkCreatesItsTarget(@TempDir Path dir) throws IOException {
        Path link = Files.createSymbolicLink(dir.resolve("link.json"), Path.of("later.json"));
        AtomicFiles.writeString(link, "{}\n");
        assertTrue(Files.isSymbolicLink(link));
        assertEquals("{}\n", Files.readString(dir.resolve("later.json")));
    }

    @Test
    void aFifoIsWrittenDirectlyNotReplaced(@TempDir Path dir) throws Exception {
        Path fifo = dir.resolve("pipe");
        Process mk;
        try {
            mk = new ProcessBuilder("mkfifo", fifo.toString()).start();
        } catch (IOException e) {
            Assumptions.abort("mkfifo is not available: " + e.getMessage());
            return;
        }
        Assumptions.assumeTrue(mk.waitFor(10, TimeUnit.SECONDS) && mk.exitValue() == 0, "mkfifo failed");
        Path link = Files.createSymbolicLink(dir.resolve("out.tsv"), fifo); // as /dev/stdout -> /proc/self/fd/1
        // opening a FIFO for writing blocks until a reader opens it, so the reader runs beside the writer
        CompletableFuture<byte[]> read = CompletableFuture.supplyAsync(() -> {
            try {
                return Files.readAllBytes(fifo);
            } catch (IOException e) {
                throw new java.io.UncheckedIOException(e);
            }
        });
        AtomicFiles.writeString(link, "through the pipe\n");
        assertEquals("through the pipe\n", new String(read.get(10, TimeUnit.SECONDS), StandardCharsets.UTF_8));
        assertTrue(Files.isSymbolicLink(link));
        assertTrue(Files.exists(fifo) && !Files.isRegularFile(fifo), "the FIFO must not become a regular file");
    }

    @Test
    void linksToTheStandardStreamsAreRecognised(@TempDir Path dir) throws IOException {
        Assumptions.assumeTrue(Files.isDirectory(Path.of("/proc/self/fd")), "Linux /proc only");
        // writing to descriptor 1 itself would disturb the test runner's own channel, so only the recognition
        // is checked: a shell redirection '> out.txt' must not see out.txt renamed over or reopened
        Path link = Files.createSymbolicLink(dir.resolve("out.tsv"), Path.of("/proc/self/fd/1"));
        assertEquals(1, AtomicFiles.standardStream(link.toAbsolutePath()));
        assertEquals(2, AtomicFiles.standardStream(Path.of("/proc/self/fd/2")));
        Path plain = Files.writeString(dir.resolve("plain.tsv"), "x");
        assertEquals(-1, AtomicFiles.standardStream(Files.createSymbolicLink(dir.resolve("l.tsv"), plain)));
        assertEquals(-1, AtomicFiles.standardStream(Path.of("/proc/self/fd/0")));
    }

    @Test
    void aDirectoryIsRefusedAsUserError(@TempDir Path dir) throws IOException {
        Path sub = Files.createDirectory(dir.resolve("out"));
        UserInputException e = assertThrows(UserInputException.class, () -> AtomicFiles.writeString(sub, "x"));
        assertTrue(e.getMessage().contains(sub.toString()) && e.getMessage().contains("is a directory"),
                e.getMessage());
        assertTrue(e.getMessage().contains("give a file name"), e.getMessage());
        assertFalse(Files.isRegularFile(sub));
    }
}
