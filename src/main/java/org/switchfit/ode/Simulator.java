package org.switchfit.ode;

import java.util.ArrayList;
import java.util.List;
import org.switchfit.expr.Expr;
import org.switchfit.expr.Interpreter;
import org.switchfit.model.BoundEvent;

/**
 * Runs a compiled model with SBML semantics on top of any {@link Integrator}: initial values at the start time,
 * events (trigger from false to true, initialValue, delay, priority, persistence, useValuesFromTriggerTime,
 * cascades of simultaneous events; SBML Level 3 Version 2, section 4.12), and outputs at requested times. Events
 * are located through the switching functions of {@link ModelCompiler}; the integration restarts after every
 * event execution. Piecewise conditions of the right-hand side on time or states ({@link
 * CompiledModel#rhsSwitchCount}) are switching functions too: the integration stops and restarts where they change
 * value, so no step straddles a discontinuity of f (conditions on time only are found ahead and stepped over when
 * the session supports stop times, {@link IntegrationSession#stopAt}); a switch that chatters (a sliding mode) stops
 * being a root after {@link #CHATTER_STOPS} closely spaced stops. Immutable; {@link #simulate} may run concurrently
 * from several threads.
 *
 * <p>Order of simultaneous events: highest priority first (priority evaluated when choosing; events without
 * priority come after those with one); ties between equal explicit priorities are broken at random with a fixed
 * seed ({@link #TIE_BREAK_SEED}, so every run gives the same result), other ties in model order. Events with useValuesFromTriggerTime compute their
 * assignment values when triggered, the others when executed.
 */
public final class Simulator {
    /** Maximum number of event executions at one time point before giving up (cycles of events). */
    static final int MAX_EVENTS_PER_INSTANT = 10_000;
    /** Consecutive closely spaced switch stops taken as a sliding mode (see {@code Run.watchChattering}). */
    static final int CHATTER_STOPS = 100;
    /** Samples per advance when looking ahead for the time of a switch on time only. */
    static final int TIME_SWITCH_SAMPLES = 16;
    /** Spacing of switch stops, relative to max(1, |t|), below which they count as closely spaced. */
    static final double CHATTER_SPACING = 1e-9;
    /** Seed of the random order among simultaneous events of equal priority (fixed: runs are reproducible). */
    static final long TIE_BREAK_SEED = 20261202L;

    private final CompiledModel model;
    private final Integrator integrator;

    public Simulator(CompiledModel model, Integrator integrator) {
        this.model = model;
        this.integrator = integrator;
    }

    /**
     * Simulates from t0 = min(0, times[0]) and reports outputs at {@code times} (non-decreasing).
     *
     * @param pDeclared declared parameter values (see {@link CompiledModel}); not modified
     * @throws IntegrationException when integration fails
     */
    public Trajectory simulate(double[] times, double[] pDeclared, ModelOutputs outputs) {
        boolean delays = !model.form().delaySlots().isEmpty();
        double[][] values = new double[times.length][outputs.count()];
        DelayRecord hist = delays ? new DelayRecord() : null;
        try {
            if (delays) {
                org.switchfit.expr.MathRuntime.setDelayHistory(hist);
            }
            Run run = new Run(pDeclared, Math.min(0.0, times.length == 0 ? 0.0 : times[0]), hist);
            run.tEnd = times.length == 0 ? run.t : times[times.length - 1];
            for (int r = 0; r < times.length; r++) {
                run.advanceTo(times[r]);
                outputs.evaluate(run.t, run.y, run.p, values[r]);
            }
        } finally {
            if (delays) {
                org.switchfit.expr.MathRuntime.setDelayHistory(null);
            }
        }
        return new Trajectory(outputs.names(), times, values);
    }

    /**
     * Simulates with forward sensitivities carried across events, from given initial values. Between events the
     * sensitivities follow the variational equations integrated by the session of {@code sys}; at an event time
     * t_ev they jump by the conditions of Galán, Feehery &amp; Barton 1999, "Parametric sensitivity functions for
     * hybrid discrete/continuous systems", Appl. Numer. Math. 31(1):17-47, in the form used by Fröhlich et al.
     * 2017, "Parameter estimation for dynamical systems with discrete events and logical operations",
     * Bioinformatics 33(7):1049-1056. With τ = d t_ev/dθ:
     * <pre>
     *   τ  = -(∂g/∂y s⁻ + ∂g/∂p dp/dθ) / (∂g/∂y f⁻ + ∂g/∂t)
     *   s⁺ = ∂h/∂y (s⁻ + f⁻ τ) + ∂h/∂p dp/dθ + ∂h/∂t τ - f⁺ τ
     * </pre>
     * where g is the switching function of the event whose root stopped the integration and h the map of its
     * assignments (h = y for unassigned components). Cascades at one instant compose the maps h: the total
     * derivative {@code D = s⁻ + f⁻ τ} is carried through them and {@code s⁺ = D - f⁺ τ} at the end.
     * Time-triggered events (g = t - t_k) come out of the same formula (τ = dt_k/dθ, 0 for a fixed t_k).
     * Events with a delay execute at t_ex = t_ev + d(θ) with {@code dt_ex/dθ = τ + dd/dθ}, d differentiated at
     * the trigger time; values used from the trigger time are differentiated there. Quantities assigned by events
     * (parameters included) are states of the ODE form, so their sensitivities jump like those of species.
     * Right-hand-side switches are the case h = y: {@code s⁺ = s⁻ + (f⁻ - f⁺) τ}, with g the switch's switching
     * function and f⁻, f⁺ evaluated with its condition forced to the old and new value.
     *
     * <p>Limits, stated: when two different switching functions have roots at the same instant, τ of the
     * first (lowest event index) whose event fires is used for the whole instant (the trigger time is not
     * differentiable there). A trigger whose switching function has a zero time derivative along the flow is
     * treated as firing at a θ-independent time when the numerator vanishes too (discrete conditions such as
     * equality tests); otherwise an {@link IntegrationException} reports the tangential crossing. Models with
     * {@code delay()} in their mathematics are refused (the history of the sensitivities is not kept).
     *
     * @param sys        the system integrated: the model's right-hand side with parameters {@code [p (m) | extra]};
     *                   its sensitivity column c must satisfy {@code ∂f/∂θ_c = Σ_k ∂f/∂p_k dP[k * nc + c]}
     * @param t0         start time, &lt;= times[0]; y0, p are values at t0
     * @param y0         initial state (length n), not modified
     * @param p          parameters of sys; the first m are the model's effective parameters; kept by reference
     * @param sensParams parameter index (into sys) per sensitivity column; length nc
     * @param s0         initial sensitivities {@code s0[c * n + i]}
     * @param dP         {@code dP[k * nc + c] = dp_k/dθ_c}, k &lt; m
     * @param yOut       receives {@code yOut[r * n + i]} = y_i(times[r])
     * @param sOut       receives {@code sOut[(r * nc + c) * n + i]} = dy_i/dθ_c at times[r]
     * @throws IntegrationException when integration fails or a trigger time has no derivative
     * @throws IllegalArgumentException for a model with delay() in its mathematics
     */
    public void simulateSensitivities(double[] times, OdeSystem sys, double t0, double[] y0, double[] p,
                                      int[] sensParams, double[] s0, double[] dP, double[] yOut, double[] sOut) {
        if (!model.form().delaySlots().isEmpty()) {
            throw new IllegalArgumentException("sensitivities across events are not available for models with "
                    + "delay() in their mathematics");
        }
        int n = model.stateCount();
        int nc = sensParams.length;
        Run run = new Run(t0, y0, p, sys, sensParams, s0, dP);
        run.tEnd = times.length == 0 ? t0 : times[times.length - 1];
        for (int r = 0; r < times.length; r++) {
            run.advanceTo(times[r]);
            System.arraycopy(run.y, 0, yOut, r * n, n);
            System.arraycopy(run.sens.s, 0, sOut, r * nc * n, nc * n);
        }
    }

