package org.switchfit.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Optional;
import java.util.Set;
import java.util.concurrent.Callable;
import org.switchfit.fit.FitProblem;
import org.switchfit.objective.FoldPredictionSource;
import org.switchfit.objective.ObservablePrediction;
import org.switchfit.objective.Prediction;
import org.switchfit.objective.SteadyState;
import org.switchfit.profile.JacobianRankCheck;
import org.switchfit.profile.ProfileLikelihood;
import org.switchfit.profile.RankReport;
import org.switchfit.report.FitDirectory;
import org.switchfit.report.FitFile;
import org.switchfit.report.ProfilesFile;
import org.switchfit.report.ResultStore;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/**
 * {@code switchfit profile FITDIR}: profile likelihoods (Raue et al. 2009, doi:10.1093/bioinformatics/btp358) of
 * the parameters of a finished fit, and prediction profiles (Kreutz et al. 2012, doi:10.1186/1752-0509-6-120) of
 * observables at given times and of fold positions. Each finished profile is written atomically to
 * {@code FITDIR/profiles/} (so {@code --resume} skips it), then {@code FITDIR/profiles.json} and one CSV per
 * profile next to its stored result. profiles.json lists every profile stored for this optimum: a resumed run that
 * names fewer profiles than an earlier one keeps the earlier ones in it.
 */
@Command(name = "profile", mixinStandardHelpOptions = true,
        footer = {"", "Examples:", "  switchfit profile fits/mine --threads 2", "  switchfit profile fits/mine --parameters k_stim,K_inh --folds --level 0.95"},
        description = "Profile likelihoods of the parameters, fold positions and predictions of a finished fit.")
public final class ProfileCommand implements Callable<Integer> {

