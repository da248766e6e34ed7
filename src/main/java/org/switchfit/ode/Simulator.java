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
 * event execution. Immutable; {@link #simulate} may run concurrently from several threads.
 *
 * <p>Order of simultaneous events: highest priority first (priority evaluated when choosing; events without
 * priority come after those with one), ties in model order. Events with useValuesFromTriggerTime compute their
 * assignment values when triggered, the others when executed.
 */
public final class Simulator {
    /** Maximum number of event executions at one time point before giving up (cycles of events). */
    static final int MAX_EVENTS_PER_INSTANT = 10_000;

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

    /** One pending event execution. */
    private static final class Pending {
        final int event;
        final double time;
        final double[] values;
        final long seq;

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
        final double[] y = new double[n];
        final double[] p = new double[model.parameterCount()];
        final double[] w = new double[Math.max(1, model.localCount())];
        final boolean[] trig = new boolean[ne];
        final List<Pending> pending = new ArrayList<>();
        final double[] scratch = new double[1];
        IntegrationSession session;
        double t;
        long seq;

        final DelayRecord hist;
        double chunk = Double.POSITIVE_INFINITY;

        final double[] pDeclared;

        Run(double[] pDeclared, double t0, DelayRecord hist) {
            t = t0;
            this.pDeclared = pDeclared.clone();
            this.hist = hist;
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
            for (int e = 0; e < ne; e++) {
                trig[e] = events.get(e).initialValue();
            }
            session = integrator.start(n == 0 ? new Padded(model) : model, t0, n == 0 ? new double[1] : y, p,
                    ne > 0 ? new PaddedRoots(model.switchingFunctions(), n) : null, null, null);
            if (handleEvents()) {
                session.reset(n == 0 ? scratch : y, null);
            }
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
                t = session.advance(target, n == 0 ? scratch : y, null);
                if (hist != null) {
                    hist.record(t, y);
                }
                if (ne > 0 && handleEvents()) {
                    session.reset(n == 0 ? scratch : y, null);
                    if (hist != null) {
                        hist.record(t, y);
                    }
                }
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

        private double[] assignmentValues(BoundEvent ev) {
            double[] v = new double[ev.targets().size()];
            for (int i = 0; i < v.length; i++) {
                v[i] = value(ev.targets().get(i).value());
            }
            return v;
        }

        /** Processes triggers and due executions at the current time; returns true when states changed. */
        boolean handleEvents() {
            boolean changed = false;
            int executed = 0;
            while (true) {
                refreshLocals();
                for (int e = 0; e < ne; e++) {
                    BoundEvent ev = events.get(e);
                    boolean now = truth(ev.trigger());
                    if (now && !trig[e]) {
                        double delay = ev.delay() == null ? 0.0 : value(ev.delay());
                        double[] vals = ev.useValuesFromTriggerTime() ? assignmentValues(ev) : null;
                        pending.add(new Pending(e, ev.delay() == null ? t : t + delay, vals, seq++));
                    } else if (!now && trig[e] && !ev.persistent()) {
                        final int fe = e;
                        pending.removeIf(pe -> pe.event == fe);
                    }
                    trig[e] = now;
                }
                Pending next = null;
                double bestPrio = Double.NEGATIVE_INFINITY;
                for (Pending pe : pending) {
                    if (pe.time > t) {
                        continue;
                    }
                    BoundEvent ev = events.get(pe.event);
                    double prio = ev.priority() == null ? Double.NEGATIVE_INFINITY : value(ev.priority());
                    if (Double.isNaN(prio)) {
                        prio = Double.NEGATIVE_INFINITY;
                    }
                    if (next == null || prio > bestPrio
                            || (prio == bestPrio && (pe.event < next.event
                            || (pe.event == next.event && pe.seq < next.seq)))) {
                        next = pe;
                        bestPrio = prio;
                    }
                }
                if (next == null) {
                    return changed;
                }
                pending.remove(next);
                execute(events.get(next.event), next.values);
                changed = true;
                if (++executed > MAX_EVENTS_PER_INSTANT) {
                    throw new IntegrationException(t, "more than " + MAX_EVENTS_PER_INSTANT + " event executions at "
                            + "one time point; the events retrigger each other");
                }
            }
        }

        private void execute(BoundEvent ev, double[] precomputed) {
            double[] v = precomputed != null ? precomputed : assignmentValues(ev);
            List<BoundEvent.Target> ts = ev.targets();
            boolean scaled = false;
            for (int i = 0; i < v.length; i++) {
                BoundEvent.Target tg = ts.get(i);
                if (tg.scale() == null) {
                    y[tg.stateIndex()] = v[i];
                } else {
                    scaled = true;
                }
            }
            if (scaled) {
                refreshLocals();
                for (int i = 0; i < v.length; i++) {
                    BoundEvent.Target tg = ts.get(i);
                    if (tg.scale() != null) {
                        y[tg.stateIndex()] = v[i] * value(tg.scale());
                    }
                }
            }
        }
    }
}