    /**
     * Simulates the states alone from given initial values, the counterpart of {@link #simulateSensitivities}
     * without sensitivities (same stops at events and right-hand-side switches, same integrator): for a state that
     * was computed beforehand, e.g. by pre-equilibration, where {@link #simulate} would compute the initial values
     * of the declared parameters itself.
     *
     * @param sys  the system integrated: the model's right-hand side with parameters {@code [p (m) | extra]}
     * @param t0   start time; a time before it is reported at t0 (times non-decreasing)
     * @param y0   initial state (length n), not modified
     * @param p    parameters of sys; the first m are the model's effective parameters; kept by reference
     * @param yOut receives {@code yOut[r * n + i]} = y_i(times[r])
     * @throws IntegrationException when integration fails
     * @throws IllegalArgumentException for a model with delay() in its mathematics (no history before t0)
     */
    public void simulateStates(double[] times, OdeSystem sys, double t0, double[] y0, double[] p, double[] yOut) {
        if (!model.form().delaySlots().isEmpty()) {
            throw new IllegalArgumentException("simulation from given initial values is not available for models "
                    + "with delay() in their mathematics");
        }
        int n = model.stateCount();
        Run run = new Run(t0, y0, p, sys, null, null, null);
        run.tEnd = times.length == 0 ? t0 : times[times.length - 1];
        for (int r = 0; r < times.length; r++) {
            run.advanceTo(times[r]);
            System.arraycopy(run.y, 0, yOut, r * n, n);
        }
    }

    /**
     * A time just past the last change in (from, to] of a right-hand-side switch on time only (a piecewise input
     * such as {@code time < t_on}), or NaN when none changes there: a run to a steady state that starts before
     * such a switch must first simulate past it, since the state can be at rest until the input changes. The
     * switching functions are sampled at spacing 0.155 max(1, |t|) (16 samples per decade of t beyond 1) and each
     * change is bisected to the root bracket width ({@link IntegrationSession}); a switch that changes and changes
     * back between two samples is missed.
     *
     * @param y a state (length n; switches on time only do not depend on it)
     * @param p parameters, the first m the model's effective parameters
     */
    public double lastTimeSwitch(double from, double to, double[] y, double[] p) {
        int ns = model.rhsSwitchCount();
        boolean any = false;
        for (int k = 0; k < ns; k++) {
            any |= model.rhsSwitchOnTimeOnly(k);
        }
        if (!any || !(to > from)) {
            return Double.NaN;
        }
        int nr = model.eventRootCount();
        RootFunctions roots = model.rootFunctions();
        double[] ga = new double[nr + ns];
        double[] gb = new double[nr + ns];
        double[] gm = new double[nr + ns];
        double factor = Math.pow(10.0, 1.0 / TIME_SWITCH_SAMPLES) - 1.0;
        double last = Double.NaN;
        double a = from;
        roots.evaluate(a, y, p, ga);
        while (a < to) {
            double b = Math.min(to, a + factor * Math.max(1.0, Math.abs(a)));
            roots.evaluate(b, y, p, gb);
            if (timeSwitchChanged(ga, gb, nr, ns)) {
                double[] br = bisectTimeSwitch(roots, y, p, a, b, gb, gm, nr, ns, false);
                last = br[1] + (br[1] - br[0]);
            }
            double[] swap = ga;
            ga = gb;
            gb = swap;
            a = b;
        }
        return last;
    }

    /**
     * Bisects [lo, hi], over which a switch on time only changes sign, to the root bracket width of
     * {@link IntegrationSession}: toward the first change after lo ({@code first}; {@code gRef} holds the values
     * at lo) or the last change before hi ({@code gRef} holds the values at hi). {@code gMid} is scratch.
     *
     * @return the final bracket {lo, hi}
     */
    private double[] bisectTimeSwitch(RootFunctions roots, double[] y, double[] p, double lo, double hi,
                                      double[] gRef, double[] gMid, int nr, int ns, boolean first) {
        while (hi - lo > IntegrationSession.rootBracketWidth(hi)) {
            double mid = 0.5 * (lo + hi);
            roots.evaluate(mid, y, p, gMid);
            // first: a change between lo's values and mid puts the first change in (lo, mid]; last: a change
            // between mid and hi's values puts the last change in (mid, hi]
            if (timeSwitchChanged(gRef, gMid, nr, ns) == first) {
                hi = mid;
            } else {
                lo = mid;
            }
        }
        return new double[] {lo, hi};
    }

    private boolean timeSwitchChanged(double[] ga, double[] gb, int nr, int ns) {
        for (int k = 0; k < ns; k++) {
            if (model.rhsSwitchOnTimeOnly(k) && (ga[nr + k] >= 0) != (gb[nr + k] >= 0)) {
                return true;
            }
        }
        return false;
    }

    /** A model without states, given one dummy state with zero derivative so integrators can run. */
    private static final class Padded implements OdeSystem {
        private final OdeSystem inner;

