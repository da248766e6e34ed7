package org.switchfit.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.switchfit.continuation.BistableRegion;
import org.switchfit.continuation.Branch;
import org.switchfit.continuation.ContinuationException;
import org.switchfit.continuation.ContinuationSettings;
import org.switchfit.continuation.Fold;
import org.switchfit.continuation.FoldCurve;
import org.switchfit.data.ProblemFileReader;
import org.switchfit.data.ProblemFileWriter;
import org.switchfit.data.SwitchfitProblem;
import org.switchfit.data.SwitchingThreshold;
import org.switchfit.objective.FoldPredictionSource;
import org.switchfit.objective.LikelihoodObjective;
import org.switchfit.ode.IntegrationException;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.report.BranchesFile;
import org.switchfit.report.FitDirectory;
import org.switchfit.report.FitFile;
import org.switchfit.report.FitSummary;
import org.switchfit.report.Json;
import org.switchfit.report.ProfilesFile;
import org.switchfit.report.SweepFile;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;
import picocli.CommandLine;

/**
 * The stages of {@code switchfit demo}, each a method calling the library or another command's Java entry point:
 * data, fit ({@link FitCommand}), profiles ({@link ProfileCommand}), branches, bistable region and hysteresis
 * sweep (the code of {@link BranchesCommand}, {@link RegionCommand} and {@link SweepCommand} on the fitted model,
 * written as fit-directory files), phase plane, report ({@link ReportCommand} plus the demo overview page). A stage whose code is not in this build says so (status {@link Status#NOT_AVAILABLE}); a stage
 * that fails is recorded as {@link Status#FAILED} with its message and the run goes on with what exists. Prints
 * one line per stage. Not thread-safe.
 */
final class DemoRun {
    /** Second parameter of the two-parameter bistable region, and its range (linear). */
    static final String REGION_PARAMETER = "k_rec";
    static final double REGION_LOW = 0.1;
    /** Upper ends tried in turn for the second parameter until the fold curve closes at a cusp inside the box. */
    static final double[] REGION_HIGHS = {10, 30, 100};
    /** Ramp speed of the hysteresis sweep (stimulus units per minute) and its samples. */
    static final double SWEEP_RATE = 0.005;
    static final int SWEEP_SAMPLES = 401;
    /** Duration of the phase-plane trajectories (minutes; about 10 relaxation times of the demo model). */
    static final double PHASE_DURATION = 300;
    /** Parameters profiled in quick mode (the full run profiles all). */
    static final List<String> QUICK_PROFILES = List.of("k_stim");
    /** Name of the problem file written when the objective of this build cannot use all the data. */
    static final String PARTIAL_PROBLEM = "problem/stress_switch-fitted-data.yaml";

    /** Run settings. */
    record Settings(Path model, Path problem, Path out, int starts, long seed, int threads, boolean quick) {
    }

    /** Outcome of one stage. */
    enum Status { DONE, NOT_AVAILABLE, FAILED }

    /** One stage's outcome, as printed and written to {@code stages.json}. */
    record Stage(String name, Status status, String message, double seconds) {
    }

    /** A parameter vector of the model with a label saying where it comes from. */
    record ParameterSet(String label, double[] p) {
    }

    /** What the stages computed (null where a stage did not run). */
    static final class Results {
        SwitchfitProblem problem;
        String dataUsed;
        FitSummary fit;
        ProfilesFile profiles;
        ParameterSet at;
        Branch branch;
        double[] branchQ;
        /** The branches command's set-up and start on the model the continuation stages use. */
        SwitchSetup setup;
        SwitchSetup.Start start;
        BistableRegion region;
        double regionHigh;
        FoldCurve foldCurve;
        SweepFile sweep;
    }

    /** A stage that could not complete; the message says why. */
    private static final class StageFailure extends RuntimeException {
        private static final long serialVersionUID = 1L;

        StageFailure(String message) {
            super(message);
        }
    }

    private final Settings s;
    private final PrintWriter out;
    private final List<Stage> stages = new ArrayList<>();
    private final FitDirectory dir;

    DemoRun(Settings s, PrintWriter out) {
        this.s = s;
        this.out = out;
        this.dir = FitDirectory.of(s.out());
    }

