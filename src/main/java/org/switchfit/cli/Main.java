package org.switchfit.cli;

import java.io.PrintWriter;
import java.util.ArrayList;
import java.util.List;
import org.switchfit.util.UserInputException;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * Entry point of the {@code switchfit} command. Exit codes: 0 success, 2 user error (one line on stderr, no stack
 * trace), 1 internal failure.
 */
@Command(name = "switchfit", mixinStandardHelpOptions = true, versionProvider = Main.Version.class,
        footer = {"", "Every command also takes --quiet (no progress output) and --log FILE (append all output to FILE).",
            "", "Examples:", "  switchfit demo", "  switchfit audit fits/demo", "  switchfit fit --help"},
        description = "Fit ODE models of biochemical switches to timecourses and switching thresholds, "
                + "trace their steady-state branches and folds, and report which parameters the data pin down.",
        subcommands = {
            CommandLine.HelpCommand.class,
            SimulateCommand.class,
            SuiteCommand.class,
            CheckCommand.class,
            FitCommand.class,
            AuditCommand.class,
            BenchPetabCommand.class,
            BenchFitsCommand.class,
            ReportCommand.class,
            ProfileCommand.class,
            DemoCommand.class,
            BenchProfilesCommand.class,
            BranchesCommand.class,
            RegionCommand.class,
            SweepCommand.class,
        })
public final class Main implements Runnable {

    /** Exit code for user errors. */
    public static final int EXIT_USER_ERROR = 2;
    /** Exit code for internal failures. */
    public static final int EXIT_INTERNAL = 1;
    /** Width of help texts, wide enough that examples stay on one line. */
    static final int HELP_WIDTH = 120;

    @CommandLine.Spec
    CommandLine.Model.CommandSpec spec;

    @Override
    public void run() {
        spec.commandLine().usage(spec.commandLine().getOut());
    }

    /** Runs the CLI and exits the JVM with the command's exit code. */
    public static void main(String[] args) {
        System.exit(execute(args, new PrintWriter(System.out, true), new PrintWriter(System.err, true)));
    }

    /** Runs the CLI with the given streams and returns the exit code (used by tests). */
    public static int execute(String[] args, PrintWriter out, PrintWriter err) {
        CommandLine cl = configure(new CommandLine(new Main()));
        cl.setOut(out);
        cl.setErr(err);
        cl.setUsageHelpWidth(HELP_WIDTH);
        List<OutputOptions> opened = new ArrayList<>();
        cl.setExecutionStrategy(parseResult -> {
            CommandLine.ParseResult last = parseResult;
            while (last.hasSubcommand()) {
                last = last.subcommand();
            }
            OutputOptions o = OutputOptions.of(last.commandSpec());
            opened.add(o);
            try {
                o.open(last.commandSpec().commandLine(), List.of(args));
            } catch (UserInputException e) {
                // an unusable --log file: outside picocli's execution handler, so reported here (was a stack trace)
                err.println("error: " + e.getMessage());
                return EXIT_USER_ERROR;
            }
            return new CommandLine.RunLast().execute(parseResult);
        });
        cl.setExecutionExceptionHandler((ex, commandLine, parseResult) -> {
            Throwable t = ex;
            while (t != null && !(t instanceof UserInputException) && t.getCause() != null && t.getCause() != t) {
                t = t.getCause();
            }
            OutputOptions o = OutputOptions.of(commandLine.getCommandSpec());
            if (t instanceof UserInputException) {
                err.println("error: " + t.getMessage());
                o.logLine("error: " + t.getMessage());
                return EXIT_USER_ERROR;
            }
            String unwritable = unwritableOutput(ex);
            if (unwritable != null) {
                err.println("error: " + unwritable);
                o.logLine("error: " + unwritable);
                return EXIT_USER_ERROR;
            }
            err.println("internal error: " + ex);
            o.logLine("internal error: " + ex);
            if (System.getenv("SWITCHFIT_DEBUG") != null) {
                ex.printStackTrace(err);
            } else {
                err.println("(set SWITCHFIT_DEBUG=1 for a stack trace)");
            }
            return EXIT_INTERNAL;
        });
        cl.setParameterExceptionHandler((ex, a) -> {
            err.println("error: " + ex.getMessage() + " (see 'switchfit "
                    + ex.getCommandLine().getCommandName() + " --help')");
            return EXIT_USER_ERROR;
        });
        try {
            return cl.execute(args);
        } finally {
            opened.forEach(OutputOptions::close); // after the error handler, which writes to the log as well
        }
    }

    /**
     * One line for an output that could not be written (a directory, a missing folder, no permission), or null when
     * {@code ex} is something else. Writing goes through AtomicFiles, which reports an {@link java.io.IOException}
     * wrapped as "cannot write PATH: ..."; such a path comes from the user (--out, --json, ...), so it is a user
     * error, not an internal one.
     */
    static String unwritableOutput(Throwable ex) {
        java.io.UncheckedIOException wrapper = null;
        java.io.IOException io = null;
        for (Throwable t = ex; t != null && io == null; t = t.getCause() == t ? null : t.getCause()) {
            if (t instanceof java.io.UncheckedIOException && wrapper == null) {
                wrapper = (java.io.UncheckedIOException) t;
            }
            if (t instanceof java.io.IOException) {
                io = (java.io.IOException) t;
            }
        }
        if (wrapper == null || wrapper.getMessage() == null || !wrapper.getMessage().startsWith("cannot write ")) {
            return null;
        }
        String msg = wrapper.getMessage();
        int colon = msg.indexOf(": ");
        String head = colon > 0 ? msg.substring(0, colon) : msg;
        String reason = null;
        if (io instanceof java.nio.file.FileSystemException) {
            reason = ((java.nio.file.FileSystemException) io).getReason();
        }
        if (reason == null) {
            reason = io instanceof java.nio.file.AccessDeniedException ? "permission denied"
                    : io instanceof java.nio.file.NoSuchFileException ? "it cannot be created there"
                    : io instanceof java.nio.file.FileAlreadyExistsException ? "it exists and cannot be replaced"
                    : io != null && io.getMessage() != null ? io.getMessage() : "write failed";
        }
        return head + " (" + reason + "); choose a writable file path (not a directory)";
    }

    /**
     * Adds the options every command shares ({@code --quiet}, {@code --log}, see {@link OutputOptions}) to
     * {@code cl}'s subcommands (or to {@code cl} itself when it has none); returns {@code cl}.
     */
    static CommandLine configure(CommandLine cl) {
        if (cl.getSubcommands().isEmpty()) {
            if (!cl.getCommandSpec().mixins().containsKey(OutputOptions.MIXIN)
                    && !cl.getCommandName().equals("help")) {
                cl.addMixin(OutputOptions.MIXIN, new OutputOptions());
            }
            return cl;
        }
        for (CommandLine sub : cl.getSubcommands().values()) {
            configure(sub);
        }
        return cl;
    }

    /** Reads the version from the jar manifest, falling back to the development version. */
    static final class Version implements CommandLine.IVersionProvider {
        @Override
        public String[] getVersion() {
            String v = Main.class.getPackage().getImplementationVersion();
            return new String[] {"switchfit " + (v == null ? "0.1.0-SNAPSHOT" : v),
                "Java " + System.getProperty("java.version")};
        }
    }
}