        Padded(OdeSystem inner) {
            this.inner = inner;
        }

        @Override
        public int stateCount() {
            return 1;
        }

        @Override
        public int parameterCount() {
            return inner.parameterCount();
        }

        @Override
        public void rhs(double t, double[] y, double[] p, double[] dydt) {
            dydt[0] = 0.0;
        }

        @Override
        public void jacobianY(double t, double[] y, double[] p, double[] jac) {
            jac[0] = 0.0;
        }

        @Override
        public void jacobianP(double t, double[] y, double[] p, double[] jac) {
            java.util.Arrays.fill(jac, 0, inner.parameterCount(), 0.0);
        }
    }

    /** Switching functions of a state-free model evaluated with an empty state. */
    private static final class PaddedRoots implements RootFunctions {
        private final RootFunctions inner;
        private final double[] empty;

        PaddedRoots(RootFunctions inner, int n) {
            this.inner = inner;
            this.empty = n == 0 ? new double[0] : null;
        }

        @Override
        public int count() {
            return inner.count();
        }

        @Override
        public void evaluate(double t, double[] y, double[] p, double[] g) {
            inner.evaluate(t, empty == null ? y : empty, p, g);
        }
    }

    /**
     * The model's root functions (events, then right-hand-side switches) with switches that chatter masked: a
     * masked switch reads +1. One per run (the mask belongs to it); allocation-free.
     */
    private static final class SwitchRoots implements RootFunctions {
        private final RootFunctions inner;
        private final int ne;
        final boolean[] masked;

        SwitchRoots(RootFunctions inner, int ne) {
            this.inner = inner;
            this.ne = ne;
            this.masked = new boolean[inner.count() - ne];
        }

        @Override
        public int count() {
            return inner.count();
        }

        @Override
        public void evaluate(double t, double[] y, double[] p, double[] g) {
            inner.evaluate(t, y, p, g);
            for (int k = 0; k < masked.length; k++) {
                if (masked[k]) {
                    g[ne + k] = 1.0;
                }
            }
        }
    }

    /**
     * Dense record of past states for delay nodes: (t, y, f) at every stop, cubic Hermite interpolation between
     * records; before the start time the initial state holds (SBML L3V2 section 3.4.7). The simulation advances in
     * chunks of a quarter of the smallest lag, so the lagged times always fall into recorded history.
     */
    private final class DelayRecord implements org.switchfit.expr.DelayHistory {
        private Run run;
        private int n;
        private double[] ts = new double[64];
        private double[] ys;
        private double[] fs;
        private int count;
        private List<Expr> slots;
        private List<Expr> slotsBefore;

        void init(Run r) {
            this.run = r;
            this.n = r.n;
            this.ys = new double[64 * Math.max(n, 1)];
            this.fs = new double[64 * Math.max(n, 1)];
            org.switchfit.expr.Block rt = model.form().runtime();
            Expr[] inlined = new Expr[rt.localCount()];
            for (int l = 0; l < inlined.length; l++) {
                inlined[l] = inlineLocals(rt.local(l), inlined);
            }
            Expr[] before = new Expr[rt.localCount()];
            for (int l = 0; l < before.length; l++) {
                before[l] = rt.localName(l).startsWith("rateOf:") ? Expr.ZERO : inlineLocals(rt.local(l), before);
            }
            List<Expr> sl = new ArrayList<>();
            List<Expr> sb = new ArrayList<>();
            for (Expr x : model.form().delaySlots()) {
                sl.add(inlineLocals(x, inlined));
                sb.add(inlineLocals(x, before));
            }
            this.slots = sl;
            this.slotsBefore = sb;
        }

        private Expr inlineLocals(Expr e, Expr[] inlined) {
            return e.mapLeaves(x -> x.op() == org.switchfit.expr.Op.LOCAL && x.index() < inlined.length
                    && inlined[x.index()] != null ? inlined[x.index()] : x);
        }

        void record(double t, double[] y) {
            if (count == ts.length) {
                ts = java.util.Arrays.copyOf(ts, 2 * count);
                ys = java.util.Arrays.copyOf(ys, 2 * count * Math.max(n, 1));
                fs = java.util.Arrays.copyOf(fs, 2 * count * Math.max(n, 1));
            }
            double[] f = new double[n];
            model.rhs(t, y, run.p, f);
            ts[count] = t;
            System.arraycopy(y, 0, ys, count * n, n);
            System.arraycopy(f, 0, fs, count * n, n);
            count++;
        }

        @Override
        public double value(int slot, double time) {
            double[] yi = new double[n];
            double tt = time;
            if (count == 0 || time < ts[0]) {
                // before the start, quantities follow their initial definitions evaluated at the past time and
                // nothing changes (rates of change are 0), as the SBML Test Suite expects
                double[] pp = new double[run.p.length];
                model.initialValues(time, run.pDeclared, yi, pp);
                return Interpreter.evaluate(slotsBefore.get(slot), tt, yi, pp, null);
            } else if (time >= ts[count - 1]) {
                int o = (count - 1) * n;
                double h = time - ts[count - 1];
                for (int i = 0; i < n; i++) {
                    yi[i] = ys[o + i] + h * fs[o + i];
                }
            } else {
                int lo = 0;
                int hi = count - 1;
                while (hi - lo > 1) {
                    int mid = (lo + hi) >>> 1;
                    if (ts[mid] <= time) {
                        lo = mid;
                    } else {
                        hi = mid;
                    }
                }
                double h = ts[hi] - ts[lo];
                int a = lo * n;
                int b = hi * n;
                if (h <= 0) {
                    System.arraycopy(ys, b, yi, 0, n);
                } else {
                    double s = (time - ts[lo]) / h;
                    double s2 = s * s;
                    double s3 = s2 * s;
                    double h00 = 2 * s3 - 3 * s2 + 1;
                    double h10 = s3 - 2 * s2 + s;
                    double h01 = -2 * s3 + 3 * s2;
                    double h11 = s3 - s2;
                    for (int i = 0; i < n; i++) {
                        yi[i] = h00 * ys[a + i] + h10 * h * fs[a + i] + h01 * ys[b + i] + h11 * h * fs[b + i];
                    }
                }
            }
            Expr x = slots.get(slot);
            if (x.op() == org.switchfit.expr.Op.STATE) {
                return yi[x.index()];
            }
            return Interpreter.evaluate(x, tt, yi, run.p, null);
        }
    }

