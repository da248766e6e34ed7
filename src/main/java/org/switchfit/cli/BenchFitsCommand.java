package org.switchfit.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import java.util.concurrent.atomic.AtomicInteger;
import java.util.stream.Stream;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.FitResult;
import org.switchfit.fit.Multistart;
import org.switchfit.fit.StartResult;
import org.switchfit.fit.StartStatus;
import org.switchfit.objective.LikelihoodObjective;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.report.Json;
import org.switchfit.util.UserInputException;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/**
 * {@code switchfit bench-fits DIR}: a multistart fit of every PEtab problem in DIR with at most
 * {@code --max-parameters} estimated parameters, compared with the NLL at the problem's nominal parameter values.
 * A benchmark, not a test. Every finished start is stored atomically under {@code --out/PROBLEM/starts}, so an
 * interrupted run continues with {@code --resume}; each problem's summary goes to {@code --out/PROBLEM.json} and
 * all of them to {@code --out/summary.json}.
 */
@Command(name = "bench-fits", hidden = true, mixinStandardHelpOptions = true,
        description = "Multistart fits of every PEtab problem in a folder, compared with the NLL at nominal values.",
        footer = {"", "Example:", "  switchfit bench-fits ../shared/benchmarks/problems --starts 100 --threads 2 "
                + "--out target/bench-fits --resume"})
