package org.switchfit.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.concurrent.Callable;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/**
 * {@code switchfit demo}: the whole job on the bundled SYNTHETIC data set (see {@link DemoScenario}): fit,
 * profiles, branches, bistable region and hysteresis sweep, then an HTML report. Stages whose library code is
 * missing from the build are reported as not available, never replaced by made-up results. With
 * {@code --regenerate-data} it only rewrites the data set.
 */
@Command(name = "demo", mixinStandardHelpOptions = true,
        footer = {"", "Examples:", "  switchfit demo", "  switchfit demo --quick --out fits/quick", "  switchfit demo --regenerate-data --seed 20261202"},
        description = "Run fit, profiles, branches, bistable region, hysteresis sweep and report on the bundled "
                + "SYNTHETIC Zarn/Quel switch data set.")
public final class DemoCommand implements Callable<Integer> {

    /**
     * Starts in quick mode. Measured with seed 1 on the demo data: with the timecourse-only objective of an earlier
     * build 2 starts ended in local optima (NLL 1214.7 and -123.9) and 4 starts reached the best value -138.9785
     * twice; with all data (threshold and dose-response blocks) 4 starts reach the best value -215.35007 twice.
     */
    static final int QUICK_STARTS = 4;

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Option(names = "--out", defaultValue = "fits/demo", paramLabel = "DIR",
            description = "output folder (default: ${DEFAULT-VALUE})")
    Path out;

    @Option(names = "--starts", defaultValue = "20", description = "fit starts (default: ${DEFAULT-VALUE})")
    int starts;

    @Option(names = "--seed", description = "random seed of the fit starts (default 1); with --regenerate-data the "
            + "noise seed (default " + DemoScenario.DEFAULT_SEED + ")")
    Long seed;

    @Option(names = "--threads", defaultValue = "2", description = "worker threads (default: ${DEFAULT-VALUE})")
    int threads;

    @Option(names = "--quick", description = "reduced run (few starts, coarse profiles) for smoke tests")
    boolean quick;

    @Option(names = "--regenerate-data", description = "rewrite the synthetic data set in --data and stop")
    boolean regenerate;

    @Option(names = "--data", defaultValue = "datasets", paramLabel = "DIR",
            description = "folder of the demo data set (default: ${DEFAULT-VALUE})")
    Path data;

    @Option(names = "--model", defaultValue = "models/stress_switch.xml", paramLabel = "FILE",
            description = "demo SBML model (default: ${DEFAULT-VALUE})")
    Path model;

    @Override
    public Integer call() {
        PrintWriter o = spec.commandLine().getOut();
        if (!Files.isRegularFile(model)) {
            throw new UserInputException(SourceLocation.ofFile(model.toString()), "not found; run the demo from the "
                    + "repository root or pass --model models/stress_switch.xml");
        }
        if (regenerate) {
            DemoScenario.Settings s = new DemoScenario.Settings(seed == null ? DemoScenario.DEFAULT_SEED : seed, 1,
                    DemoScenario.DECIMALS);
            mkdirs(data);
            DemoScenario.Generated g = DemoScenario.generate(model, data, s);
            List<Path> files = DemoScenario.write(g, data, model);
            o.println("SYNTHETIC demo data (seed " + s.seed() + ") written:");
            for (Path f : files) {
                o.println("  " + f);
            }
            o.flush();
            return 0;
        }
        if (starts < 1 || threads < 1) {
            throw new UserInputException(null, "--starts and --threads must be at least 1; got " + starts + " and "
                    + threads);
        }
        DemoRun.Settings rs = new DemoRun.Settings(model, data.resolve(DemoScenario.PROBLEM_STEM + ".yaml"), out,
                quick ? Math.min(starts, QUICK_STARTS) : starts, seed == null ? 1 : seed, threads, quick);
        return new DemoRun(rs, o).run();
    }

    static void mkdirs(Path dir) {
        try {
            Files.createDirectories(dir);
        } catch (IOException e) {
            throw new UserInputException(SourceLocation.ofFile(dir.toString()), "cannot be created (" + e.getMessage()
                    + "); choose another folder", e);
        }
    }
}