    /**
     * Session for systems whose states never change between events: no integration, only root location of the
     * switching functions in time (sampled at 16 points per interval, then bisected to the session tolerance on the
     * side where the new sign holds).
     */
    private static final class FrozenSession implements IntegrationSession {
        private static final int SAMPLES = 16;
        private final double[] y;
        private final double[] p;
        private final RootFunctions roots;
        private final double[] ga;
        private final double[] gb;
        private double t;
        private boolean atRoot;
        private int[] found = new int[0];
        private long calls;

        FrozenSession(double[] y0, double[] p, RootFunctions roots, double t0) {
            this.y = y0.clone();
            this.p = p;
            this.roots = roots;
            int nr = roots == null ? 0 : roots.count();
            this.ga = new double[nr];
            this.gb = new double[nr];
            this.t = t0;
        }

        private boolean changed(double a, double b) {
            roots.evaluate(a, y, p, ga);
            roots.evaluate(b, y, p, gb);
            calls += 2;
            for (int k = 0; k < ga.length; k++) {
                if (Math.signum(ga[k]) != Math.signum(gb[k])) {
                    return true;
                }
            }
            return false;
        }

        @Override
        public double advance(double tOut, double[] yOut, double[] sOut) {
            if (Thread.currentThread().isInterrupted()) {
                throw new IntegrationException(t, "interrupted");
            }
            atRoot = false;
            found = new int[0];
            if (roots != null && ga.length > 0 && tOut > t) {
                double a = t;
                for (int i = 1; i <= SAMPLES; i++) {
                    double b = i == SAMPLES ? tOut : t + (tOut - t) * i / SAMPLES;
                    if (changed(a, b)) {
                        double lo = a;
                        double hi = b;
                        double tol = IntegrationSession.rootBracketWidth(hi);
                        while (hi - lo > tol) {
                            double mid = 0.5 * (lo + hi);
                            if (changed(lo, mid)) {
                                hi = mid;
                            } else {
                                lo = mid;
                            }
                        }
                        if (hi < tOut) {
                            changed(a, hi);
                            int c = 0;
                            int[] tmp = new int[ga.length];
                            for (int k = 0; k < ga.length; k++) {
                                if (Math.signum(ga[k]) != Math.signum(gb[k])) {
                                    tmp[c++] = k;
                                }
                            }
                            found = java.util.Arrays.copyOf(tmp, c);
                            atRoot = true;
                            t = hi;
                            System.arraycopy(y, 0, yOut, 0, y.length);
                            return t;
                        }
                        break;
                    }
                    a = b;
                }
            }
            t = tOut;
            System.arraycopy(y, 0, yOut, 0, y.length);
            return t;
        }

        @Override
        public boolean stoppedAtRoot() {
            return atRoot;
        }

        @Override
        public int[] rootsFound() {
            return found.clone();
        }

        @Override
        public double time() {
            return t;
        }

        @Override
        public void reset(double[] yNew, double[] sNew) {
            System.arraycopy(yNew, 0, y, 0, y.length);
        }

        @Override
        public SolverStats stats() {
            return new SolverStats(0, 0, 0, 0, 0);
        }
    }

    /** One pending event execution. */
    private static final class Pending {
        final int event;
        final double time;
        final double[] values;
        final long seq;
        /** Sensitivity runs: d(execution time)/dθ (length nc); with values from the trigger time, their dθ. */
        double[] dTime;
        double[] dValues;

        Pending(int event, double time, double[] values, long seq) {
            this.event = event;
            this.time = time;
            this.values = values;
            this.seq = seq;
        }
    }

    /** State of one simulation. */
    private final class Run {
        final int n = model.stateCount();
        final List<BoundEvent> events = model.form().events();
        final int ne = events.size();
        /** Event root functions (events, then trigger atoms): the root index of right-hand-side switch k is nr + k. */
        final int nr = model.eventRootCount();
        final double[] y = new double[n];
        final double[] p;
        final double[] w = new double[Math.max(1, model.localCount())];
        final boolean[] trig = new boolean[ne];
        final List<Pending> pending = new ArrayList<>();
        final double[] scratch = new double[1];
        final java.util.SplittableRandom random = new java.util.SplittableRandom(TIE_BREAK_SEED);
        IntegrationSession session;
        double t;
        long seq;

        final DelayRecord hist;
        double chunk = Double.POSITIVE_INFINITY;

        final double[] pDeclared;
        /** Roots of the stop being handled (null when it is not a root), and scratch for their values. */
        int[] rootHere;
        double[] gNow;
        /** Sensitivity state, or null for a plain simulation. */
        final Sens sens;
        /** Number of right-hand-side switches (root indices nr..nr+ns) and their root functions (null: none). */
        final int ns = model.rhsSwitchCount();
        SwitchRoots switchRoots;
        double lastSwitchTime = Double.NEGATIVE_INFINITY;
        int rapidSwitches;
        /** Switches on time only (their times are found ahead, {@link #nextTimeSwitch}); scratch and bracket. */
        final boolean[] timeOnly = new boolean[ns];
        boolean timeOnlySwitches;
        double[] gA;
        double[] gB;
        /** Bracket of the next switch on time only (valid while haveSliver and sliverLo &gt;= t); last output time. */
        double sliverLo = Double.NaN;
        double sliverHi;
        boolean haveSliver;
        double tEnd = Double.POSITIVE_INFINITY;

        Run(double[] pDeclared, double t0, DelayRecord hist) {
            t = t0;
            this.pDeclared = pDeclared.clone();
            this.hist = hist;
            this.p = new double[model.parameterCount()];
            this.sens = null;
            model.initialValues(t0, pDeclared, y, p);
            if (hist != null) {
                hist.init(this);
                refreshLocals();
                for (Expr lag : model.form().delayLags()) {
                    double l = value(lag);
                    if (l > 0 && l / 4 < chunk) {
                        chunk = l / 4;
                    }
                }
                hist.record(t, y);
            }
            begin(t0, model, null, null);
        }

        Run(double t0, double[] y0, double[] pSys, OdeSystem sys, int[] sensParams, double[] s0, double[] dP) {
            t = t0;
            this.pDeclared = null;
            this.hist = null;
            this.p = pSys;
            System.arraycopy(y0, 0, y, 0, n);
            this.sens = sensParams == null ? null : new Sens(sensParams.length, s0, dP);
            begin(t0, sys, n == 0 || sens == null ? null : sensParams, n == 0 || sens == null ? null : sens.s);
        }