    /** Runs all stages; returns the exit code (0 when no stage failed). */
    int run() {
        DemoCommand.mkdirs(s.out());
        Results r = new Results();
        DemoModel dm = DemoModel.load(s.model());
        stage("data", () -> {
            r.problem = ProblemFileReader.read(s.problem());
            return String.format(Locale.ROOT, "%s: %d timecourse points, %d dose-response points, %d thresholds, "
                            + "%d parameters to estimate (SYNTHETIC)", s.problem(), r.problem.timecourses().size(),
                    r.problem.doseResponses().size(), r.problem.thresholds().size(), r.problem.parameters().size());
        });
        if (r.problem == null) {
            throw new UserInputException(SourceLocation.ofFile(s.problem().toString()), "the demo data set could not "
                    + "be read; regenerate it with 'switchfit demo --regenerate-data'");
        }
        stage("fit", () -> fit(dm, r));
        if (r.fit != null) {
            stage("profiles", () -> profiles(r));
        } else {
            skipped("profiles", "skipped: needs a finished fit");
        }
        if (r.at == null) {
            r.at = new ParameterSet("true values (the model file's nominal values, known because the data are "
                    + "synthetic; used because the fit stage did not finish)", dm.nominal());
        }
        out.println("          continuation stages at the " + r.at.label());
        stage("branches", () -> branches(dm, r));
        stage("region", () -> region(dm, r));
        stage("sweep", () -> sweep(dm, r));
        stage("phase", () -> phasePlane(dm, r));
        Path report = s.out().resolve("report.html");
        Path overview = s.out().resolve("demo.html");
        stage("report", () -> {
            StringWriter log = new StringWriter();
            int code = command(new ReportCommand(), log, s.out().toString());
            if (code != 0) {
                throw new StageFailure("report command exited with " + code + ": " + log.toString().strip());
            }
            DemoReport.write(overview, dm, r, stages, s);
            return report + " (demo overview: " + overview.getFileName() + ")";
        });
        Json.write(s.out().resolve("stages.json"), stagesJson());
        out.println("report: " + report.toAbsolutePath().normalize());
        out.println("next:   ./switchfit audit " + s.out() + "    (a reviewer's check: re-derives every claim of the "
                + "fit from the model and data on disk)");
        out.flush();
        return stages.stream().anyMatch(st -> st.status() == Status.FAILED) ? Main.EXIT_INTERNAL : 0;
    }

    /** The stages so far. */
    List<Stage> stages() {
        return List.copyOf(stages);
    }

    /**
     * Fit stage: {@code switchfit fit} on the demo problem. When the objective of this build rejects part of the
     * data (dose-responses and thresholds need residual blocks that may be missing), the fit runs on the data it
     * accepts, written as {@link #PARTIAL_PROBLEM}, and the stage message says which data were left out.
     */
    private String fit(DemoModel dm, Results r) {
        Path problemFile = s.problem();
        r.dataUsed = "all data";
        try {
            LikelihoodObjective.of(ProblemLoader.fromSwitchfit(r.problem), SimulateCommand.settings("bdf", 1e-8,
                    1e-12));
        } catch (UserInputException e) {
            SwitchfitProblem p = r.problem;
            problemFile = s.out().resolve(PARTIAL_PROBLEM).toAbsolutePath();
            DemoCommand.mkdirs(problemFile.getParent());
            ProblemFileWriter.write(new SwitchfitProblem(problemFile, p.formatVersion(),
                    p.modelFile().toAbsolutePath(), p.parameters(), p.experiments(), p.observables(), p.timecourses(),
                    List.of(), List.of(), List.of()), problemFile);
            r.dataUsed = "timecourses only: the objective in this build does not take the " + p.doseResponses().size()
                    + " dose-response points and " + p.thresholds().size() + " thresholds (" + e.getMessage() + ")";
        }
        clear(s.out().resolve("starts"));
        clear(s.out().resolve("profiles"));
        StringWriter log = new StringWriter();
        int code = command(new FitCommand(), log, problemFile.toString(), "--out", s.out().toString(), "--starts",
                Integer.toString(s.starts()), "--seed", Long.toString(s.seed()), "--threads",
                Integer.toString(s.threads()), "--quiet");
        if (code != 0 || !dir.has(FitFile.RESULT)) {
            throw new StageFailure("fit command exited with " + code + ": " + log.toString().strip());
        }
        r.fit = dir.read(FitFile.RESULT);
        double[] p = dm.nominal();
        for (Map.Entry<String, Double> e : r.fit.parameters().entrySet()) {
            int k = dm.compiled.parameterIndex(e.getKey());
            if (k >= 0 && e.getValue() != null) {
                p[k] = e.getValue();
            }
        }
        r.at = new ParameterSet("best fit (" + (r.dataUsed.equals("all data") ? "all data" : "timecourses only")
                + ")", p);
        return String.format(Locale.ROOT, "best NLL %.8g, %d of %d starts within %.1f of it; data used: %s",
                r.fit.bestNll(), r.fit.startsNearBest(), s.starts(), r.fit.nearBestTolerance(), r.dataUsed);
    }

