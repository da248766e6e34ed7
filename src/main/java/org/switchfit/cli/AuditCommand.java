package org.switchfit.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.switchfit.audit.AuditInput;
import org.switchfit.audit.Claim;
import org.switchfit.audit.FitAudit;
import org.switchfit.fit.LocalTaskExecutor;
import org.switchfit.objective.FoldPredictionSource;
import org.switchfit.objective.ObservablePrediction;
import org.switchfit.objective.Prediction;
import org.switchfit.objective.SteadyState;
import org.switchfit.report.FitDirectory;
import org.switchfit.report.FitFile;
import org.switchfit.report.FitSummary;
import org.switchfit.report.Json;
import org.switchfit.report.ProfilesFile;
import org.switchfit.report.ResultStore;
import org.switchfit.util.UserInputException;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/**
 * {@code switchfit audit FITDIR}: re-derives each claim of a finished fit from the model and data on disk
 * ({@link FitAudit}) and prints one line per claim, {@code holds} or {@code fails} with the numbers. Exit code 0
 * when every claim holds, 1 when any fails, 2 for a user error.
 */
@Command(name = "audit", mixinStandardHelpOptions = true,
        description = "Re-derive every claim of a fit directory from the model and data on disk: input checksums, "
                + "the NLL at the optimum, first-order optimality, a fresh multistart, each profile interval end, "
                + "and the model's thresholds. Exit code 0 only if every claim holds.",
        footer = {"", "Examples:", "  switchfit audit fits/demo",
            "  switchfit audit fits/demo --starts 10 --seed 7 --threads 2 --json fits/demo/audit.json"})
public final class AuditCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "FITDIR", description = "output folder of 'switchfit fit' (and profile)")
    Path fitDir;

    @Option(names = "--starts", defaultValue = "" + FitAudit.DEFAULT_STARTS,
            description = "fresh random starts searching for a better optimum (default: ${DEFAULT-VALUE})")
    int starts;

    @Option(names = "--seed", description = "seed of the fresh starts; must differ from the fit's (default: the "
            + "fit's seed + 1)")
    Long seed;

    @Option(names = "--threads", defaultValue = "0", description = "worker threads (default: all cores)")
    int threads;

    @Option(names = "--json", paramLabel = "FILE", description = "also write the claims as JSON")
    Path json;

    @Override
    public Integer call() {
        if (starts < 0 || threads < 0) {
            throw new UserInputException(null, "--starts and --threads must not be negative; got " + starts + " and "
                    + threads);
        }
        int nThreads = threads > 0 ? threads : Runtime.getRuntime().availableProcessors();
        PrintWriter out = spec.commandLine().getOut();
        long t0 = System.nanoTime();
        AuditInput input = input(fitDir);
        FitAudit audit = FitAudit.defaults().withStarts(starts).withExecutor(LocalTaskExecutor.ofThreads(nThreads));
        if (seed != null) {
            audit = audit.withSeed(seed);
        }
        out.println("audit of " + fitDir + " (one line per claim):");
        out.flush();
        List<Claim> claims = audit.run(input, c -> {
            out.println(c.line());
            out.flush();
        });
        long failed = claims.stream().filter(c -> !c.holds()).count();
        double wall = (System.nanoTime() - t0) * 1e-9;
        out.printf(Locale.ROOT, "%d claims, %d hold, %d fail (%.1f s)%n", claims.size(), claims.size() - failed, failed,
                wall);
        out.flush();
        if (json != null) {
            Map<String, Object> j = new LinkedHashMap<>();
            j.put("fitDir", fitDir.toString());
            j.put("allHold", failed == 0);
            j.put("claims", claims);
            j.put("starts", starts);
            j.put("seed", seed);
            j.put("wallSeconds", wall);
            Json.write(json, j);
        }
        return failed == 0 ? 0 : Main.EXIT_INTERNAL;
    }

    /** Reads the fit directory and rebuilds its problem from the files on disk. */
    static AuditInput input(Path fitDir) {
        FitDirectoryInput in = FitDirectoryInput.load(fitDir);
        FitDirectory dir = FitDirectory.of(fitDir);
        FitSummary summary = dir.read(FitFile.RESULT);
        ProfilesFile profiles = dir.find(FitFile.PROFILES).orElse(null);
        Map<String, ProfilesFile.Stored> stored = new LinkedHashMap<>();
        ResultStore store = new ResultStore(fitDir.resolve("profiles"));
        if (profiles != null) {
            for (ProfilesFile.Stored s : store.readAll(ProfilesFile.Stored.class).values()) {
                stored.put(AuditInput.storedKey(s.entry().kind(), s.entry().id()), s);
            }
        }
        Map<String, Prediction> folds = new LinkedHashMap<>();
        FoldPredictionSource.find().ifPresent(src -> {
            try {
                folds.putAll(src.foldPredictions(in.objective()));
            } catch (UserInputException e) {
                // The problem has no switching thresholds: there are no folds to check.
            }
        });
        Map<String, Prediction> predictions = new LinkedHashMap<>();
        if (profiles != null) {
            for (ProfilesFile.Entry e : profiles.profiles()) {
                if (e.kind() == ProfilesFile.Kind.PREDICTION) {
                    predictions.put(e.id(), ObservablePrediction.of(in.problem(), in.settings(),
                            SteadyState.defaults(), e.id()));
                }
            }
        }
        return new AuditInput(fitDir, summary, in.fitProblem(), in.optimum(), in.problem().inputFiles(), profiles,
                stored, dir.find(FitFile.BRANCHES).orElse(null), folds, predictions);
    }
}