        private void begin(double t0, OdeSystem sys, int[] sensParams, double[] s0) {
            for (int e = 0; e < ne; e++) {
                trig[e] = events.get(e).initialValue();
            }
            RootFunctions rf = ne > 0 ? new PaddedRoots(model.switchingFunctions(), n) : null;
            boolean frozen = constantStates();
            if (ns > 0 && !frozen) {
                switchRoots = new SwitchRoots(model.rootFunctions(), nr);
                rf = switchRoots;
                for (int k = 0; k < ns; k++) {
                    timeOnly[k] = model.rhsSwitchOnTimeOnly(k);
                    timeOnlySwitches |= timeOnly[k];
                }
                gA = new double[nr + ns];
                gB = new double[nr + ns];
            }
            session = frozen
                    ? new FrozenSession(n == 0 ? new double[1] : y, p, rf, t0)
                    : integrator.start(n == 0 ? new Padded(model) : sys, t0, n == 0 ? new double[1] : y, p, rf,
                            sensParams, s0);
            if (handleEvents(false, null)) {
                session.reset(n == 0 ? scratch : y, sensOut());
            }
        }

        /** The sensitivity array handed to the session, or null. */
        private double[] sensOut() {
            return sens == null || n == 0 ? null : sens.s;
        }

        /** True when every derivative is structurally zero (states change only through events). */
        private boolean constantStates() {
            for (Expr d : model.form().runtime().outputs()) {
                if (!d.isConst(0.0)) {
                    return false;
                }
            }
            return true;
        }

        void advanceTo(double tOut) {
            while (t < tOut) {
                double target = tOut;
                for (Pending pe : pending) {
                    if (pe.time > t && pe.time < target) {
                        target = pe.time;
                    }
                }
                if (hist != null && target > t + chunk) {
                    target = t + chunk;
                }
                boolean armed = false;
                if (timeOnlySwitches && !(sliverLo >= t)) {
                    // look ahead past the target too: the stop time must be set before a step can cross
                    haveSliver = nextTimeSwitch(t, target) || target < tEnd && nextTimeSwitch(target, tEnd);
                    if (!haveSliver) {
                        sliverLo = tEnd;
                        // nor may a step cross the last output time: a switch can sit right after it (t <= t_end)
                        session.stopAt(tEnd);
                    }
                }
                if (haveSliver && sliverLo >= t && session.stopAt(sliverLo) && sliverLo <= target) {
                    target = sliverLo;
                    armed = true;
                }
                t = session.advance(target, n == 0 ? scratch : y, sensOut());
                if (hist != null) {
                    hist.record(t, y);
                }
                if (armed && !session.stoppedAtRoot() && t == sliverLo) {
                    stepOverTimeSwitch();
                    continue;
                }
                boolean atRoot = session.stoppedAtRoot();
                int[] found = atRoot ? session.rootsFound() : null;
                boolean switched = false;
                if (atRoot && switchRoots != null) {
                    int[] eventRoots = eventRoots(found);
                    for (int k : found) {
                        switched |= k >= nr;
                    }
                    if (switched) {
                        if (sens != null) {
                            sens.switchJump(this, found);
                        }
                        watchChattering(found);
                        // a switch in a fast rate law moves its equilibrium
                        reequilibrate(true);
                    }
                    found = eventRoots;
                    atRoot = eventRoots.length > 0;
                } else if (atRoot) {
                    found = eventRoots(found);
                }
                boolean changed = ne > 0 && handleEvents(atRoot, atRoot ? found : null);
                if (changed || switched) {
                    session.reset(n == 0 ? scratch : y, sensOut());
                    if (changed && hist != null) {
                        hist.record(t, y);
                    }
                }
            }
        }

        /**
         * Finds the earliest sign change in (from, target] of a switching function that depends on time only, by
         * sampling 16 points and bisecting to the bracket width of the {@link IntegrationSession} root contract;
         * the bracket goes to [sliverLo, sliverHi] (old values hold at sliverLo, new ones at sliverHi), an end
         * exactly on the root moved outward by one bracket width (not below the current time).
         *
         * @return whether one was found
         */
        private boolean nextTimeSwitch(double from, double target) {
            if (!(target > from)) {
                return false;
            }
            switchRoots.evaluate(from, y, p, gA);
            double a = from;
            for (int i = 1; i <= TIME_SWITCH_SAMPLES; i++) {
                double b = i == TIME_SWITCH_SAMPLES ? target : from + (target - from) * i / TIME_SWITCH_SAMPLES;
                switchRoots.evaluate(b, y, p, gB);
                if (timeSwitchChanged()) {
                    double[] br = bisectTimeSwitch(switchRoots, y, p, a, b, gA, gB, nr, ns, true);
                    double lo = br[0];
                    double hi = br[1];
                    // A bracket end exactly on a root (g = 0) is ambiguous: the root convention counts it on the
                    // side g >= 0, while the condition itself may already (time - t_on < 0 at t_on) or still
                    // (time - t_on <= 0) take the other value there. Such an end moves one bracket width outward,
                    // so the old branch of f holds at sliverLo and the new one at sliverHi: an implicit step ending
                    // at sliverLo would otherwise evaluate f on the new branch and fail its error test down to
                    // step-size underflow (measured on Isensee_JCB2018, a switch at a measurement time).
                    double width = hi - lo;
                    if (onTimeSwitchRoot(lo)) {
                        lo = Math.max(t, lo - width);
                    }
                    if (onTimeSwitchRoot(hi)) {
                        hi += width;
                    }
                    sliverLo = lo;
                    sliverHi = hi;
                    return true;
                }
                a = b;
                System.arraycopy(gB, 0, gA, 0, gA.length);
            }
            return false;
        }

        /** Whether a switching function on time only is exactly 0 at time x (uses gB as scratch). */
        private boolean onTimeSwitchRoot(double x) {
            switchRoots.evaluate(x, y, p, gB);
            for (int k = 0; k < ns; k++) {
                if (timeOnly[k] && gB[nr + k] == 0.0) {
                    return true;
                }
            }
            return false;
        }

        /** Whether a time-only switch differs in sign between gA and gB. */
        private boolean timeSwitchChanged() {
            return Simulator.this.timeSwitchChanged(gA, gB, nr, ns);
        }

