package org.switchfit.cli;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.Locale;
import java.util.Map;
import org.switchfit.continuation.ActiveNetwork;
import org.switchfit.continuation.Branch;
import org.switchfit.continuation.ContinuationException;
import org.switchfit.continuation.ContinuationSettings;
import org.switchfit.continuation.PseudoArclength;
import org.switchfit.continuation.SteadyStateSolver;
import org.switchfit.ode.OdeSystem;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;

/**
 * Options and set-up shared by {@code branches}, {@code region} and {@code sweep}: the model, the control
 * quantity and its range, overrides; and the steady state the analysis starts from. Not thread-safe.
 */
final class SwitchSetup {

    /** Seed of the sample points of {@link ActiveNetwork#find} (fixed: runs are reproducible). */
    static final long NETWORK_SEED = 20261202L;
    /** Rounds of rules 4 and 5 of {@link ActiveNetwork} (each recomputes the laws). */
    private static final int MAX_FREEZE_ROUNDS = 6;

    @Parameters(index = "0", paramLabel = "MODEL", description = "SBML model file, or the folder of a finished "
            + "'switchfit fit' run: its model_fitted.xml is analysed and the results are written into the folder "
            + "(unless --json names another file)")
    Path modelFile;

    /** The fit directory when the model argument is one, else null. */
    Path fitDir() {
        return modelFile != null && java.nio.file.Files.isDirectory(modelFile) ? modelFile : null;
    }

    /** The SBML file to load: the model argument, or model_fitted.xml of a fit directory. */
    Path sbmlFile() {
        return sbmlFile(modelFile);
    }

    /**
     * The SBML file a model argument names: the file itself, or model_fitted.xml of a fit directory.
     *
     * @throws UserInputException for a folder without model_fitted.xml
     */
    static Path sbmlFile(Path modelOrFitDir) {
        if (modelOrFitDir == null || !java.nio.file.Files.isDirectory(modelOrFitDir)) {
            return modelOrFitDir;
        }
        Path dir = modelOrFitDir;
        Path fitted = dir.resolve("model_fitted.xml");
        if (!java.nio.file.Files.isRegularFile(fitted)) {
            throw new UserInputException(SourceLocation.ofFile(dir.toString()), "is a folder without "
                    + "model_fitted.xml; give an SBML file or the --out folder of a finished 'switchfit fit' run");
        }
        return fitted;
    }

    /** The output file: {@code given}, else {@code name} inside the fit directory, else null. */
    Path output(Path given, String name) {
        return given != null ? given : fitDir() == null ? null : fitDir().resolve(name);
    }

    @Option(names = "--vary", required = true, paramLabel = "ID", description = "control quantity: a parameter "
            + "or compartment id, init:SPECIES (initial value) or total:SPECIES (conservation total)")
    String vary;

    @Option(names = "--from", required = true, paramLabel = "A", description = "lower end of the control range")
    double from;

    @Option(names = "--to", required = true, paramLabel = "B", description = "upper end of the control range")
    double to;

    @Option(names = "--set", paramLabel = "ID=VALUE", description = "override a parameter, compartment size or "
            + "species initial value before the analysis (repeatable)")
    Map<String, String> sets = new LinkedHashMap<>();

    /** The loaded state of a run. */
    static final class Start {
        SwitchModel sm;
        ControlQuantity control;
        double[] pEff;
        /** Reduced parameters with the control at {@link #startValue}. */
        double[] q;
        /** Reduced steady state at {@link #startValue}. */
        double[] x;
        double startValue;
        /** Full state the steady-state search starts from. */
        double[] startState;
        /**
         * Seconds: parse, compile, conservation laws (every elimination), steady state, active network (its rules,
         * the relaxations of rules 4 and 5 and the first, lazy, compilation of the Jacobian; laws excluded).
         */
        double[] timing = new double[5];
        /** Notes on the options for the user (e.g. a --set the range overrides), one line each. */
        java.util.List<String> notes = new java.util.ArrayList<>();
    }