    /** Profile stage: {@code switchfit profile} on the fit directory (fold positions when this build has them). */
    private String profiles(Results r) {
        List<String> args = new ArrayList<>(List.of(s.out().toString(), "--threads", Integer.toString(s.threads()),
                "--seed", Long.toString(s.seed())));
        if (s.quick()) {
            args.add("--parameters");
            args.add(String.join(",", QUICK_PROFILES));
        }
        boolean folds = FoldPredictionSource.find().isPresent();
        if (folds) {
            args.add("--folds");
        }
        StringWriter log = new StringWriter();
        int code = command(new ProfileCommand(), log, args.toArray(new String[0]));
        if (code != 0 || !dir.has(FitFile.PROFILES)) {
            throw new StageFailure("profile command exited with " + code + ": " + log.toString().strip());
        }
        r.profiles = dir.read(FitFile.PROFILES);
        StringBuilder b = new StringBuilder();
        for (ProfilesFile.Entry e : r.profiles.profiles()) {
            b.append(String.format(Locale.ROOT, "%n            %-10s %-9s [%s, %s] %s", e.id(),
                    e.kind().token(), e.lower() == null ? "-inf" : fmt(e.lower()),
                    e.upper() == null ? "+inf" : fmt(e.upper()), e.classification().token()));
        }
        return String.format(Locale.ROOT, "%d profiles at level %.2f%s%s", r.profiles.profiles().size(),
                r.profiles.level(), folds ? "" : "; fold-position profiles not available in this build", b);
    }

    /**
     * Branches stage: the branches command's own code ({@link SwitchSetup}, {@link BranchesCommand#toFile}) on the
     * fitted model {@code model_fitted.xml} (the demo model with its nominal values when the fit did not finish),
     * with the measured thresholds of the data set attached to the folds they measure.
     */
    private String branches(DemoModel dm, Results r) {
        Path fitted = dir.path().resolve("model_fitted.xml");
        SwitchSetup setup = new SwitchSetup();
        setup.modelFile = r.fit != null && Files.isRegularFile(fitted) ? fitted : s.model();
        setup.vary = DemoScenario.CONTROL;
        setup.from = DemoScenario.STIMULUS_LOW;
        setup.to = DemoScenario.STIMULUS_HIGH;
        SwitchSetup.Start st = setup.start();
        r.branch = setup.branch(st, SwitchSetup.settings(st.control, setup.from, setup.to));
        r.branchQ = st.q;
        r.setup = setup;
        r.start = st;
        BranchesFile traced = BranchesCommand.toFile(st, r.branch, setup.from, setup.to);
        StringBuilder msg = new StringBuilder();
        Map<String, String> foldIds = BranchesCommand.foldIdsByDirection(r.branch, traced);
        for (Fold f : r.branch.folds()) {
            msg.append(String.format(Locale.ROOT, "%s%.10g", msg.length() == 0 ? "" : ", ", f.parameter()));
        }
        List<BranchesFile.Threshold> th = new ArrayList<>();
        int n = 0;
        for (SwitchingThreshold t : r.problem.thresholds()) {
            String dir = t.direction().name().toLowerCase(Locale.ROOT);
            th.add(new BranchesFile.Threshold("threshold" + (++n), t.value(), t.sigma(), dir, foldIds.get(dir)));
        }
        dir.write(FitFile.BRANCHES, new BranchesFile(traced.control(), traced.range(), traced.stateIds(),
                traced.folds(), traced.branches(), th));
        return String.format(Locale.ROOT, "%d points, %d folds%s%s (model %s)", r.branch.size(),
                r.branch.folds().size(), msg.length() == 0 ? "" : " at stimulus ", msg, setup.modelFile);
    }

