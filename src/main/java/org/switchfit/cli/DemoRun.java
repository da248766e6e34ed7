package org.switchfit.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.switchfit.continuation.BistableRegion;
import org.switchfit.continuation.Branch;
import org.switchfit.continuation.BranchPoint;
import org.switchfit.continuation.ContinuationException;
import org.switchfit.continuation.ContinuationSettings;
import org.switchfit.continuation.Fold;
import org.switchfit.continuation.FoldCurve;
import org.switchfit.continuation.FoldCurves;
import org.switchfit.continuation.HysteresisSweep;
import org.switchfit.continuation.SweepResult;
import org.switchfit.data.EstimatedParameter;
import org.switchfit.data.ProblemFileReader;
import org.switchfit.data.SwitchfitProblem;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.Integrators;
import org.switchfit.ode.SolverSettings;
import org.switchfit.report.Json;
import org.switchfit.util.UserInputException;

/**
 * The stages of {@code switchfit demo}, each a method calling the library: data, fit, profiles, branches, bistable
 * region, hysteresis sweep, report. A stage whose library code is not in this build says so (status
 * {@link Status#NOT_AVAILABLE}) and the later stages use what exists; a stage that fails numerically is recorded
 * as {@link Status#FAILED} with its message and the run goes on. Prints one line per stage. Not thread-safe.
 */