        /**
         * At sliverLo, the old side of a time switch: moves to sliverHi (the state changes by at most the sliver
         * width times |f|, about 1e-12 relative), applies the sensitivity jump and restarts there, so no step of the
         * integrator ever straddles the switch.
         */
        private void stepOverTimeSwitch() {
            switchRoots.evaluate(sliverLo, y, p, gA);
            switchRoots.evaluate(sliverHi, y, p, gB);
            int c = 0;
            for (int k = 0; k < ns; k++) {
                if ((gA[nr + k] >= 0) != (gB[nr + k] >= 0)) {
                    c++;
                }
            }
            int[] found = new int[c];
            c = 0;
            for (int k = 0; k < ns; k++) {
                if ((gA[nr + k] >= 0) != (gB[nr + k] >= 0)) {
                    found[c++] = nr + k;
                }
            }
            t = sliverHi;
            haveSliver = false;
            sliverLo = Double.NaN;
            if (sens != null && found.length > 0) {
                sens.switchJump(this, found);
            }
            if (found.length > 0) {
                reequilibrate(true);
            }
            session.restartAt(t, n == 0 ? scratch : y, sensOut());
            if (ne > 0 && handleEvents(false, null)) {
                session.reset(n == 0 ? scratch : y, sensOut());
            }
        }

        /**
         * Brings the state back to the fast reactions' equilibrium (no-op without fast reactions). After an event,
         * the total derivatives of the state at the moving event time ({@code sens.d}) are projected with it
         * (implicit function theorem, the time term included). At a right-hand-side switch in a sensitivity run,
         * {@link Sens#switchJump} does the projection together with the jump.
         */
        private void reequilibrate(boolean atSwitch) {
            if (model.fastReactionCount() == 0 || sens != null && atSwitch) {
                return;
            }
            model.equilibrateFast(t, y, p);
            if (sens != null) {
                sens.ensureD(this);
                model.projectFastSensitivities(t, y, p, sens.d, sens.dP, sens.tauC, sens.nc);
            }
        }

        /**
         * The events among the roots found: event roots below ne as they are, trigger atoms (ne..nr) as the event
         * they belong to, each event once; right-hand-side switches (from nr on) left out.
         */
        private int[] eventRoots(int[] found) {
            int[] ev = new int[found.length];
            int c = 0;
            for (int k : found) {
                if (k < nr) {
                    int e = model.eventOfRoot(k);
                    boolean seen = false;
                    for (int i = 0; i < c; i++) {
                        seen |= ev[i] == e;
                    }
                    if (!seen) {
                        ev[c++] = e;
                    }
                }
            }
            return c == found.length ? ev : java.util.Arrays.copyOf(ev, c);
        }

        /**
         * Guards against a sliding mode (the flow pushes the state back across the switch from both sides, so roots
         * follow each other at ever smaller spacing): after {@link #CHATTER_STOPS} consecutive switch stops closer
         * than {@link #CHATTER_SPACING} (relative to max(1, |t|)) to the previous one, the switches involved stop
         * being roots and the integration steps across them, as it does for conditions that are no switches.
         */
        private void watchChattering(int[] found) {
            if (t - lastSwitchTime <= CHATTER_SPACING * Math.max(1.0, Math.abs(t))) {
                rapidSwitches++;
            } else {
                rapidSwitches = 0;
            }
            lastSwitchTime = t;
            if (rapidSwitches >= CHATTER_STOPS) {
                for (int k : found) {
                    if (k >= nr) {
                        switchRoots.masked[k - nr] = true;
                    }
                }
                rapidSwitches = 0;
            }
        }

        private void refreshLocals() {
            model.locals(t, y, p, w);
        }

        private boolean truth(Expr e) {
            return Interpreter.truth(e, t, y, p, w);
        }

        private double value(Expr e) {
            return Interpreter.evaluate(e, t, y, p, w);
        }

        /**
         * Whether the trigger of event e holds now. At a root of e's switching function the locator stops where the
         * new sign holds (g &gt;= 0 for a trigger turning true), which for a strict inequality can be g = 0 exactly:
         * the trigger then counts as true, as it is just after the crossing (otherwise the event would fire only at
         * the next stop).
         */
        boolean holds(int e) {
            if (truth(events.get(e).trigger())) {
                return true;
            }
            if (rootHere == null) {
                return false;
            }
            for (int k : rootHere) {
                if (k == e) {
                    if (gNow == null) {
                        gNow = new double[nr];
                    }
                    model.switchingFunctions().evaluate(t, y, p, gNow);
                    return gNow[e] >= 0;
                }
            }
            return false;
        }

        private double[] assignmentValues(BoundEvent ev) {
            double[] v = new double[ev.targets().size()];
            for (int i = 0; i < v.length; i++) {
                v[i] = value(ev.targets().get(i).value());
            }
            return v;
        }

        /**
         * Processes triggers and due executions at the current time; returns true when states changed.
         *
         * @param atRoot true when the integration stopped at a root of {@code roots}
         */
        boolean handleEvents(boolean atRoot, int[] roots) {
            boolean changed = false;
            int executed = 0;
            rootHere = atRoot ? roots : null;
            if (sens != null) {
                refreshLocals();
                sens.beginInstant(this, atRoot, roots);
            }
            while (true) {
                refreshLocals();
                for (int e = 0; e < ne; e++) {
                    BoundEvent ev = events.get(e);
                    boolean now = holds(e);
                    if (now && !trig[e]) {
                        double delay = ev.delay() == null ? 0.0 : value(ev.delay());
                        if (!(delay >= 0)) {
                            // SBML: a delay must evaluate to a non-negative number (from memory); a negative one
                            // would schedule the execution in the past
                            throw new org.switchfit.util.UserInputException(org.switchfit.util.SourceLocation
                                    .ofElement(model.form().model().source(), ev.id()), String.format(java.util.Locale.ROOT,
                                    "the delay of event '%s' is %s when it triggers at t = %.6g; SBML requires a "
                                            + "delay >= 0: correct the event's delay", ev.id(), delay, t));
                        }
                        double[] vals = ev.useValuesFromTriggerTime() ? assignmentValues(ev) : null;
                        Pending pe = new Pending(e, ev.delay() == null ? t : t + delay, vals, seq++);
                        if (sens != null) {
                            sens.triggered(this, e, pe);
                        }
                        pending.add(pe);
                    } else if (!now && trig[e] && !ev.persistent()) {
                        final int fe = e;
                        pending.removeIf(pe -> pe.event == fe);
                    }
                    trig[e] = now;
                }
                Pending next = null;
                double bestPrio = Double.NEGATIVE_INFINITY;
                int ties = 0;
                for (Pending pe : pending) {
                    if (pe.time > t) {
                        continue;
                    }
                    BoundEvent ev = events.get(pe.event);
                    double prio = ev.priority() == null ? Double.NEGATIVE_INFINITY : value(ev.priority());
                    if (Double.isNaN(prio)) {
                        prio = Double.NEGATIVE_INFINITY;
                    }
                    if (next == null || prio > bestPrio) {
                        next = pe;
                        bestPrio = prio;
                        ties = 1;
                    } else if (prio == bestPrio) {
                        if (ev.priority() != null) {
                            // equal explicit priorities: SBML leaves the order random; seeded reservoir choice
                            ties++;
                            if (random.nextInt(ties) == 0) {
                                next = pe;
                            }
                        } else if (pe.event < next.event || (pe.event == next.event && pe.seq < next.seq)) {
                            next = pe;
                        }
                    }
                }
                if (next == null) {
                    if (changed && sens != null) {
                        sens.endInstant(this);
                    }
                    return changed;
                }
                pending.remove(next);
                execute(next.event, next.values, next.dValues);
                // fast reactions re-equilibrate instantly after the event (before triggers are checked again)
                reequilibrate(false);
                changed = true;
                if (++executed > MAX_EVENTS_PER_INSTANT) {
                    throw new IntegrationException(t, "more than " + MAX_EVENTS_PER_INSTANT + " event executions at "
                            + "one time point; the events retrigger each other");
                }
            }
        }