    /**
     * Region stage: the region command's computation ({@link RegionCommand#trace}) from the first fold of the
     * branch, widening the range of the second parameter until the fold curve closes at a cusp inside the box
     * (without a cusp the traced curve is one fold branch only, and the polygon it closes along the box edge is not
     * the bistable region).
     */
    private String region(DemoModel dm, Results r) {
        if (r.branch == null || r.branch.folds().isEmpty() || r.start == null) {
            throw new StageFailure("no fold on the branch, so no bistable region to trace");
        }
        SwitchSetup.Start st = r.start;
        RegionCommand.Traced t = null;
        double high = REGION_HIGHS[0];
        try {
            ControlQuantity c2 = ControlQuantity.resolve(st.sm, REGION_PARAMETER, "--and",
                    st.sm.reduced.fullState(st.x, st.q), st.q, st.pEff);
            ContinuationSettings cs = SwitchSetup.settings(st.control, r.setup.from, r.setup.to);
            for (double h : REGION_HIGHS) {
                high = h;
                t = RegionCommand.trace(r.setup, st, r.branch, c2, REGION_LOW, high, cs);
                if (!t.curve().cusps().isEmpty()) {
                    break;
                }
            }
        } catch (UserInputException e) {
            throw new StageFailure(e.getMessage());
        }
        if (t == null || t.curve().cusps().isEmpty()) {
            throw new StageFailure(String.format(Locale.ROOT, "no cusp of the fold curve for %s in [%.3g, %.3g], so "
                    + "the bistable region is not closed there", REGION_PARAMETER, REGION_LOW, high));
        }
        r.foldCurve = t.curve();
        r.region = t.region();
        r.regionHigh = high;
        dir.write(FitFile.REGION, t.file());
        return String.format(Locale.ROOT, "%d fold-curve points, %d cusp(s), area %.4g in (%s, %s)",
                r.foldCurve.points().size(), r.region.cusps().size(), r.region.area(), DemoScenario.CONTROL,
                REGION_PARAMETER);
    }

    /**
     * Sweep stage: the sweep command's computation ({@link SweepCommand#sweep}) on the model of the branch stage,
     * ZarnA followed, ramps between the ends of the branch range.
     */
    private String sweep(DemoModel dm, Results r) {
        if (r.start == null) {
            throw new StageFailure("needs the branch stage's model and steady state");
        }
        try {
            r.sweep = SweepCommand.sweep(r.setup, r.start, "ZarnA", SWEEP_RATE, s.quick() ? 101 : SWEEP_SAMPLES);
        } catch (UserInputException e) {
            throw new StageFailure(e.getMessage());
        }
        dir.write(FitFile.SWEEP, r.sweep);
        SweepFile.Run up = r.sweep.runs().get(0);
        SweepFile.Run down = r.sweep.runs().get(1);
        return String.format(Locale.ROOT, "ramp at %.3g per min: jumps at stimulus %.4g (up) and %.4g (down)",
                SWEEP_RATE, up.jumps().get(0).value(), down.jumps().get(0).value());
    }

    /**
     * Phase-plane stage: the model reduced by its two conservation laws to the two independent species (exact, no
     * state held), at the fitted parameters and the stimulus midway between the two folds (bistable there), with
     * nullclines, steady states and trajectories from the window's corners and edge midpoints.
     */
    private String phasePlane(DemoModel dm, Results r) {
        double[] p = r.at.p().clone();
        int k = dm.index(DemoScenario.CONTROL);
        double stim = p[k];
        if (r.branch != null && r.branch.folds().size() >= 2) {
            stim = 0.5 * (r.branch.folds().get(0).parameter() + r.branch.folds().get(1).parameter());
        }
        p[k] = stim;
        double[] low = DemoScenario.lowState(dm, p);
        double[] q = dm.reducedParameters(p, low);
        int[] ind = dm.reduced.laws().independentSpecies();
        if (ind.length != 2) {
            throw new StageFailure("the model reduces to " + ind.length + " states, not 2: no phase plane");
        }
        double[] totals = dm.reduced.laws().totals(low);
        double[][] range = new double[2][];
        List<String> ids = new ArrayList<>();
        for (int a = 0; a < 2; a++) {
            double hi = 0;
            for (int c = 0; c < totals.length; c++) {
                long coef = dm.reduced.laws().coefficients(c)[ind[a]];
                if (coef != 0) {
                    hi = Math.max(hi, totals[c] / coef);
                }
            }
            range[a] = new double[] {0, hi > 0 ? hi : 1};
            ids.add(dm.states.get(ind[a]));
        }
        StringBuilder elim = new StringBuilder();
        for (int c = 0; c < totals.length; c++) {
            elim.append(String.format(Locale.ROOT, "%s%s follows from the conserved total %.4g", c == 0 ? "" : "; ",
                    dm.states.get(dm.reduced.laws().dependentSpecies()[c]), totals[c]));
        }
        org.switchfit.report.PhasePlaneFile pp = org.switchfit.report.PhasePlanes.compute(dm.reduced, q,
                dm.reduced.reducedState(low), ids, 0, 1, range[0], range[1], PHASE_DURATION, null)
                .withNote(String.format(Locale.ROOT, "The model is reduced exactly by its conservation laws (%s); "
                        + "%s = %.4g, midway between the two folds.", elim, DemoScenario.CONTROL, stim));
        dir.write(FitFile.PHASE_PLANE, pp);
        long stable = pp.steadyStates().stream().filter(org.switchfit.report.PhasePlaneFile.SteadyPoint::stable)
                .count();
        return String.format(Locale.ROOT, "%s vs %s at %s = %.4g: %d steady states (%d stable), %d trajectories",
                ids.get(0), ids.get(1), DemoScenario.CONTROL, stim, pp.steadyStates().size(), stable,
                pp.trajectories().size());
    }

