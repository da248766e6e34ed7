package org.switchfit.cli;

import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.FitResult;
import org.switchfit.fit.LocalTaskExecutor;
import org.switchfit.fit.Multistart;
import org.switchfit.objective.LikelihoodObjective;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.profile.Profile;
import org.switchfit.profile.ProfileLikelihood;
import org.switchfit.report.ProfilesFile;
import org.switchfit.util.UserInputException;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/**
 * {@code switchfit bench-profiles PROBLEM|FITDIR} (hidden): fits a problem by multistart (or loads a fit directory),
 * then profiles every parameter on the available cores and prints the wall time, the number of profile points and
 * the constrained re-optimisations per point. Writes nothing. Timings are not reproducible; the profiles are.
 */
@Command(name = "bench-profiles", hidden = true, mixinStandardHelpOptions = true,
        footer = {"", "Examples:", "  switchfit bench-profiles ../shared/benchmarks/problems/Boehm_JProteomeRes2014/Boehm_JProteomeRes2014.yaml --starts 10 --threads 2"},
        description = "Benchmark: fit (or load a fit directory) and profile all parameters; print timings.")
public final class BenchProfilesCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "PROBLEM.yaml|FITDIR", description = "problem file or fit directory")
    Path input;

    @Option(names = "--starts", defaultValue = "10",
            description = "fit starts when fitting (default: ${DEFAULT-VALUE})")
    int starts;

    @Option(names = "--seed", defaultValue = "1", description = "fit seed (default: ${DEFAULT-VALUE})")
    long seed;

    @Option(names = "--threads", defaultValue = "0", description = "threads (default: all cores)")
    int threads;

    @Mixin
    ToleranceOptions tolerances;

    @Option(names = "--pointwise-only", description = "trace profiles to the pointwise threshold only")
    boolean pointwiseOnly;

    @Override
    public Integer call() {
        int nThreads = threads > 0 ? threads : Runtime.getRuntime().availableProcessors();
        if (starts < 1) {
            throw new UserInputException(null, "--starts must be at least 1; got " + starts);
        }
        PrintWriter out = spec.commandLine().getOut();
        FitProblem fp;
        double[] optimum;
        double nll;
        long t0 = System.nanoTime();
        if (Files.isDirectory(input)) {
            FitDirectoryInput in = FitDirectoryInput.load(input);
            fp = in.fitProblem();
            optimum = in.optimum();
            nll = in.nllAtOptimum();
            out.printf(Locale.ROOT, "loaded fit %s: NLL %.10g%n", input, nll);
        } else {
            EstimationProblem problem = ProblemLoader.load(input);
            SolverSettings settings = tolerances.settings();
            LikelihoodObjective objective = LikelihoodObjective.of(problem, settings);
            fp = FitCommand.fitProblem(problem, objective);
            FitResult fr = Multistart.defaults().withStarts(starts).withSeed(seed)
                    .run(fp, problem.nominalTheta(), LocalTaskExecutor.ofThreads(nThreads));
            if (fr.bestTheta() == null) {
                out.println("all starts failed; nothing to profile");
                out.flush();
                return 1;
            }
            optimum = fr.bestTheta();
            nll = fr.bestNll();
            out.printf(Locale.ROOT, "fit: %d starts (start 0 nominal), best NLL %.10g, %d within %.1f, %.1f s on %d "
                    + "threads%n", starts, nll, fr.startsNearBest(), FitResult.NEAR_BEST_TOLERANCE,
                    (System.nanoTime() - t0) * 1e-9, nThreads);
        }
        ProfileLikelihood pl = ProfileLikelihood.defaults().withSimultaneousIntervals(!pointwiseOnly);
        ProfileRun run = new ProfileRun(fp, optimum, pl);
        List<ProfileRun.Task> tasks = new ArrayList<>();
        for (int k = 0; k < fp.parameterCount(); k++) {
            if (!fp.isFixed(k)) {
                tasks.add(new ProfileRun.Task(ProfilesFile.Kind.PARAMETER, fp.id(k), k, null));
            }
        }
        List<Callable<Profile>> calls = new ArrayList<>();
        for (ProfileRun.Task t : tasks) {
            calls.add(() -> run.compute(t));
        }
        long t1 = System.nanoTime();
        List<Profile> profiles = LocalTaskExecutor.ofThreads(nThreads).runAll(calls, null);
        double wall = (System.nanoTime() - t1) * 1e-9;
        int points = 0;
        int solves = 0;
        out.printf(Locale.ROOT, "%-24s %7s %7s %10s  %-30s %s%n", "parameter", "points", "solves", "solves/pt",
                "class", "sides");
        for (Profile p : profiles) {
            points += p.points().size();
            solves += p.solves();
            out.printf(Locale.ROOT, "%-24s %7d %7d %10.2f  %-30s %s/%s%s%n", p.name(), p.points().size(), p.solves(),
                    p.solves() / (double) Math.max(1, p.points().size() - 1), ProfileRun.className(p.identifiability()),
                    p.lowerSide(), p.upperSide(), p.betterOptimumFound() ? " BETTER OPTIMUM" : "");
        }
        out.printf(Locale.ROOT, "profiles: %d parameters, %d points, %d re-optimisations (%.2f per point excluding the"
                + " optimum), wall %.1f s on %d threads (%s thresholds)%n", profiles.size(), points, solves,
                solves / (double) Math.max(1, points - profiles.size()), wall, nThreads,
                pointwiseOnly ? "pointwise" : "pointwise and simultaneous");
        out.flush();
        return 0;
    }
}
