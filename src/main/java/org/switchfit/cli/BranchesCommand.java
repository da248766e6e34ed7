package org.switchfit.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.switchfit.continuation.Branch;
import org.switchfit.continuation.BranchPoint;
import org.switchfit.continuation.ContinuationSettings;
import org.switchfit.continuation.Fold;
import org.switchfit.continuation.Hopf;
import org.switchfit.continuation.LinearAlgebra;
import org.switchfit.continuation.ScaledSystem;
import org.switchfit.report.BranchesFile;
import org.switchfit.report.ContinuationFiles;
import org.switchfit.report.Json;
import org.switchfit.util.AtomicFiles;
import org.switchfit.util.UserInputException;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/**
 * {@code switchfit branches}: pseudo-arclength continuation of the steady states in one control quantity, both
 * directions from the steady state at the start value, with folds (refined) and Hopf points. Prints one line per
 * fold or Hopf point and a summary; writes {@code branches.json} content ({@link BranchesFile}) and a CSV. The
 * continuation runs on the model's state vector (species amounts, see {@code OdeForm}); states are written as
 * {@code simulate} reports them: concentrations for species with hasOnlySubstanceUnits=false, amounts otherwise,
 * with the compartment size of each point (it may be the control).
 */
@Command(name = "branches", mixinStandardHelpOptions = true,
        footer = {"", "Examples:", "  switchfit branches models/stress_switch.xml --vary stimulus --from 0 --to 4 --json branches.json", "  switchfit branches fits/mine --vary stimulus --from 0 --to 4", "  switchfit branches fits/mine/model_fitted.xml --vary stimulus --from 0 --to 4 --set k_rec=2"},
        description = "Trace the steady states of an SBML model against one control quantity and report its folds "
                + "(switching points) and Hopf points. Given a fit folder, the fitted model is traced and "
                + "branches.json is written into the folder with the measured switching thresholds beside the folds.")