    /** Random points of the structural rank check. */
    static final int RANK_POINTS = 5;

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "FITDIR", description = "output folder of 'switchfit fit'")
    Path fitDir;

    @Option(names = "--parameters", split = ",", paramLabel = "ID",
            description = "parameters to profile (default: all)")
    List<String> parameters;

    @Option(names = "--folds", description = "also profile every fold position (threshold of each condition)")
    boolean folds;

    @Option(names = "--predict", split = ",", paramLabel = "OBS@T",
            description = "prediction profiles of observables at times, e.g. pSTAT5A@30 or EXP/obs@t")
    List<String> predictions;

    @Option(names = "--level", defaultValue = "0.95", description = "confidence level (default: ${DEFAULT-VALUE})")
    double level;

    @Option(names = "--threads", defaultValue = "0", description = "worker threads (default: all cores)")
    int threads;

    @Option(names = "--resume", description = "reuse the profiles already finished in FITDIR/profiles")
    boolean resume;

    @Option(names = "--seed", defaultValue = "1", description = "seed of the random rank-check points "
            + "(default: ${DEFAULT-VALUE})")
    long seed;

    @Override
    public Integer call() {
        if (!(level > 0 && level < 1)) {
            throw new UserInputException(null, "--level must be between 0 and 1 (exclusive); got " + level);
        }
        if (threads < 0) {
            throw new UserInputException(null, "--threads must not be negative (0 means all cores); got " + threads);
        }
        int nThreads = threads > 0 ? threads : Runtime.getRuntime().availableProcessors();
        PrintWriter out = spec.commandLine().getOut();
        PrintWriter err = spec.commandLine().getErr();
        FitDirectoryInput in = FitDirectoryInput.load(fitDir);
        if (in.nllChanged()) {
            err.println("warning: " + in.nllChangeMessage() + "; the profiles start from the recorded optimum anyway");
        }
        FitProblem fp = in.fitProblem();
        List<ProfileRun.Task> tasks = parameterTasks(fp);
        LinkedHashMap<String, Prediction> preds = new LinkedHashMap<>();
        if (predictions != null) {
            for (String s : predictions) {
                ObservablePrediction p = ObservablePrediction.of(in.problem(), in.settings(), SteadyState.defaults(),
                        s);
                preds.put(p.name(), p);
            }
        }
        String foldStatus = "not requested";
        List<ProfileRun.Task> foldTasks = List.of();
        if (folds) {
            Optional<FoldPredictionSource> src = FoldPredictionSource.find();
            if (src.isEmpty()) {
                foldStatus = "fold predictions not available in this build";
                err.println("warning: --folds: " + foldStatus + "; only parameters and observable predictions are "
                        + "profiled");
            } else {
                LinkedHashMap<String, Prediction> fm = src.get().foldPredictions(in.objective());
                foldTasks = ProfileRun.predictionTasks(ProfilesFile.Kind.FOLD, fm);
                foldStatus = fm.size() + " fold positions profiled";
            }
        }
        tasks.addAll(foldTasks);
        tasks.addAll(ProfileRun.predictionTasks(ProfilesFile.Kind.PREDICTION, preds));
        ResultStore store = new ResultStore(fitDir.resolve("profiles"));
        if (!store.keys().isEmpty() && !resume) {
            throw new UserInputException(SourceLocation.ofFile(store.dir().toString()), "already holds finished "
                    + "profiles; add --resume to continue that run, or delete the folder to recompute");
        }
        // stored profiles belong to one optimum of one problem: a refit or changed data must not reuse them
        java.util.Map<String, String> settings = new java.util.LinkedHashMap<>();
        settings.put("optimum", java.util.Arrays.toString(in.optimum()));
        settings.put("integration", in.settings().toString());
        StartStore.RunIdentity.of(in.problem().inputFiles(), settings).guard(store.dir(), !store.keys().isEmpty());
        ProfileLikelihood pl = ProfileLikelihood.defaults().withLevel(level);
        ProfileRun run = new ProfileRun(fp, in.optimum(), pl);
        int[] done = {0};
        long t0 = System.nanoTime();
        PrintWriter progress = OutputOptions.progress(spec);
        List<ProfilesFile.Stored> results = run.run(tasks, store, nThreads, s -> {
            done[0]++;
            progress.printf(Locale.ROOT, "[%d/%d] profile of %s %s finished: %s%n", done[0], tasks.size(),
                    s.entry().kind().token(), s.entry().id(), s.entry().classification().token());
            progress.flush();
        });
        // profiles.json lists every finished profile of this optimum, also those of an earlier run not asked for now
        List<ProfilesFile.Stored> all = ProfileRun.withEarlier(tasks, results, store, level, List.of(fp.ids()),
                w -> err.println("warning: " + w));
        long foldCount = all.stream().filter(s -> s.entry().kind() == ProfilesFile.Kind.FOLD).count();
        if (foldTasks.isEmpty() && foldCount > 0 && !folds) {
            foldStatus = foldCount + " fold positions profiled (by an earlier run)";
        }
        ProfilesFile file = assemble(in, fp, pl, all, foldStatus, seed);
        FitDirectory.of(fitDir).write(FitFile.PROFILES, file);
        for (int i = 0; i < tasks.size(); i++) {
            ProfileRun.writeCsv(store.dir().resolve(tasks.get(i).key() + ".csv"), results.get(i), file.bestNll());
        }
        printSummary(out, err, file, (System.nanoTime() - t0) * 1e-9);
        return 0;
    }

    private List<ProfileRun.Task> parameterTasks(FitProblem fp) {
        List<ProfileRun.Task> tasks = new ArrayList<>();
        if (parameters == null || parameters.isEmpty()) {
            for (int k = 0; k < fp.parameterCount(); k++) {
                if (!fp.isFixed(k)) {
                    tasks.add(new ProfileRun.Task(ProfilesFile.Kind.PARAMETER, fp.id(k), k, null));
                }
            }
            return tasks;
        }
        // A repeated id is profiled once: twice would double the work, print the row twice and race on its file.
        Set<Integer> seen = new HashSet<>();
        for (String id : parameters) {
            int k = fp.indexOf(id.trim());
            if (k < 0) {
                throw new UserInputException(null, "--parameters: '" + id + "' is not an estimated parameter of the "
                        + "fit (estimated: " + SimulateCommand.abbreviate(List.of(fp.ids())) + "); give one of these");
            }
            if (!seen.add(k)) {
                continue;
            }
            tasks.add(new ProfileRun.Task(ProfilesFile.Kind.PARAMETER, fp.id(k), k, null));
        }
        return tasks;
    }

    /** Builds profiles.json: thresholds, the better-optimum flag and the structural rank check. */
    static ProfilesFile assemble(FitDirectoryInput in, FitProblem fp, ProfileLikelihood pl,
                                 List<ProfilesFile.Stored> results, String foldStatus, long seed) {
        int dof = Math.max(1, fp.freeCount());
        ProfilesFile.Thresholds th = new ProfilesFile.Thresholds(pl.threshold(1), pl.threshold(dof), dof);
        double best = in.nllAtOptimum();
        double found = best;
        boolean better = false;
        List<ProfilesFile.Entry> entries = new ArrayList<>();
        for (ProfilesFile.Stored s : results) {
            entries.add(s.entry());
            better |= s.entry().betterOptimumFound();
            for (ProfilesFile.Point p : s.entry().points()) {
                if (p.nll() < found) {
                    found = p.nll();
                }
            }
        }
        return new ProfilesFile(pl.level(), best, th, better, found, foldStatus, rankCheck(fp, in.optimum(), seed),
                entries);
    }

    static ProfilesFile.RankCheck rankCheck(FitProblem fp, double[] optimum, long seed) {
        JacobianRankCheck rc = JacobianRankCheck.defaults();
        RankReport at;
        try {
            at = rc.atPoint(fp, optimum);
        } catch (RuntimeException e) {
            return new ProfilesFile.RankCheck(null, List.of(), "rank check at the optimum failed: " + e.getMessage());
        }
        List<RankReport> random = new ArrayList<>();
        String msg = "";
        try {
            random.addAll(rc.atRandomPoints(fp, optimum, RANK_POINTS, seed));
        } catch (RuntimeException e) {
            msg = "rank check at random points failed: " + e.getMessage();
        }
        return new ProfilesFile.RankCheck(at, random, msg);
    }

    private void printSummary(PrintWriter out, PrintWriter err, ProfilesFile f, double seconds) {
        out.printf(Locale.ROOT, "%-12s %-28s %14s %14s %14s  %s%n", "kind", "id", "estimate", "lower", "upper",
                "class");
        for (ProfilesFile.Entry e : f.profiles()) {
            out.printf(Locale.ROOT, "%-12s %-28s %14.6g %14s %14s  %s%s%n", e.kind().token(), e.id(), e.estimate(),
                    e.lower() == null ? "open" : String.format(Locale.ROOT, "%.6g", e.lower()),
                    e.upper() == null ? "open" : String.format(Locale.ROOT, "%.6g", e.upper()), e.classification().token(),
                    e.bounds() == null ? "" : " (" + e.bounds() + ")");
        }
        ProfilesFile.RankCheck rc = f.rankCheck();
        if (rc.atOptimum() != null) {
            out.printf(Locale.ROOT, "Jacobian rank at the optimum: %d of %d%n", rc.atOptimum().rank(),
                    rc.atOptimum().freeCount());
            rc.atOptimum().nullSpace().forEach(d -> out.println("  null direction: " + d.description()));
        }
        if (f.betterOptimumFound()) {
            err.println("WARNING: A BETTER OPTIMUM WAS FOUND while profiling: NLL " + String.format(Locale.ROOT,
                    "%.10g < %.10g", f.bestNllFound(), f.bestNll()) + ". The fit did not reach the optimum; the "
                    + "affected profiles restarted from the better point. Re-run the fit (more starts) and profile "
                    + "again.");
        }
        out.printf(Locale.ROOT, "%d profiles in %.1f s; results in %s%n", f.profiles().size(), seconds,
                fitDir.resolve("profiles.json"));
        out.flush();
        err.flush();
    }
}