    /** Loads the model, resolves the control, finds the steady state at the model's value (if in range) or A. */
    Start start() {
        checkRange("--from", "--to", from, to);
        Start s = new Start();
        s.sm = SwitchModel.load(sbmlFile(), s.timing);
        double[] decl = s.sm.declared(sets);
        double[][] ini = s.sm.initial(decl);
        s.pEff = ini[1];
        s.startState = ini[0];
        s.q = s.sm.reduced.parameters(ini[1], ini[0]);
        s.control = ControlQuantity.resolve(s.sm, vary, "--vary", ini[0], s.q, s.pEff);
        String setKey = vary.strip().startsWith("init:") ? vary.strip().substring(5).strip() : vary.strip();
        for (String key : sets.keySet()) {
            if (key.strip().equals(setKey) && !vary.strip().startsWith("total:")) {
                s.notes.add(String.format(Locale.ROOT, "note: --set %s=%s is overridden by the range of --vary %s "
                        + "(it only picks the start of the analysis when it lies in [--from, --to])", key,
                        sets.get(key), vary));
            }
        }
        double model = s.control.toUser(s.q[s.control.index()]);
        s.startValue = model >= from && model <= to ? model : from;
        long t0 = System.nanoTime();
        lawSeconds = 0;
        if (s.control.index() < s.sm.reduced.originalParameterCount()) {
            // A model parameter is varied: reduce by the laws of the active network (see ActiveNetwork). Totals
            // and init: controls keep the stoichiometric laws, whose numbering they refer to.
            double[] pr = s.pEff.clone();
            pr[s.control.index()] = s.control.toQ(s.startValue);
            ActiveNetwork net = ActiveNetwork.find(s.sm.compiled, pr, s.control.index(), s.control.toQ(from),
                    s.control.toQ(to), ini[0], NETWORK_SEED);
            double[] y = ini[0];
            if (!net.isWholeNetwork()) {
                s.sm = withNetwork(s, net, y);
                s.q = s.sm.reduced.parameters(ini[1], y);
            }
            // Rules 4 and 5 of ActiveNetwork: at the state the dynamics relax to, hold species whose influence is
            // below rounding, then species spanning directions in which the Jacobian is numerically singular, and
            // repeat (holding one pool can leave its exchange partners numerically passive).
            for (int round = 0; round < MAX_FREEZE_ROUNDS && s.sm.reduced.stateCount() > 0; round++) {
                s.q[s.control.index()] = s.control.toQ(s.startValue);
                double[] xr = SteadyStateSolver.defaults().relax(s.sm.reduced, s.sm.reduced.reducedState(y), s.q);
                y = s.sm.reduced.fullState(xr, s.q);
                int[] weak = ActiveNetwork.numericallyPassive(s.sm.reduced, xr, s.q);
                if (weak.length > 0) {
                    net = net.withFrozen(weak);
                } else {
                    int[] slow = ActiveNetwork.numericallySingular(s.sm.reduced, xr, s.q);
                    if (slow.length == 0) {
                        break;
                    }
                    net = net.withSingularHeld(slow);
                }
                s.sm = withNetwork(s, net, y);
                s.q = s.sm.reduced.parameters(ini[1], y);
            }
            s.startState = y;
            s.timing[4] = (System.nanoTime() - t0) * 1e-9 - lawSeconds;
        }
        s.q[s.control.index()] = s.control.toQ(s.startValue);
        t0 = System.nanoTime();
        try {
            s.x = s.sm.steadyState(s.sm.reduced.reducedState(s.startState), s.q, s.pEff);
        } catch (ContinuationException e) {
            throw new UserInputException(SourceLocation.ofFile(sbmlFile().toString()), String.format(Locale.ROOT,
                    "no steady state found at %s = %.6g (%s); check the range --from/--to and the --set values, "
                            + "or start inside a range where the model settles", vary, s.startValue, e.getMessage()));
        }
        s.timing[3] = (System.nanoTime() - t0) * 1e-9;
        return s;
    }

    private double lawSeconds;

    /** {@link SwitchModel#withNetwork}, its time added to the laws' timing. */
    private SwitchModel withNetwork(Start s, ActiveNetwork net, double[] y) {
        long t0 = System.nanoTime();
        SwitchModel out = s.sm.withNetwork(net, y);
        double dt = (System.nanoTime() - t0) * 1e-9;
        s.timing[2] += dt;
        lawSeconds += dt;
        return out;
    }