        private void execute(int event, double[] precomputed, double[] dPrecomputed) {
            BoundEvent ev = events.get(event);
            double[] v = precomputed != null ? precomputed : assignmentValues(ev);
            double[] dv = sens == null ? null : sens.valueDerivatives(this, event, dPrecomputed);
            List<BoundEvent.Target> ts = ev.targets();
            // Every value is computed from the state before the event assigns anything (SBML), the compartment
            // size that turns an assigned concentration into an amount included.
            double[] out = v.clone();
            for (int i = 0; i < out.length; i++) {
                BoundEvent.Target tg = ts.get(i);
                if (tg.scale() != null) {
                    double sc = value(tg.scale());
                    if (dv != null) {
                        sens.assignScaled(this, event, i, v[i], sc, dv);
                    }
                    out[i] = v[i] * sc;
                }
            }
            for (int i = 0; i < out.length; i++) {
                BoundEvent.Target tg = ts.get(i);
                y[tg.stateIndex()] = out[i];
                if (dv != null && tg.scale() == null) {
                    sens.assign(tg.stateIndex(), dv, i);
                }
            }
        }
    }

    /**
     * Sensitivity bookkeeping of one run (see {@link #simulateSensitivities}): s between events; during one instant
     * the total derivative {@code d = s⁻ + f⁻ τᵀ} of the state at the moving event time, τ = d t_ev/dθ.
     */
    private final class Sens {
        final int nc;
        final double[] s;
        final double[] dP;
        final double[] d;
        final double[] tauC;
        final double[] f;
        final double[] ent;
        final double[] tmp;
        final EventDerivatives ed;
        /** Right-hand-side switches: all switching values, parameters with forced modes, f on either side. */
        final double[] gAll;
        final double[] pModes;
        final double[] fMinus;
        final RootFunctions allRoots;
        boolean dReady;

        Sens(int nc, double[] s0, double[] dP) {
            int n = model.stateCount();
            this.nc = nc;
            this.s = s0.clone();
            this.dP = dP;
            this.d = new double[nc * n];
            this.tauC = new double[nc];
            this.f = new double[n];
            this.ed = model.eventDerivatives();
            this.ent = new double[ed.entryCount()];
            this.tmp = new double[nc];
            int ns = model.rhsSwitchCount();
            this.gAll = new double[model.eventRootCount() + ns];
            this.pModes = new double[ns == 0 ? 0 : model.parameterCount() + ns];
            this.fMinus = new double[ns == 0 ? 0 : n];
            this.allRoots = model.rootFunctions();
        }

        /**
         * Jump of the sensitivities where right-hand-side switches change value at a time t*(θ) (the integration
         * stopped at their root, the state is continuous): {@code s⁺ = s⁻ + (f⁻ - f⁺) τᵀ}, the conditions of
         * {@link #simulateSensitivities} with h = y, τ = d t* / dθ from the switching function g of the first switch
         * found: {@code τ = -(∂g/∂y s⁻ + ∂g/∂p dp/dθ) / (∂g/∂y f⁻ + ∂g/∂t)}. f⁻ and f⁺ are the right-hand side at
         * the stop with the switching conditions forced to their old and new values (at the located root the
         * condition itself is ambiguous); the new value is the side of g's sign at the stop, where the root
         * locator leaves it. Switches at the same instant with another τ share the first one's (as for events).
         *
         * @param found root indices of the stop (event roots below nr, switches from nr on)
         */
        void switchJump(Run r, int[] found) {
            int n = r.n;
            int nr = r.nr;
            int m = model.parameterCount();
            allRoots.evaluate(r.t, r.y, r.p, gAll);
            System.arraycopy(r.p, 0, pModes, 0, m);
            for (int k = 0; k < r.ns; k++) {
                pModes[m + k] = gAll[nr + k] >= 0 ? 1.0 : -1.0;
            }
            model.rhsForced(r.t, r.y, pModes, f);
            int first = -1;
            for (int k : found) {
                if (k >= nr) {
                    pModes[m + k - nr] = -pModes[m + k - nr];
                    if (first < 0) {
                        first = k - nr;
                    }
                }
            }
            model.rhsForced(r.t, r.y, pModes, fMinus);
            int row = ed.rhsSwitchRow(first);
            ed.evaluate(r.t, r.y, r.p, ent);
            ed.total(row, ent, s, dP, null, nc, tmp);
            boolean numZero = true;
            for (int c = 0; c < nc; c++) {
                numZero &= tmp[c] == 0.0;
            }
            java.util.Arrays.fill(tauC, 0.0);
            if (!numZero) {
                double den = ed.alongFlow(row, ent, fMinus);
                if (!(Math.abs(den) > 0) || !Double.isFinite(den)) {
                    throw new IntegrationException(r.t, "the condition " + model.rhsSwitchConditions().get(first)
                            + " of the right-hand side changes where it is tangent to the solution (d g/dt = " + den
                            + "); its switching time has no derivative with respect to the parameters");
                }
                for (int c = 0; c < nc; c++) {
                    double tau = -tmp[c] / den;
                    tauC[c] = tau;
                    for (int i = 0; i < n; i++) {
                        s[c * n + i] += (fMinus[i] - f[i]) * tau;
                    }
                }
            }
            if (model.fastReactionCount() > 0) {
                // the new mode moves the fast equilibrium: project the total derivatives d = s⁺ + f⁺ τ at the
                // moving switching time with the state, then s⁺ = d - f⁺ τ with f⁺ at the projected state
                for (int k : found) {
                    if (k >= nr) {
                        pModes[m + k - nr] = -pModes[m + k - nr];
                    }
                }
                for (int c = 0; c < nc; c++) {
                    for (int i = 0; i < n; i++) {
                        d[c * n + i] = s[c * n + i] + f[i] * tauC[c];
                    }
                }
                model.equilibrateFast(r.t, r.y, r.p);
                model.projectFastSensitivities(r.t, r.y, r.p, d, dP, tauC, nc);
                System.arraycopy(r.p, 0, pModes, 0, m);
                model.rhsForced(r.t, r.y, pModes, f);
                for (int c = 0; c < nc; c++) {
                    for (int i = 0; i < n; i++) {
                        s[c * n + i] = d[c * n + i] - f[i] * tauC[c];
                    }
                }
            }
        }

