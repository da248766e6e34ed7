package org.switchfit.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.FitResult;
import org.switchfit.fit.Multistart;
import org.switchfit.fit.ParameterScale;
import org.switchfit.fit.StartResult;
import org.switchfit.fit.StartStatus;
import org.switchfit.objective.LikelihoodObjective;
import org.switchfit.objective.SwitchingFit;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.FreeParameter;
import org.switchfit.problem.Measurement;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.report.Csv;
import org.switchfit.report.DataCounts;
import org.switchfit.report.FitDirectory;
import org.switchfit.report.FitFile;
import org.switchfit.report.FitSummary;
import org.switchfit.report.FittedTrajectories;
import org.switchfit.report.TrajectoriesFile;
import org.switchfit.sbml.SbmlWriter;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/**
 * {@code switchfit fit}: multistart Levenberg-Marquardt on a problem of either format. Each finished start is
 * written atomically to {@code OUT/starts/} as it finishes, so {@code --resume} continues an interrupted run with
 * the same result; at the end {@code result.json}, {@code residuals.csv}, {@code switching_residuals.csv} (problems
 * with thresholds or dose responses) and {@code model_fitted.xml} are written, and each measured threshold is
 * printed beside the model's.
 */
@Command(name = "fit", mixinStandardHelpOptions = true,
        footer = {"", "Examples:", "  switchfit fit datasets/stress_switch.yaml --starts 20 --seed 1 --threads 2 --out fits/mine", "  switchfit fit datasets/stress_switch.yaml --starts 20 --seed 1 --out fits/mine --resume --log fit.log"},
        description = "Fit a problem (PEtab YAML or switchfit problem file) by multistart Levenberg-Marquardt.")
