package org.switchfit.cli;

import java.io.PrintWriter;
import org.switchfit.util.UserInputException;
import picocli.CommandLine;
import picocli.CommandLine.Command;

/**
 * Entry point of the {@code switchfit} command. Exit codes: 0 success, 2 user error (one line on stderr, no stack
 * trace), 1 internal failure.
 */
@Command(name = "switchfit", mixinStandardHelpOptions = true, versionProvider = Main.Version.class,
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

    @Override
    public void run() {
        CommandLine.usage(this, System.out);
    }

    /** Runs the CLI and exits the JVM with the command's exit code. */
    public static void main(String[] args) {
        System.exit(execute(args, new PrintWriter(System.out, true), new PrintWriter(System.err, true)));
    }

    /** Runs the CLI with the given streams and returns the exit code (used by tests). */
    public static int execute(String[] args, PrintWriter out, PrintWriter err) {
        CommandLine cl = new CommandLine(new Main());
        cl.setOut(out);
        cl.setErr(err);
        cl.setExecutionExceptionHandler((ex, commandLine, parseResult) -> {
            Throwable t = ex;
            while (t != null && !(t instanceof UserInputException) && t.getCause() != null && t.getCause() != t) {
                t = t.getCause();
            }
            if (t instanceof UserInputException) {
                err.println("error: " + t.getMessage());
                return EXIT_USER_ERROR;
            }
            err.println("internal error: " + ex);
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
        return cl.execute(args);
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