public final class BenchFitsCommand implements Callable<Integer> {
    /**
     * A fit "reaches" the nominal NLL when its best value is at most nominal + 0.01: the margin the benchmark
     * requirement names; it is far above the NLL's own accuracy at rtol 1e-8 (about 1e-6 relative).
     */
    static final double REACH_MARGIN = 0.01;

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "DIR", description = "folder with one sub-folder per PEtab problem")
    Path dir;

    @Option(names = "--problems", split = ",", paramLabel = "NAME", description = "only these problems")
    List<String> only;

    @Option(names = "--max-parameters", defaultValue = "30",
            description = "skip problems with more estimated parameters (default: ${DEFAULT-VALUE})")
    int maxParameters;

    @Option(names = "--starts", defaultValue = "100", description = "starts per problem (default: ${DEFAULT-VALUE})")
    int starts;

    @Option(names = "--seed", defaultValue = "1", description = "seed of the start design (default: ${DEFAULT-VALUE})")
    long seed;

    @Option(names = "--threads", defaultValue = "2", description = "worker threads (default: ${DEFAULT-VALUE})")
    int threads;

    @Option(names = "--out", required = true, paramLabel = "DIR", description = "output folder")
    Path out;

    @Option(names = "--resume", description = "reuse starts already finished in the output folder")
    boolean resume;

    @Mixin
    FitSolverOptions solver;

    @Override
    public Integer call() throws IOException {
        if (!Files.isDirectory(dir)) {
            throw new UserInputException(null, "benchmark folder '" + dir
                    + "' does not exist; pass the folder that holds one sub-folder per PEtab problem");
        }
        if (starts < 1 || threads < 1) {
            throw new UserInputException(null, "--starts and --threads must be at least 1; got " + starts + " and "
                    + threads);
        }
        PrintWriter o = spec.commandLine().getOut();
        List<Path> folders = BenchPetabCommand.problemFolders(dir, only);
        int unreadable = 0;
        List<Map<String, Object>> rows = new ArrayList<>();
        int reached = 0;
        int fitted = 0;
        for (Path f : folders) {
            String name = f.getFileName().toString();
            if (only != null && !only.contains(name)) {
                continue;
            }
            Map<String, Object> r;
            try {
                r = benchOne(name, problemYaml(f));
            } catch (OutputFolderError e) {
                throw e.input;
            } catch (RuntimeException e) {
                unreadable += e instanceof UserInputException ? 1 : 0;
                r = new LinkedHashMap<>();
                r.put("problem", name);
                r.put("status", "failed");
                r.put("reason", e.getClass().getSimpleName() + ": " + e.getMessage());
            }
            if (r == null) {
                continue;
            }
            rows.add(r);
            if ("fitted".equals(r.get("status"))) {
                fitted++;
                reached += Boolean.TRUE.equals(r.get("reachedNominal")) ? 1 : 0;
            }
            o.println(line(r));
            o.flush();
        }
        o.printf(Locale.ROOT, "%d of %d fitted problems reached the NLL at nominal values (+%.2g)%n", reached,
                fitted, REACH_MARGIN);
        Map<String, Object> all = new LinkedHashMap<>();
        all.put("starts", starts);
        all.put("seed", seed);
        all.put("threads", threads);
        all.put("costTolerance", solver.costTolerance);
        all.put("maxParameters", maxParameters);
        all.put("reached", reached);
        all.put("fitted", fitted);
        all.put("problems", rows);
        Json.write(out.resolve("summary.json"), all);
        // a problem that could not be read (its row names the file and line): exit 2, the others' results kept
        return unreadable == 0 ? 0 : 2;
    }

    /** Fits one problem; null when it has too many estimated parameters. */
    private Map<String, Object> benchOne(String name, Path yaml) {
        EstimationProblem problem = ProblemLoader.load(yaml);
        if (problem.parameterCount() > maxParameters) {
            return null;
        }
        LikelihoodObjective objective = LikelihoodObjective.of(problem, solver.settings());
        double nominal = objective.evaluate(problem.nominalTheta(), new double[objective.residualCount()], null);
        FitProblem fp = FitCommand.fitProblem(problem, objective);
        Multistart multistart = solver.multistart(starts, seed);
        StartStore store;
        List<StartResult> finished;
        try {
            store = new StartStore(out.resolve(name).resolve("starts"), resume, () -> new UserInputException(null,
                    "'" + out.resolve(name) + "' already holds finished starts; add --resume or choose another --out"
                    + " folder"), StartStore.RunIdentity.of(problem.inputFiles(), solver.identity(starts, seed,
                    false)));
            finished = store.finished();
            multistart.checkFinished(fp, null, finished);
        } catch (UserInputException e) {
            throw new OutputFolderError(e);
        }
        PrintWriter progress = OutputOptions.progress(spec);
        if (!finished.isEmpty()) {
            progress.printf(Locale.ROOT, "%s: %d of %d starts resumed from %s%n", name, finished.size(), starts,
                    out.resolve(name).resolve("starts"));
            progress.flush();
        }
        AtomicInteger done = new AtomicInteger(finished.size());
        long t0 = System.nanoTime();
        FitResult result = store.run(multistart, fp, null, threads, s -> {
            int k = done.incrementAndGet();
            synchronized (progress) {
                progress.printf(Locale.ROOT, "%s: start %d done (%d/%d): %s%n", name, s.index(), k, starts,
                        s.status() == StartStatus.FAILED ? "failed, " + s.reason()
                                : String.format(Locale.ROOT, "NLL %.6g, %s after %d iterations", s.nll(),
                                s.termination(), s.iterations()));
                progress.flush();
            }
        });
        double wall = (System.nanoTime() - t0) * 1e-9;
        int ok = 0;
        int reachedStarts = 0;
        double iterations = 0;
        for (StartResult s : result.starts()) {
            if (s.status() != StartStatus.FAILED) {
                ok++;
                iterations += s.iterations();
                reachedStarts += s.nll() <= nominal + REACH_MARGIN ? 1 : 0;
            }
        }
        Map<String, Object> r = new LinkedHashMap<>();
        r.put("problem", name);
        r.put("status", "fitted");
        r.put("estimatedParameters", problem.parameterCount());
        r.put("nllAtNominal", nominal);
        r.put("bestNll", result.bestNll());
        r.put("reachedNominal", result.bestNll() <= nominal + REACH_MARGIN);
        r.put("startsReachingNominal", reachedStarts);
        r.put("startsNearBest", result.startsNearBest());
        r.put("starts", starts);
        r.put("failedStarts", starts - ok);
        r.put("meanIterations", ok == 0 ? Double.NaN : iterations / ok);
        r.put("wallSeconds", wall);
        r.put("resumedStarts", finished.size());
        r.put("threads", threads);
        Json.write(out.resolve(name + ".json"), r);
        return r;
    }

    /** The problem's YAML file: NAME.yaml, else the first *.yaml in the folder. */
    static Path problemYaml(Path folder) {
        Path yaml = folder.resolve(folder.getFileName() + ".yaml");
        if (Files.isRegularFile(yaml)) {
            return yaml;
        }
        try (Stream<Path> s = Files.list(folder)) {
            return s.filter(p -> p.toString().endsWith(".yaml")).sorted().findFirst().orElse(yaml);
        } catch (IOException e) {
            throw new UserInputException(null, "cannot list '" + folder + "': " + e.getMessage());
        }
    }

    private static String line(Map<String, Object> r) {
        if (!"fitted".equals(r.get("status"))) {
            return String.format(Locale.ROOT, "%-32s failed: %s", r.get("problem"), r.get("reason"));
        }
        return String.format(Locale.ROOT, "%-32s p=%-3s nominal %.6f best %.6f %s; %s/%s starts reach nominal,"
                        + " %s near best, %s failed; %.1f s%s", r.get("problem"), r.get("estimatedParameters"),
                (Double) r.get("nllAtNominal"), (Double) r.get("bestNll"),
                Boolean.TRUE.equals(r.get("reachedNominal")) ? "REACHED" : "not reached",
                r.get("startsReachingNominal"), r.get("starts"), r.get("startsNearBest"), r.get("failedStarts"),
                (Double) r.get("wallSeconds"),
                ((Integer) r.get("resumedStarts")) > 0 ? " (" + r.get("resumedStarts") + " resumed)" : "");
    }

    /**
     * A user error about the output folder (finished starts stored without --resume, or from other settings): it
     * concerns the whole command, so it ends the run with one line and exit code 2 instead of becoming a failed
     * problem row.
     */
    private static final class OutputFolderError extends RuntimeException {
        private static final long serialVersionUID = 1L;
        final transient UserInputException input;

        OutputFolderError(UserInputException input) {
            super(input.getMessage(), null, false, false);
            this.input = input;
        }
    }
}