    /** Runs a command object through picocli with its output captured in {@code log}; returns the exit code. */
    private static int command(Object cmd, StringWriter log, String... args) {
        CommandLine cl = Main.configure(new CommandLine(cmd));
        PrintWriter w = new PrintWriter(log, true);
        cl.setOut(w);
        cl.setErr(w);
        cl.setExecutionExceptionHandler((ex, c, pr) -> {
            w.println("error: " + ex.getMessage());
            return ex instanceof UserInputException ? Main.EXIT_USER_ERROR : Main.EXIT_INTERNAL;
        });
        return cl.execute(args);
    }

    /** Deletes a folder of an earlier demo run in the output folder (starts or profiles). */
    private static void clear(Path folder) {
        if (!Files.isDirectory(folder)) {
            return;
        }
        try (var walk = Files.walk(folder)) {
            for (Path f : walk.sorted(Comparator.reverseOrder()).toList()) {
                Files.delete(f);
            }
        } catch (IOException e) {
            throw new UserInputException(SourceLocation.ofFile(folder.toString()), "holds results of an earlier run "
                    + "that cannot be removed (" + e.getMessage() + "); delete it or choose another --out", e);
        }
    }

    private static String fmt(double v) {
        return String.format(Locale.ROOT, "%.4g", v);
    }

    private interface Body {
        String run();
    }

    private void stage(String name, Body body) {
        long t0 = System.nanoTime();
        Status st;
        String msg;
        try {
            msg = body.run();
            st = Status.DONE;
        } catch (ContinuationException | IntegrationException | StageFailure e) {
            msg = e.getMessage();
            st = Status.FAILED;
        }
        double sec = (System.nanoTime() - t0) * 1e-9;
        stages.add(new Stage(name, st, msg, sec));
        out.printf(Locale.ROOT, "%-9s %-6s %6.1f s  %s%n", name, st == Status.DONE ? "done" : st == Status.FAILED
                ? "FAILED" : "n/a", sec, msg);
        out.flush();
    }

    private void skipped(String name, String why) {
        stages.add(new Stage(name, Status.NOT_AVAILABLE, why, 0));
        out.printf(Locale.ROOT, "%-9s %-6s %6s    %s%n", name, "n/a", "", why);
        out.flush();
    }

    private Map<String, Object> stagesJson() {
        Map<String, Object> j = new LinkedHashMap<>();
        j.put("synthetic", true);
        List<Map<String, Object>> l = new ArrayList<>();
        for (Stage st : stages) {
            Map<String, Object> e = new LinkedHashMap<>();
            e.put("name", st.name());
            e.put("status", st.status().name());
            e.put("message", st.message());
            e.put("seconds", st.seconds());
            l.add(e);
        }
        j.put("stages", l);
        Map<String, Object> set = new LinkedHashMap<>();
        set.put("starts", s.starts());
        set.put("seed", s.seed());
        set.put("threads", s.threads());
        set.put("quick", s.quick());
        j.put("settings", set);
        return j;
    }
}
