package org.switchfit.cli;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.concurrent.Callable;
import org.switchfit.report.FitDirectory;
import org.switchfit.report.FitFile;
import org.switchfit.report.FitReport;
import org.switchfit.report.HtmlReport;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/**
 * {@code switchfit report FITDIR}: one self-contained HTML page from the files of a fit directory, without
 * recomputing anything (see {@link FitReport} for the sections and the files each needs).
 */
@Command(name = "report", mixinStandardHelpOptions = true,
        footer = {"", "Examples:", "  switchfit report fits/demo", "  switchfit report fits/mine --out mine.html"},
        description = "Write one self-contained HTML report of a fit directory from the files in it.")
public final class ReportCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "FITDIR", description = "fit directory (the --out folder of 'fit')")
    Path fitDir;

    @Option(names = "--out", paramLabel = "FILE", description = "HTML file to write (default: FITDIR/report.html)")
    Path out;

    @Override
    public Integer call() {
        if (!Files.isDirectory(fitDir)) {
            throw new UserInputException(SourceLocation.ofFile(fitDir.toString()), "is not a directory; give the "
                    + "--out folder of 'switchfit fit'");
        }
        FitDirectory dir = FitDirectory.of(fitDir);
        // An empty or unrelated folder would otherwise give an empty page and exit code 0, hiding a wrong path.
        if (FitFile.ALL.stream().noneMatch(dir::has)) {
            throw new UserInputException(SourceLocation.ofFile(fitDir.toString()), "holds none of the files of a fit"
                    + " directory (result.json, profiles.json, branches.json, ...); give the --out folder of "
                    + "'switchfit fit'");
        }
        String version = new Main.Version().getVersion()[0];
        HtmlReport page = FitReport.build(dir, version + "; report of " + fitDir);
        Path target = out == null ? fitDir.resolve("report.html") : out;
        page.write(target);
        spec.commandLine().getOut().println("report written to " + target + " (" + page.figureIds().size()
                + " figures)");
        spec.commandLine().getOut().flush();
        return 0;
    }
}