    /**
     * Warnings about what the analysis leaves out of the model, one line each (empty when nothing): continuation
     * assumes a smooth, autonomous right-hand side without events, so state-dependent piecewise switches (the
     * branch may jump at them and miss folds), events (ignored) and explicit time (evaluated at t = 0) are named.
     * A ramp ({@code sweep}) integrates through switches, so only events and time are named for it.
     *
     * @param ramp true for {@code sweep}, false for {@code branches} and {@code region}
     */
    static java.util.List<String> caveats(SwitchModel sm, boolean ramp) {
        java.util.List<String> out = new java.util.ArrayList<>();
        java.util.List<org.switchfit.expr.Expr> sw = sm.compiled.stateRhsSwitchConditions();
        if (!ramp && !sw.isEmpty()) {
            out.add(String.format(Locale.ROOT, "warning: the right-hand side switches on the states (%d piecewise "
                    + "condition(s), e.g. %s); continuation assumes a smooth right-hand side, so results may jump "
                    + "at these non-smooth points and miss folds or branches there; check with 'switchfit sweep' "
                    + "or 'switchfit simulate'", sw.size(), sw.get(0)));
        }
        int events = sm.compiled.form().events().size();
        if (events > 0) {
            out.add(String.format(Locale.ROOT, "warning: the model has %d event(s); %s ignores events (the "
                    + "results are those of the model without them)", events, ramp ? "the ramp" : "continuation"));
        }
        if (sm.compiled.rhsUsesTime()) {
            out.add(ramp ? "warning: the right-hand side depends on time explicitly; the ramp uses its own time "
                    + "(0 at its start) as model time, so the response mixes the ramp with the time dependence"
                    : "warning: the right-hand side depends on time explicitly; continuation ignores the time "
                    + "dependence and evaluates it at time 0 (steady states of the model frozen at t = 0)");
        }
        return out;
    }

    /** Prints the notes of the start ({@link Start#notes}) and {@link #caveats} to err. */
    static void printCaveats(Start s, boolean ramp, java.io.PrintWriter err) {
        for (String w : s.notes) {
            err.println(w);
        }
        for (String w : caveats(s.sm, ramp)) {
            err.println(w);
        }
        err.flush();
    }

    /** Continuation settings for the control range in q units. */
    static ContinuationSettings settings(ControlQuantity c, double a, double b) {
        double qa = c.toQ(a);
        double qb = c.toQ(b);
        return ContinuationSettings.of(Math.min(qa, qb), Math.max(qa, qb));
    }

    /** Both-direction branch from the start, with user-facing errors. */
    Branch branch(Start s, ContinuationSettings cs) {
        return branch(s.sm.reduced, s.x, s.q, s.control.index(), cs);
    }

    /** Both-direction branch of a (scaled) system from (x, q) in parameter k, with user-facing errors. */
    Branch branch(OdeSystem sys, double[] x, double[] q, int k, ContinuationSettings cs) {
        try {
            return new PseudoArclength(cs).trace(sys, x, q, k);
        } catch (ContinuationException e) {
            throw new UserInputException(SourceLocation.ofFile(sbmlFile().toString()), String.format(Locale.ROOT,
                    "continuation in %s over [%.6g, %.6g] failed: %s; try a narrower range or other --set values",
                    vary, from, to, e.getMessage()));
        }
    }

    /** Whether the continuation's Newton and tangent solves use the sparse LU for this system and settings. */
    static boolean usesSparseLu(OdeSystem sys, ContinuationSettings cs) {
        return PseudoArclength.usesSparseLu(sys, cs);
    }

    static void checkRange(String lo, String hi, double a, double b) {
        for (int k = 0; k < 2; k++) {
            double v = k == 0 ? a : b;
            if (!Double.isFinite(v)) {
                throw new UserInputException(null, String.format(Locale.ROOT, "%s %s: the bound must be a finite "
                        + "number; give one like 0 or 2.5", k == 0 ? lo : hi, fmt(v)));
            }
        }
        if (!(a < b)) {
            throw new UserInputException(null, String.format(Locale.ROOT, "%s %s %s %s: the range is empty; give "
                    + "%s smaller than %s", lo, fmt(a), hi, fmt(b), lo, hi));
        }
    }

    static String fmt(double v) {
        return String.format(Locale.ROOT, "%.10g", v).replaceAll("(\\.\\d*?)0+($|e)", "$1$2").replace(".e", "e")
                .replaceAll("\\.$", "");
    }
}