        /** Fixes τ for the instant: from the first root whose event fires, else from a due delayed execution. */
        void beginInstant(Run r, boolean atRoot, int[] roots) {
            java.util.Arrays.fill(tauC, 0.0);
            dReady = false;
            if (atRoot) {
                for (int k : roots) {
                    if (!r.trig[k] && r.holds(k)) {
                        triggerTimeDerivative(r, k);
                        return;
                    }
                }
            }
            for (Pending pe : r.pending) {
                if (pe.time <= r.t && pe.dTime != null) {
                    System.arraycopy(pe.dTime, 0, tauC, 0, nc);
                    return;
                }
            }
        }

        /** τ from the switching function of event k at the current (pre-event) state. */
        private void triggerTimeDerivative(Run r, int k) {
            int row = ed.switchingRow(k);
            ed.evaluate(r.t, r.y, r.p, ent);
            model.rhs(r.t, r.y, r.p, f);
            double den = ed.alongFlow(row, ent, f);
            ed.total(row, ent, s, dP, null, nc, tmp);
            boolean numZero = true;
            for (int c = 0; c < nc; c++) {
                numZero &= tmp[c] == 0.0;
            }
            if (numZero) {
                return;
            }
            if (!(Math.abs(den) > 0) || !Double.isFinite(den)) {
                throw new IntegrationException(r.t, "event '" + r.events.get(k).id() + "' fires where its trigger "
                        + "is tangent to the solution (d g/dt = " + den + "); the event time has no derivative "
                        + "with respect to the parameters");
            }
            for (int c = 0; c < nc; c++) {
                tauC[c] = -tmp[c] / den;
            }
        }

        /** d = s + f τᵀ at the current state, once per instant before the first change. */
        private void ensureD(Run r) {
            if (dReady) {
                return;
            }
            int n = r.n;
            model.rhs(r.t, r.y, r.p, f);
            for (int c = 0; c < nc; c++) {
                double tc = tauC[c];
                for (int i = 0; i < n; i++) {
                    d[c * n + i] = s[c * n + i] + f[i] * tc;
                }
            }
            dReady = true;
        }

        /** Derivatives of a new pending execution: time (delay) and values used from the trigger time. */
        void triggered(Run r, int e, Pending pe) {
            BoundEvent ev = r.events.get(e);
            if (ev.delay() == null && !ev.useValuesFromTriggerTime()) {
                return;
            }
            ensureD(r);
            ed.evaluate(r.t, r.y, r.p, ent);
            pe.dTime = tauC.clone();
            if (ev.delay() != null) {
                ed.total(ed.delayRow(e), ent, d, dP, tauC, nc, tmp);
                for (int c = 0; c < nc; c++) {
                    pe.dTime[c] += tmp[c];
                }
            }
            if (ev.useValuesFromTriggerTime()) {
                int nt = ev.targets().size();
                pe.dValues = new double[nt * nc];
                for (int i = 0; i < nt; i++) {
                    ed.total(ed.valueRow(e, i), ent, d, dP, tauC, nc, tmp);
                    System.arraycopy(tmp, 0, pe.dValues, i * nc, nc);
                }
            }
        }

        /** θ-derivatives of the assigned values of event e ({@code [target * nc + c]}), before any assignment. */
        double[] valueDerivatives(Run r, int e, double[] precomputed) {
            ensureD(r);
            if (precomputed != null) {
                return precomputed;
            }
            BoundEvent ev = r.events.get(e);
            int nt = ev.targets().size();
            double[] dv = new double[nt * nc];
            ed.evaluate(r.t, r.y, r.p, ent);
            for (int i = 0; i < nt; i++) {
                ed.total(ed.valueRow(e, i), ent, d, dP, tauC, nc, tmp);
                System.arraycopy(tmp, 0, dv, i * nc, nc);
            }
            return dv;
        }

        void assign(int state, double[] dv, int target) {
            int n = model.stateCount();
            for (int c = 0; c < nc; c++) {
                d[c * n + state] = dv[target * nc + c];
            }
        }

        /** Scaled target: d(v · scale) = dv · scale + v · dscale, scale taken before the event assigns anything. */
        void assignScaled(Run r, int e, int target, double v, double scale, double[] dv) {
            ed.evaluate(r.t, r.y, r.p, ent);
            ed.total(ed.scaleRow(e, target), ent, d, dP, tauC, nc, tmp);
            int n = r.n;
            int state = r.events.get(e).targets().get(target).stateIndex();
            for (int c = 0; c < nc; c++) {
                tmp[c] = dv[target * nc + c] * scale + v * tmp[c];
            }
            for (int c = 0; c < nc; c++) {
                d[c * n + state] = tmp[c];
            }
        }

        /** s⁺ = d - f⁺ τᵀ after the last execution of the instant. */
        void endInstant(Run r) {
            int n = r.n;
            model.rhs(r.t, r.y, r.p, f);
            for (int c = 0; c < nc; c++) {
                double tc = tauC[c];
                for (int i = 0; i < n; i++) {
                    s[c * n + i] = d[c * n + i] - f[i] * tc;
                }
            }
        }
    }
}
