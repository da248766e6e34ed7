package org.switchfit.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.Writer;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.nio.file.StandardOpenOption;
import java.time.Instant;
import java.util.List;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;
import picocli.CommandLine;
import picocli.CommandLine.Model.CommandSpec;
import picocli.CommandLine.Option;

/**
 * Options every command has ({@link Main#configure} adds them as a mixin): {@code --quiet} silences progress
 * (progress bars, per-start and per-profile lines) on the terminal, and {@code --log FILE} appends everything the
 * command prints, progress and errors included, to FILE as well. Results and warnings still go to the terminal
 * with {@code --quiet}.
 */
final class OutputOptions {

    /** Name of the mixin in each command's spec. */
    static final String MIXIN = "output";

    @Option(names = "--quiet", description = "no progress output on the terminal (results and warnings still shown)")
    boolean quiet;

    @Option(names = "--log", paramLabel = "FILE", description = "also append all output (progress, messages, "
            + "errors) to FILE")
    Path log;

    /** The open log, or null. */
    private PrintWriter logWriter;

    /** The options of the command behind {@code spec} (defaults when the command has no such mixin). */
    static OutputOptions of(CommandSpec spec) {
        CommandSpec m = spec.mixins().get(MIXIN);
        return m == null ? new OutputOptions() : (OutputOptions) m.userObject();
    }

    /**
     * Where progress goes: the command's error stream (which already copies to the log), or with {@code --quiet} the
     * log alone (nowhere when there is no log).
     */
    static PrintWriter progress(CommandSpec spec) {
        OutputOptions o = of(spec);
        if (!o.quiet) {
            return spec.commandLine().getErr();
        }
        return o.logWriter != null ? o.logWriter : new PrintWriter(Writer.nullWriter());
    }

    /** The open log of the command behind {@code spec}, or null (for progress that only the log should get). */
    static PrintWriter log(CommandSpec spec) {
        return of(spec).logWriter;
    }

    /** Whether progress is shown on the terminal. */
    static boolean quiet(CommandSpec spec) {
        return of(spec).quiet;
    }

    /**
     * Opens the log of the command about to run (if {@code --log} was given) and routes its output and error streams
     * through it.
     *
     * @throws UserInputException when the log cannot be opened
     */
    void open(CommandLine cl, List<String> args) {
        if (log == null) {
            return;
        }
        try {
            if (log.toAbsolutePath().getParent() != null) {
                Files.createDirectories(log.toAbsolutePath().getParent());
            }
            logWriter = new PrintWriter(Files.newBufferedWriter(log, StandardCharsets.UTF_8, StandardOpenOption.CREATE,
                    StandardOpenOption.APPEND), true);
        } catch (IOException e) {
            throw new UserInputException(SourceLocation.ofFile(log.toString()), "--log: cannot be opened for writing ("
                    + e.getMessage() + "); choose another file", e);
        }
        logWriter.println("== " + Instant.now() + " switchfit " + String.join(" ", args));
        logWriter.flush();
        cl.setOut(new PrintWriter(new Tee(cl.getOut(), logWriter), true));
        cl.setErr(new PrintWriter(new Tee(cl.getErr(), logWriter), true));
    }

    /** Writes a line to the log, if one is open (for the error handler). */
    void logLine(String line) {
        if (logWriter != null) {
            logWriter.println(line);
            logWriter.flush();
        }
    }

    /** Closes the log. */
    void close() {
        if (logWriter != null) {
            logWriter.close();
            logWriter = null;
        }
    }

    /** Copies characters to two writers. */
    private static final class Tee extends Writer {
        private final Writer a;
        private final Writer b;

        Tee(Writer a, Writer b) {
            this.a = a;
            this.b = b;
        }

        @Override
        public void write(char[] cbuf, int off, int len) throws IOException {
            a.write(cbuf, off, len);
            b.write(cbuf, off, len);
        }

        @Override
        public void flush() throws IOException {
            a.flush();
            b.flush();
        }

        @Override
        public void close() throws IOException {
            flush();
        }
    }
}