public final class BranchesCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Mixin
    SwitchSetup setup;

    @Option(names = "--json", paramLabel = "FILE", description = "write branches and folds as JSON")
    Path json;

    @Option(names = "--csv", paramLabel = "FILE", description = "write one row per branch point as CSV")
    Path csv;

    @Option(names = "--max-points", defaultValue = "2000", paramLabel = "N",
            description = "point limit per direction (default: ${DEFAULT-VALUE})")
    int maxPoints;

    @Option(names = "--lu", defaultValue = "auto", paramLabel = "KIND", converter = LuKindConverter.class,
            description = "LU factorisation of the continuation's Newton and tangent systems: auto (sparse when "
                    + "the bordered Jacobian has order >= 100 and under 10 %% non-zeros), dense or sparse "
                    + "(default: ${DEFAULT-VALUE})")
    LinearAlgebra lu = LinearAlgebra.AUTO;

    /** Parses auto, dense, sparse (any case). */
    static final class LuKindConverter implements picocli.CommandLine.ITypeConverter<LinearAlgebra> {
        @Override
        public LinearAlgebra convert(String value) {
            for (LinearAlgebra k : LinearAlgebra.values()) {
                if (k.name().equalsIgnoreCase(value.strip())) {
                    return k;
                }
            }
            throw new picocli.CommandLine.TypeConversionException("'" + value + "' is not one of auto, dense, "
                    + "sparse");
        }
    }

    @Override
    public Integer call() {
        if (maxPoints < 2) {
            throw new UserInputException(null, "--max-points " + maxPoints + ": need at least 2");
        }
        long t0 = System.nanoTime();
        SwitchSetup.Start s = setup.start();
        SwitchSetup.printCaveats(s, false, spec.commandLine().getErr());
        ContinuationSettings cs = SwitchSetup.settings(s.control, setup.from, setup.to).withMaxPoints(maxPoints)
                .withLinearAlgebra(lu);
        long t1 = System.nanoTime();
        ScaledSystem sc = scaled(s, cs);
        Branch b = traceScaled(setup, s, sc, cs);
        long t2 = System.nanoTime();
        BranchesFile file = toFile(s, b, setup.from, setup.to, sc);
        PrintWriter out = spec.commandLine().getOut();
        for (BranchesFile.Special sp : file.folds()) {
            out.printf(Locale.ROOT, "%s: %s at %s = %.15g%s%n", sp.id(), sp.kind() == BranchesFile.Kind.FOLD
                    ? "fold" : "Hopf point", sp.parameter(), sp.value(), note(b, sp));
        }
        out.printf(Locale.ROOT, "%d points from %s = %s, %d fold(s), %d Hopf point(s); ends: %s, %s; "
                        + "load %.2f s, compile %.2f s, laws %.2f s (%d), active network %.2f s, steady state %.2f s, "
                        + "continuation %.2f s%n",
                b.size(), s.control.label(), SwitchSetup.fmt(s.startValue), b.folds().size(), b.hopfs().size(),
                b.startEnd(), b.finishEnd(), s.timing[0], s.timing[1], s.timing[2], s.sm.laws.lawCount(),
                s.timing[4], s.timing[3], (t2 - t1) * 1e-9);
        if (b.startEnd() == Branch.EndReason.MAX_POINTS || b.finishEnd() == Branch.EndReason.MAX_POINTS) {
            out.printf(Locale.ROOT, "note: a direction stopped at the point limit (%d) before the end of the "
                    + "range; raise --max-points to trace further%n", maxPoints);
        }
        if (b.startEnd() == Branch.EndReason.STEP_TOO_SMALL || b.finishEnd() == Branch.EndReason.STEP_TOO_SMALL) {
            out.printf(Locale.ROOT, "note: a direction stopped because the step fell below the minimum (the "
                    + "branch may end at a singular point, or the model may be stiff there); narrow the range "
                    + "or check the model near the last point%n");
        }
        out.printf(Locale.ROOT, "continuation: %d reduced states, %s linear algebra, %.1f ms per point%n",
                s.sm.reduced.stateCount(), SwitchSetup.usesSparseLu(sc, cs) ? "sparse" : "dense",
                b.size() > 0 ? (t2 - t1) * 1e-6 / b.size() : 0.0);
        double[] res = fullResiduals(s, b, sc);
        if (s.sm.network != null) {
            org.switchfit.continuation.ActiveNetwork net = s.sm.network;
            out.printf(Locale.ROOT, "active network: %d of %d reactions cannot fire; states held: %d at zero, %d "
                            + "passive, %d numerically passive, %d spanning numerically singular directions; %d "
                            + "reduced states (max |f| of held states along the branch %.3g)%n",
                    net.inactiveReactionCount(), s.sm.model.reactions().size(), net.zeroFaceCount(),
                    net.passiveCount(), net.frozenCount(), net.singularCount(), s.sm.reduced.stateCount(), res[1]);
        }
        out.printf(Locale.ROOT, "check: max |f| of the full model over all states and branch points %.3g%n", res[0]);
        int withEig = 0;
        int partial = 0;
        int unstable = 0;
        for (BranchPoint bp : b.points()) {
            if (bp.unstableCount() >= 0) {
                withEig++;
                partial += bp.eigenReal().length < s.sm.reduced.stateCount() ? 1 : 0;
                unstable += bp.unstableCount() > 0 ? 1 : 0;
            }
        }
        if (withEig > 0) {
            out.printf(Locale.ROOT, "stability: known at %d of %d points (%d unstable); %d from all eigenvalues, %d "
                    + "from the dominant eigenvalues of the Cayley transform (written with those eigenvalues "
                    + "only)%s%n", withEig, b.size(), unstable, withEig - partial, partial, withEig < b.size()
                    ? "; at the others no eigenvalue method converged and the point is written with stable = null "
                    + "(unknown)" : "");
        }
        if (b.size() > 0 && b.point(0).unstableCount() < 0) {
            out.println(s.sm.reduced.stateCount() > cs.eigenvalueLimit()
                    ? "stability not computed: the reduced system has " + s.sm.reduced.stateCount()
                    + " states, above the eigenvalue limit of the continuation settings"
                    : "stability not computed: the eigenvalue iteration did not converge");
        }
        Path jsonOut = setup.output(json, "branches.json");
        if (setup.fitDir() != null) {
            try {
                file = withMeasuredThresholds(file, b, out);
            } catch (UserInputException e) {
                // the branch is computed: write it without the thresholds rather than lose it
                PrintWriter err = spec.commandLine().getErr();
                err.println("warning: measured thresholds not attached: " + e.getMessage());
                err.flush();
            }
        }
        out.flush();
        if (jsonOut != null) {
            Json.write(jsonOut, file);
            out.printf("branches written to %s%n", jsonOut);
            out.flush();
        }
        if (csv != null) {
            AtomicFiles.writeString(csv, toCsv(file));
        }
        return 0;
    }

    /**
     * Traces the steady-state branch of an SBML model over a control range, as {@code switchfit branches} does
     * (library entry point): conservation laws are found and eliminated, the steady state at the model's control
     * value (or at {@code from}) is continued by pseudo-arclength both ways, folds and Hopf points are refined.
     *
     * @param model   SBML file
     * @param control parameter or compartment id, {@code init:SPECIES} or {@code total:SPECIES}
     * @param from    lower end of the range
     * @param to      upper end of the range
     * @param sets    overrides {@code id -> value} applied before the analysis (may be empty)
     * @return the branch with its folds and Hopf points, in user units of the control, full states
     * @throws org.switchfit.util.UserInputException for a bad model, control id or range, or a failed continuation
     */
    public static BranchesFile trace(Path model, String control, double from, double to, Map<String, String> sets) {
        SwitchSetup setup = new SwitchSetup();
        setup.modelFile = model;
        setup.vary = control;
        setup.from = from;
        setup.to = to;
        setup.sets = new LinkedHashMap<>(sets);
        SwitchSetup.Start s = setup.start();
        ContinuationSettings cs = SwitchSetup.settings(s.control, from, to);
        ScaledSystem sc = scaled(s, cs);
        return toFile(s, traceScaled(setup, s, sc, cs), from, to, sc);
    }

    /**
     * The scaled unknowns the continuation runs in (relative changes of states and control, see ScaledSystem):
     * with states of 1e9 and a control near 1e-9 the unscaled arclength cannot resolve the branch.
     */
    private static ScaledSystem scaled(SwitchSetup.Start s, ContinuationSettings cs) {
        int k = s.control.index();
        return ScaledSystem.around(s.sm.reduced, s.x, k, s.q[k], cs.lowerBound(), cs.upperBound());
    }

    /** The branch in scaled unknowns, with the settings' range and point limit. */
    private static Branch traceScaled(SwitchSetup setup, SwitchSetup.Start s, ScaledSystem sc,
                                      ContinuationSettings cs) {
        ContinuationSettings scs = ContinuationSettings.of(sc.scaleControl(cs.lowerBound()),
                sc.scaleControl(cs.upperBound())).withMaxPoints(cs.maxPoints())
                .withLinearAlgebra(cs.linearAlgebra()).withRelativeSteps(true);
        return setup.branch(sc, sc.scaleState(s.x), sc.scaleParameters(s.q), s.control.index(), scs);
    }

    /**
     * The branch file with the measured switching thresholds of the fit's problem attached (a fit directory was
     * given): those of the varied control from experiments that set nothing but the control (others were measured
     * on another model than the one traced and are listed as skipped), each matched to the branch's fold of its
     * direction (switch-on: a fold where λ turns back from increasing, MAXIMUM; switch-off: MINIMUM; the last such
     * fold when there are several). One line per threshold is printed.
     */
    private BranchesFile withMeasuredThresholds(BranchesFile file, Branch b, PrintWriter out) {
        Path problemFile = FitDirectoryInput.problemFile(setup.fitDir());
        String text;
        try {
            text = java.nio.file.Files.readString(problemFile);
        } catch (java.io.IOException e) {
            throw new UserInputException(org.switchfit.util.SourceLocation.ofFile(problemFile.toString()),
                    "cannot be read (" + e.getMessage() + "); check the path", e);
        }
        if (!text.contains("switchfit_format")) {
            return file; // PEtab problems hold no switching thresholds
        }
        org.switchfit.data.SwitchfitProblem sp = org.switchfit.data.ProblemFileReader.read(problemFile);
        Map<String, String> foldOf = foldIdsByDirection(b, file);
        List<BranchesFile.Threshold> th = new ArrayList<>();
        int n = 0;
        for (org.switchfit.data.SwitchingThreshold t : sp.thresholds()) {
            if (!t.control().equals(setup.vary)) {
                continue;
            }
            String dir = t.direction() == org.switchfit.data.SwitchingThreshold.Direction.UP ? "up" : "down";
            org.switchfit.data.Experiment e = sp.experiment(t.experiment()).orElse(null);
            if (e == null || !e.initialValues().isEmpty() || e.parameterValues().keySet().stream()
                    .anyMatch(k -> !k.equals(setup.vary))) {
                out.printf(Locale.ROOT, "measured switch-%s threshold %.6g of experiment '%s' not attached: the "
                        + "experiment sets other values than %s, so it measures another model%n",
                        dir.equals("up") ? "on" : "off", t.value(), t.experiment(), setup.vary);
                continue;
            }
            String fold = foldOf.get(dir);
            th.add(new BranchesFile.Threshold(t.experiment() + "/" + dir + "/" + (++n), t.value(), t.sigma(), dir,
                    fold));
            out.printf(Locale.ROOT, "measured switch-%s threshold %.6g +- %.3g (%s): %s%n", dir.equals("up") ? "on"
                    : "off", t.value(), t.sigma(), t.experiment(), fold == null ? "no fold of that direction on the "
                    + "branch" : "compared with " + fold);
        }
        return new BranchesFile(file.control(), file.range(), file.stateIds(), file.folds(), file.branches(), th);
    }

    /**
     * The fold each measured direction is compared with: {@code up} (switch-on) the branch's MAXIMUM-kind fold, where
     * λ turns back from increasing, {@code down} its MINIMUM-kind fold; the last of each kind when there are several.
     * Values are the fold ids of {@code traced} (the record of {@code b}).
     */
    static Map<String, String> foldIdsByDirection(Branch b, BranchesFile traced) {
        Map<String, String> out = new LinkedHashMap<>();
        List<BranchesFile.Special> folds = traced.folds().stream().filter(x -> x.kind() == BranchesFile.Kind.FOLD)
                .toList();
        for (int i = 0; i < b.folds().size() && i < folds.size(); i++) {
            out.put(b.folds().get(i).kind() == Fold.Kind.MAXIMUM ? "up" : "down", folds.get(i).id());
        }
        return out;
    }

    /**
     * Residual check of the full model along the branch: {max |f_i| over all states, over held states}, each
     * maximised over the branch points (units of the model's rates of change).
     */
    private static double[] fullResiduals(SwitchSetup.Start s, Branch b, ScaledSystem sc) {
        double all = 0;
        double held = 0;
        double[] q = s.q.clone();
        double[] p = s.pEff.clone();
        for (BranchPoint bp : b.points()) {
            q[s.control.index()] = sc.unscaleControl(bp.parameter());
            double[] y = s.sm.reduced.fullState(sc.unscaleState(bp.state()), q);
            System.arraycopy(q, 0, p, 0, p.length);
            double[] f = new double[y.length];
            s.sm.compiled.rhs(0, y, p, f);
            for (int i = 0; i < y.length; i++) {
                all = Math.max(all, Math.abs(f[i]));
                if (s.sm.network != null && s.sm.network.held(i)) {
                    held = Math.max(held, Math.abs(f[i]));
                }
            }
        }
        return new double[] {all, held};
    }

    private static String note(Branch b, BranchesFile.Special sp) {
        if (sp.kind() == BranchesFile.Kind.FOLD) {
            int k = Integer.parseInt(sp.id().substring(4)) - 1;
            return b.folds().get(k).refined() ? "" : " (not refined: interpolated between branch points)";
        }
        int k = Integer.parseInt(sp.id().substring(4)) - 1;
        return String.format(Locale.ROOT, " (frequency %.6g)", b.hopfs().get(k).frequency());
    }

    /** The JSON record of a branch traced in the unscaled reduced system. */
    static BranchesFile toFile(SwitchSetup.Start s, Branch b, double a, double bHi) {
        return toFile(s, b, a, bHi, null);
    }

    /**
     * The JSON record of a traced branch, in user units of the control and full states; {@code sc} is the scaling
     * the branch was traced in, or null.
     */
    static BranchesFile toFile(SwitchSetup.Start s, Branch b, double a, double bHi, ScaledSystem sc) {
        List<String> ids = s.sm.states;
        int k = s.control.index();
        double[] q = s.q.clone();
        List<BranchesFile.Special> specials = new ArrayList<>();
        int i = 1;
        for (Fold f : b.folds()) {
            q[k] = lam(sc, f.parameter());
            specials.add(new BranchesFile.Special("fold" + i++, s.control.label(), s.control.toUser(q[k]),
                    stateMap(ids, reported(s, x(sc, f.state()), q)), BranchesFile.Kind.FOLD));
        }
        i = 1;
        for (Hopf h : b.hopfs()) {
            q[k] = lam(sc, h.parameter());
            specials.add(new BranchesFile.Special("hopf" + i++, s.control.label(), s.control.toUser(q[k]),
                    stateMap(ids, reported(s, x(sc, h.state()), q)), BranchesFile.Kind.HOPF));
        }
        List<BranchesFile.Point> pts = new ArrayList<>();
        BranchPoint prev = null;
        for (BranchPoint bp : b.points()) {
            if (prev != null && prev.parameter() == bp.parameter()
                    && java.util.Arrays.equals(prev.state(), bp.state())) {
                continue; // a one-sided start on a bound repeats the start point
            }
            prev = bp;
            q[k] = lam(sc, bp.parameter());
            pts.add(new BranchesFile.Point(s.control.toUser(q[k]), reported(s, x(sc, bp.state()), q),
                    ContinuationFiles.stability(bp), bp.eigenReal(), bp.eigenImag()));
        }
        return new BranchesFile(s.control.label(), new double[] {a, bHi}, ids, specials,
                List.of(new BranchesFile.Branch("branch1", pts)), List.of());
    }

    /** The full state of reduced state x at q in the quantities {@code simulate} reports (concentrations). */
    private static double[] reported(SwitchSetup.Start s, double[] x, double[] q) {
        return s.sm.reportedAt(s.sm.reduced.fullState(x, q), q, s.pEff);
    }

    private static double lam(ScaledSystem sc, double v) {
        return sc == null ? v : sc.unscaleControl(v);
    }

    private static double[] x(ScaledSystem sc, double[] z) {
        return sc == null ? z : sc.unscaleState(z);
    }

    static Map<String, Double> stateMap(List<String> ids, double[] y) {
        Map<String, Double> m = new LinkedHashMap<>();
        for (int i = 0; i < ids.size(); i++) {
            m.put(ids.get(i), y[i]);
        }
        return m;
    }

    static String toCsv(BranchesFile f) {
        StringBuilder sb = new StringBuilder();
        sb.append("branch,point,").append(org.switchfit.report.Csv.field(f.control())).append(",stable");
        for (String id : f.stateIds()) {
            sb.append(',').append(org.switchfit.report.Csv.field(id));
        }
        sb.append('\n');
        for (BranchesFile.Branch br : f.branches()) {
            int i = 0;
            for (BranchesFile.Point p : br.points()) {
                sb.append(br.id()).append(',').append(i++).append(',').append(p.value()).append(',')
                        .append(p.stable() == null ? "" : p.stable());
                for (double v : p.states()) {
                    sb.append(',').append(v);
                }
                sb.append('\n');
            }
        }
        return sb.toString();
    }
}