public final class FitCommand implements Callable<Integer> {
    /** Inputs' checksums and result-changing settings of this run (set in call()). */
    private StartStore.RunIdentity identity;


    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "PROBLEM.yaml", description = "problem file")
    Path problemFile;

    @Option(names = "--starts", defaultValue = "20", description = "number of starts (default: ${DEFAULT-VALUE})")
    int starts;

    @Option(names = "--seed", defaultValue = "1", description = "random seed (default: ${DEFAULT-VALUE})")
    long seed;

    @Option(names = "--threads", defaultValue = "1", description = "worker threads (default: ${DEFAULT-VALUE})")
    int threads;

    @Option(names = "--out", required = true, paramLabel = "DIR", description = "output folder")
    Path out;

    @Option(names = "--resume", description = "reuse the starts already finished in the output folder")
    boolean resume;

    @Option(names = "--nominal-start", description = "use the nominal parameter values as start 0")
    boolean nominalStart;

    @Mixin
    FitSolverOptions solver;

    @Override
    public Integer call() {
        if (starts < 1 || threads < 1) {
            throw new UserInputException(null, "--starts and --threads must be at least 1; got " + starts + " and "
                    + threads);
        }
        EstimationProblem problem = ProblemLoader.load(problemFile);
        printNotes(spec.commandLine().getErr(), problem);
        if (problem.measurements().isEmpty() && problem.extraData().isEmpty()) {
            // with nothing to fit, every start "converges" at NLL 0 (or at the priors' minimum)
            throw new UserInputException(SourceLocation.ofFile(problemFile.toString()), "no data: the problem has no "
                    + "measurements, dose-response points or switching thresholds (are its data tables empty?); add "
                    + "data rows before fitting");
        }
        LikelihoodObjective objective = LikelihoodObjective.of(problem, solver.settings());
        FitProblem fp = fitProblem(problem, objective);
        identity = StartStore.RunIdentity.of(problem.inputFiles(), solver.identity(starts, seed, nominalStart));
        StartStore store = new StartStore(out.resolve("starts"), resume, () -> new UserInputException(
                SourceLocation.ofFile(out.toString()), "already holds finished starts; add --resume to continue that "
                + "run, or choose another --out folder"), identity);
        List<StartResult> finished = store.finished();
        Multistart ms = solver.multistart(starts, seed);
        double[] guess = nominalStart ? problem.nominalTheta() : null;
        boolean bar = !OutputOptions.quiet(spec) && System.console() != null;
        PrintWriter err = OutputOptions.progress(spec);
        int[] done = {finished.size()};
        double[] best = {Double.POSITIVE_INFINITY};
        for (StartResult r : finished) {
            if (r.status() != StartStatus.FAILED) {
                best[0] = Math.min(best[0], r.nll());
            }
        }
        long t0 = System.nanoTime();
        FitResult result = store.run(ms, fp, guess, threads, r -> {
            done[0]++;
            if (r.status() != StartStatus.FAILED) {
                best[0] = Math.min(best[0], r.nll());
            }
            PrintWriter log = OutputOptions.log(spec);
            if (log != null) {
                // The terminal's progress bar redraws one line; the log gets one line per finished start.
                log.printf(Locale.ROOT, "start %d finished (%d/%d): %s, NLL %.10g, %d iterations%n", r.index(),
                        done[0], starts, r.status(), r.nll(), r.iterations());
                log.flush();
            }
            if (bar) {
                int width = 30;
                int filled = (int) ((long) width * done[0] / starts);
                err.printf(Locale.ROOT, "\r[%s%s] %d/%d starts, best NLL %.6g ", "#".repeat(filled),
                        " ".repeat(width - filled), done[0], starts, best[0]);
                err.flush();
            }
        });
        if (bar) {
            err.println();
        }
        double wall = (System.nanoTime() - t0) * 1e-9;
        PrintWriter o = spec.commandLine().getOut();
        List<SwitchingFit> switching = writeResults(problem, objective, result, wall);
        if (result.bestTheta() == null) {
            o.printf(Locale.ROOT, "all %d starts failed; see %s%n", starts, out.resolve("result.json"));
            o.flush();
            return 1;
        }
        o.printf(Locale.ROOT, "best NLL %.10g; %d of %d starts within %.1f of it; results in %s%n", result.bestNll(),
                result.startsNearBest(), starts, FitResult.NEAR_BEST_TOLERANCE, out);
        printParameters(o, problem, result.bestTheta());
        printThresholds(o, switching);
        o.flush();
        return 0;
    }

    /** Prints the problem's notes ({@link EstimationProblem#notes()}), one {@code warning:} line each. */
    static void printNotes(PrintWriter err, EstimationProblem problem) {
        for (String n : problem.notes()) {
            err.println("warning: " + n);
        }
        err.flush();
    }

    /**
     * The fit problem of a loaded problem (library entry point): the objective with the bounds and estimation scales
     * of the problem file, all parameters free. A uniform prior with explicit limits narrows the box to its support
     * (the prior density is 0 outside, PEtab v1), so starts are drawn, and steps taken, only where the NLL is finite.
     *
     * @param problem   the problem, e.g. from {@code ProblemLoader.load(path)}
     * @param objective its negative log-likelihood, e.g. {@code LikelihoodObjective.of(problem, settings)}
     * @return the problem for {@code Multistart}, {@code LevenbergMarquardt} and {@code ProfileLikelihood}
     */
    public static FitProblem fitProblem(EstimationProblem problem, LikelihoodObjective objective) {
        int np = problem.parameterCount();
        String[] ids = new String[np];
        double[] lo = new double[np];
        double[] hi = new double[np];
        ParameterScale[] sc = new ParameterScale[np];
        for (int j = 0; j < np; j++) {
            FreeParameter p = problem.parameters().get(j);
            ids[j] = p.id();
            lo[j] = p.thetaFeasibleLower();
            hi[j] = p.thetaFeasibleUpper();
            sc[j] = switch (p.scale()) {
                case LOG -> ParameterScale.LN;
                case LOG10 -> ParameterScale.LOG10;
                default -> ParameterScale.LINEAR;
            };
        }
        return FitProblem.of(objective, ids, lo, hi).withScales(sc);
    }

    /**
     * The best parameters, one per line, with a note for values on a bound or on the end of a uniform prior's support
     * (within 1e-6 of the estimation-scale range: the optimizer's bounds are exact, so such a value is the bound, and
     * its profile will be open there).
     */
    private static void printParameters(PrintWriter o, EstimationProblem problem, double[] th) {
        int w = 9;
        for (FreeParameter p : problem.parameters()) {
            w = Math.max(w, p.id().length());
        }
        for (int k = 0; k < th.length; k++) {
            FreeParameter p = problem.parameters().get(k);
            double lo = p.thetaFeasibleLower();
            double hi = p.thetaFeasibleUpper();
            double range = hi - lo;
            String note = th[k] <= lo + 1e-6 * range ? (lo > p.thetaLower() ? "  (at the lower end of its prior's "
                    + "support)" : "  (at the lower bound)")
                    : th[k] >= hi - 1e-6 * range ? (hi < p.thetaUpper() ? "  (at the upper end of its prior's "
                    + "support)" : "  (at the upper bound)") : "";
            o.printf(Locale.ROOT, "  %-" + w + "s %.6g%s%n", p.id(), p.toLinear(th[k]), note);
        }
    }

    /**
     * One line per measured switching threshold: the model's threshold at the best fit, how it is defined there
     * (a fold, or the steepest response of a monostable model), the measurement and the standardised residual.
     */
    static void printThresholds(PrintWriter o, List<SwitchingFit> switching) {
        for (SwitchingFit f : switching) {
            if (f.data() != SwitchingFit.Data.THRESHOLD) {
                continue;
            }
            o.printf(Locale.ROOT, "switch-%s threshold of %s in %s: model %.6g (%s), measured %.6g +- %.3g, residual "
                    + "%+.2f%n", f.direction().equals("up") ? "on" : "off", f.control(), f.experiment(), f.model(),
                    f.note().replace('_', ' '), f.measurement(), f.sigma(), f.residual());
        }
    }

    /**
     * Writes result.json and, when a start succeeded, residuals.csv, switching_residuals.csv (when the problem has
     * switching thresholds or dose responses), model_fitted.xml and trajectories.json.
     *
     * @return the switching data with the model's values at the best fit (empty when none or all starts failed)
     */
    private List<SwitchingFit> writeResults(EstimationProblem problem, LikelihoodObjective objective,
                                            FitResult result, double wall) {
        Map<String, String> versions = new LinkedHashMap<>();
        versions.put("switchfit", new Main.Version().getVersion()[0]);
        versions.put("java", System.getProperty("java.version"));
        // the checksums taken when the run opened its folder (the ones a resume checks), not a second hashing
        List<FitSummary.InputFile> inputs = identity.inputs();
        FitSummary.Settings settings = new FitSummary.Settings(starts, seed, solver.rtol, solver.atol, nominalStart,
                solver.costTolerance, solver.maxIterations, !solver.noClosedFormFactors);
        FitSummary summary = FitSummary.of(problem, result, settings, wall, versions, inputs);
        FitDirectory.of(out).write(FitFile.RESULT, summary);
        double[] th = result.bestTheta();
        if (th == null) {
            return List.of();
        }
        LikelihoodObjective.Evaluation ev = objective.evaluateDetailed(th);
        Csv csv = new Csv("experiment", "observable", "time", "measurement", "simulation", "sigma", "residual");
        for (int i = 0; i < problem.measurements().size(); i++) {
            Measurement me = problem.measurements().get(i);
            double s = ev.simulated()[i];
            double sig = ev.sigmas()[i];
            double res = SwitchingFit.standardised(problem.observables().get(me.observable()).transformation(),
                    me.value(), s, sig);
            csv.row(problem.experiments().get(me.experiment()).id(),
                    problem.observables().get(me.observable()).id(), me.time(), me.value(), s, sig, res);
        }
        csv.write(out.resolve(DataCounts.RESIDUALS));
        if (!ev.switching().isEmpty()) {
            switchingCsv(ev.switching()).write(out.resolve(DataCounts.SWITCHING_RESIDUALS));
        }
        Map<String, Double> values = new LinkedHashMap<>();
        for (int k = 0; k < problem.parameterCount(); k++) {
            values.put(problem.parameters().get(k).id(), problem.parameters().get(k).toLinear(th[k]));
        }
        SbmlWriter.writeWithValues(problem.modelFile(), out.resolve("model_fitted.xml"), values);
        writeTrajectories(objective, th);
        return ev.switching();
    }

    /**
     * The switching-threshold and dose-response data with the model's values: one row per datum, residual
     * {@code (measurement - model) / sigma} on the observable's scale (the sign convention of residuals.csv).
     */
    static Csv switchingCsv(List<SwitchingFit> rows) {
        Csv csv = new Csv(SwitchingFit.COLUMNS.toArray(new String[0]));
        for (SwitchingFit f : rows) {
            csv.row(f.values().toArray());
        }
        return csv;
    }

    /**
     * Fitted observables on a fine time grid with the data, for the report (trajectories.json). A simulation failure
     * here loses nothing already written; it is reported on stderr and the report skips the section.
     */
    private void writeTrajectories(LikelihoodObjective objective, double[] th) {
        try {
            TrajectoriesFile tf = FittedTrajectories.compute(objective, th, FittedTrajectories.DEFAULT_GRID);
            FitDirectory.of(out).write(FitFile.TRAJECTORIES, tf);
        } catch (RuntimeException e) {
            spec.commandLine().getErr().println("note: fitted trajectories not written (" + e.getMessage() + ")");
        }
    }
}