final class DemoRun {
    /** Second parameter of the two-parameter bistable region, and its range (linear). */
    static final String REGION_PARAMETER = "K_inh";
    static final double REGION_LOW = 0.1;
    static final double REGION_HIGH = 1.0;
    /** Ramp speed of the hysteresis sweep (stimulus units per minute) and its samples. */
    static final double SWEEP_RATE = 0.005;
    static final int SWEEP_SAMPLES = 401;

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
        ParameterSet at;
        Branch branch;
        double[] branchQ;
        BistableRegion region;
        FoldCurve foldCurve;
        SweepResult up;
        SweepResult down;
    }

    private final Settings s;
    private final PrintWriter out;
    private final List<Stage> stages = new ArrayList<>();

    DemoRun(Settings s, PrintWriter out) {
        this.s = s;
        this.out = out;
    }

    /** Runs all stages; returns the exit code (0 unless the report could not be written). */
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
            throw new UserInputException(null, "the demo data set " + s.problem() + " could not be read; regenerate "
                    + "it with 'switchfit demo --regenerate-data'");
        }
        stageFit(r);
        stageProfiles(r);
        if (r.at == null) {
            r.at = new ParameterSet("true values (the model file's nominal values, known because the data are "
                    + "synthetic; used because no fit is available in this build)", dm.nominal());
        }
        out.println("        continuation stages at the " + r.at.label());
        stage("branches", () -> branches(dm, r));
        stage("region", () -> region(dm, r));
        stage("sweep", () -> sweep(dm, r));
        Path report = s.out().resolve("report.html");
        stage("report", () -> {
            DemoReport.write(report, dm, r, stages, s);
            return report.toString();
        });
        Json.write(s.out().resolve("stages.json"), stagesJson());
        out.println("report: " + report.toAbsolutePath().normalize());
        out.flush();
        return stages.get(stages.size() - 1).status() == Status.DONE ? 0 : Main.EXIT_INTERNAL;
    }

    /** The stages so far. */
    List<Stage> stages() {
        return List.copyOf(stages);
    }

    /**
     * Fit stage: multistart Levenberg-Marquardt on the likelihood of the problem, including the switching
     * thresholds and the dose-responses from both histories. The objective that joins this problem to the model
     * (timecourses with settle-in, steady-state dose-responses, threshold residuals) is not part of this build.
     */
    private void stageFit(Results r) {
        notAvailable("fit", "needs the likelihood objective with threshold and dose-response residual blocks "
                + "(org.switchfit.objective), which is not in this build");
    }

    /** Profile stage: parameter and fold-position profiles at the best fit; needs the fit stage. */
    private void stageProfiles(Results r) {
        notAvailable("profiles", "needs the fit stage (best fit and its objective)");
    }

    private String branches(DemoModel dm, Results r) {
        double[] low = DemoScenario.lowState(dm, r.at.p());
        r.branch = dm.branch(r.at.p(), low, DemoScenario.CONTROL, DemoScenario.STIMULUS_LOW,
                DemoScenario.STIMULUS_HIGH);
        double[] p0 = r.at.p().clone();
        p0[dm.index(DemoScenario.CONTROL)] = DemoScenario.STIMULUS_LOW;
        r.branchQ = dm.reducedParameters(p0, dm.settle(p0, low));
        Map<String, Object> j = new LinkedHashMap<>();
        j.put("synthetic", true);
        j.put("parameters", r.at.label());
        j.put("control", DemoScenario.CONTROL);
        List<Map<String, Object>> pts = new ArrayList<>();
        for (BranchPoint bp : r.branch.points()) {
            double[] y = dm.reduced.fullState(bp.state(), r.branchQ);
            Map<String, Object> e = new LinkedHashMap<>();
            e.put("stimulus", bp.parameter());
            e.put("act_frac", DemoScenario.actFrac(dm, y));
            e.put("state", y);
            e.put("stable", bp.unstableCount() < 0 ? null : bp.stable());
            pts.add(e);
        }
        j.put("stateIds", dm.states);
        j.put("points", pts);
        List<Map<String, Object>> folds = new ArrayList<>();
        StringBuilder msg = new StringBuilder();
        for (Fold f : r.branch.folds()) {
            Map<String, Object> e = new LinkedHashMap<>();
            e.put("stimulus", f.parameter());
            e.put("act_frac", DemoScenario.actFrac(dm, dm.reduced.fullState(f.state(), r.branchQ)));
            e.put("refined", f.refined());
            folds.add(e);
            msg.append(String.format(Locale.ROOT, "%s%.10g", msg.length() == 0 ? "" : ", ", f.parameter()));
        }
        j.put("folds", folds);
        j.put("ends", List.of(r.branch.startEnd().name(), r.branch.finishEnd().name()));
        Json.write(s.out().resolve("branches.json"), j);
        return String.format(Locale.ROOT, "%d points, %d folds%s%s", r.branch.size(), r.branch.folds().size(),
                folds.isEmpty() ? "" : " at stimulus ", msg);
    }

    private String region(DemoModel dm, Results r) {
        if (r.branch == null || r.branch.folds().isEmpty()) {
            throw new ContinuationException("no fold on the branch, so no bistable region to trace");
        }
        int k2 = dm.index(REGION_PARAMETER);
        ContinuationSettings cs = ContinuationSettings.of(DemoScenario.STIMULUS_LOW, DemoScenario.STIMULUS_HIGH)
                .withSteps(0.01, 1e-9, s.quick() ? 0.1 : 0.04);
        r.foldCurve = new FoldCurves(cs, REGION_LOW, REGION_HIGH).trace(dm.reduced, r.branch.folds().get(0),
                r.branchQ, k2);
        r.region = BistableRegion.of(r.foldCurve, DemoScenario.STIMULUS_LOW, DemoScenario.STIMULUS_HIGH,
                REGION_LOW, REGION_HIGH);
        Map<String, Object> j = new LinkedHashMap<>();
        j.put("synthetic", true);
        j.put("parameters", r.at.label());
        j.put("axes", List.of(DemoScenario.CONTROL, REGION_PARAMETER));
        j.put("box", new double[] {DemoScenario.STIMULUS_LOW, DemoScenario.STIMULUS_HIGH, REGION_LOW, REGION_HIGH});
        j.put("polygon", r.region.polygon());
        List<double[]> cusps = new ArrayList<>();
        for (FoldCurve.Cusp c : r.region.cusps()) {
            cusps.add(new double[] {c.p1(), c.p2()});
        }
        j.put("cusps", cusps);
        j.put("closedByChord", r.region.closedByChord());
        j.put("area", r.region.area());
        Json.write(s.out().resolve("region.json"), j);
        return String.format(Locale.ROOT, "%d fold-curve points, %d cusp(s), area %.4g in (%s, %s)",
                r.foldCurve.points().size(), r.region.cusps().size(), r.region.area(), DemoScenario.CONTROL,
                REGION_PARAMETER);
    }

    private String sweep(DemoModel dm, Results r) {
        HysteresisSweep hs = new HysteresisSweep(Integrators.create(SolverSettings.defaults()
                .withTolerances(1e-8, 1e-10)), s.quick() ? 101 : SWEEP_SAMPLES);
        double[] p = r.at.p();
        int k = dm.index(DemoScenario.CONTROL);
        double[] low = DemoScenario.lowState(dm, p);
        double[] high = DemoScenario.highState(dm, p);
        double[] q = dm.reducedParameters(p, low);
        double[] c = dm.reducedReadout(dm.speciesReadout("ZarnA"), q);
        r.up = hs.run(dm.reduced, dm.reduced.reducedState(low), q, k, DemoScenario.STIMULUS_LOW,
                DemoScenario.STIMULUS_HIGH, SWEEP_RATE, c);
        r.down = hs.run(dm.reduced, dm.reduced.reducedState(high), q, k, DemoScenario.STIMULUS_HIGH,
                DemoScenario.STIMULUS_LOW, SWEEP_RATE, c);
        Map<String, Object> j = new LinkedHashMap<>();
        j.put("synthetic", true);
        j.put("parameters", r.at.label());
        j.put("readout", "ZarnA");
        j.put("rate", SWEEP_RATE);
        j.put("up", sweepJson(r.up));
        j.put("down", sweepJson(r.down));
        Json.write(s.out().resolve("sweep.json"), j);
        return String.format(Locale.ROOT, "ramp at %.3g per min: jumps at stimulus %.4g (up) and %.4g (down)",
                SWEEP_RATE, r.up.jumpParameter(), r.down.jumpParameter());
    }

    private static Map<String, Object> sweepJson(SweepResult sr) {
        Map<String, Object> m = new LinkedHashMap<>();
        m.put("rate", sr.rate());
        m.put("stimulus", sr.parameter());
        m.put("ZarnA", sr.readout());
        m.put("jump", sr.jumpParameter());
        return m;
    }

    /** Start values of the problem file on the linear scale, by id. */
    static Map<String, Double> startValues(SwitchfitProblem problem) {
        Map<String, Double> m = new LinkedHashMap<>();
        for (EstimatedParameter e : problem.parameters()) {
            m.put(e.id(), e.start());
        }
        return m;
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
        } catch (ContinuationException | IntegrationException e) {
            msg = e.getMessage();
            st = Status.FAILED;
        }
        double sec = (System.nanoTime() - t0) * 1e-9;
        stages.add(new Stage(name, st, msg, sec));
        out.printf(Locale.ROOT, "%-9s %-14s %6.1f s  %s%n", name, st == Status.DONE ? "done" : st == Status.FAILED
                ? "FAILED" : "n/a", sec, msg);
        out.flush();
    }

    private void notAvailable(String name, String why) {
        stages.add(new Stage(name, Status.NOT_AVAILABLE, "not available in this build: " + why, 0));
        out.printf(Locale.ROOT, "%-9s %-14s %6s    %s%n", name, "n/a", "", "not available in this build: " + why);
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
