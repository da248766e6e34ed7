package org.switchfit.objective;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.switchfit.model.OdeForm;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.ModelOutputs;
import org.switchfit.ode.Simulator;
import org.switchfit.ode.SolverSettings;
import org.switchfit.ode.Trajectory;
import org.switchfit.ode.bdf.BdfIntegrator;
import org.switchfit.ode.bdf.BdfSession;
import org.switchfit.problem.Condition;
import org.switchfit.problem.DoseStep;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.Measurement;
import org.switchfit.problem.SimulationExperiment;
import org.switchfit.problem.ValueSource;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * One {@link SimulationExperiment} simulated with forward sensitivities dy/dθ: the path shared by the residuals
 * ({@link ExperimentBlock}) and the predictions ({@link ObservablePrediction}).
 *
 * <p>Three routes, chosen per model:
 * <ul>
 *   <li>No events, no {@code delay()}: initial sensitivities from the derivative of the initial block (initial
 *   assignments) times dp/dθ; optional pre-equilibration by integrating states and sensitivities until the
 *   right-hand side is negligible ({@link SteadyState}), then the simulation condition from time 0 with its
 *   re-initialised species. Without right-hand-side switches ({@link CompiledModel#rhsSwitchCount}) BDF with
 *   staggered sensitivities ({@link BdfSession}) through a {@link ThetaSystem} runs to each time directly.</li>
 *   <li>The same with right-hand-side switches (piecewise conditions on time or states): from the state and
 *   sensitivities at time 0 (after pre-equilibration, if any) the finite times run on the {@link Simulator}
 *   ({@link Simulator#simulateSensitivities}, {@link Simulator#simulateStates}), which stops at every switch and
 *   adds the sensitivity jump of a θ-dependent switching time. Times of +inf (steady state): the simulator runs on
 *   past the last switch on time ({@link Simulator#lastTimeSwitch}; before it the state can be at rest with the
 *   input still off), then {@link SteadyState} on a new session. A switch on states during that last run is
 *   stepped across without the jump; this does not change the result: at a stable steady state the sensitivities
 *   converge to {@code -J⁻¹ ∂f/∂θ} whatever their value at the switch. The pre-equilibration itself runs
 *   by {@link SteadyState} alone (its switches are stepped across, as before).</li>
 *   <li>Events or {@code delay()} ({@link #hasEvents}): {@link Simulator} with SBML event semantics from the
 *   condition's own initial values (and the delay history), the sensitivities carried across each event by its
 *   jump conditions ({@link Simulator#simulateSensitivities}); with a pre-equilibration, from its steady state
 *   (events do not fire during it; see {@code runWithEventsAfterSettling}), refused for {@code delay()}
 *   ({@link UserInputException}); times of +inf run on with the events active over t + 10^k until the state and
 *   sensitivities settle ({@link #eventGrid}; refused for {@code delay()} by the callers), and the sensitivities of
 *   models with {@code delay()} are not available (callers check {@link #exactEventSensitivities}).</li>
 * </ul>
 *
 * <p><b>Doses</b> ({@link SimulationExperiment#doses}, first two routes only; for models with events or
 * {@code delay()} the problem writes them into the model as events, and a dose list here is refused): the integration stops at each dose time, the dosed state or parameter changes (set or add;
 * species amounts converted from concentrations with their compartment's size), the fast equilibrium is restored,
 * and a new integration starts there. The dose time does not depend on θ, so the sensitivities are continuous
 * except for the dosed quantity: {@code ds_i/dθ} (or {@code dp_eff,k/dθ}) becomes the derivative of the new value.
 * A measurement at a dose time sees the state after the dose (as SBML output at an event time). Times of +inf lie
 * after the last dose.
 *
 * <p>Sensitivity columns: column c is the derivative by θ_{cols[c]}. The residuals use the θ that enter the model
 * through the conditions; the predictions use every θ (their extra columns stay zero but enter the denominator of
 * the BDF's RMS error norm, so the choice is kept as it was when their values were measured).
 *
 * <p>Immutable and thread-safe; per-thread arrays live in a {@link State} ({@link #newState()}, one per thread).
 */
final class ExperimentSimulation {
    private final EstimationProblem problem;
    private final CompiledModel model;
    private final InitialDerivative initD;
    private final Condition sim;
    private final Condition pre;
    private final int n;
    private final int m;
    private final int np;
    private final int[] cols;
    private final int[] colOf;
    private final int[][] derivRows;
    private final int[][] derivCols;
    private final int maxDeriv;
    private final BdfIntegrator integrator;
    private final SteadyState steady;
    /** Events or delay(): the simulator with SBML semantics from the condition's own initial values. */
    private final boolean eventRoute;
    /** Non-null for models with events, delay() or right-hand-side switches. */
    private final Simulator simulator;
    private final ModelOutputs stateOutputs;
    /** Doses of the experiment, by time. */
    private final List<DoseStep> doses;

    /** Receives the state at each requested time (the state is in the {@link State} given to {@link #run}). */
    @FunctionalInterface
    interface Sample {
        /**
         * @param index index into the requested times
         * @param t     the time the state belongs to
         */
        void at(int index, double t);
    }

    /**
     * @param allColumns every θ is a sensitivity column (else only the θ set by the experiment's conditions)
     * @param where      location named when a model with events or delay() has pre-equilibration
     * @throws UserInputException for a model with events or delay() and pre-equilibration
     */
    ExperimentSimulation(EstimationProblem problem, int experiment, InitialDerivative initD, SolverSettings settings,
                         SteadyState steady, boolean allColumns, SourceLocation where) {
        this.problem = problem;
        this.model = problem.compiled();
        this.initD = initD;
        SimulationExperiment exp = problem.experiments().get(experiment);
        this.sim = problem.conditions().get(exp.condition());
        this.pre = exp.preequilibration() >= 0 ? problem.conditions().get(exp.preequilibration()) : null;
        this.n = model.stateCount();
        this.m = model.parameterCount();
        this.np = problem.parameterCount();
        this.integrator = BdfIntegrator.of(settings);
        this.steady = steady;
        boolean[] active = new boolean[np];
        if (allColumns) {
            Arrays.fill(active, true);
        }
        for (Condition c : pre == null ? List.of(sim) : List.of(sim, pre)) {
            for (int i = 0; i < c.targetCount(); i++) {
                active[c.targetTheta(i)] = true;
            }
        }
        this.doses = exp.doses();
        for (DoseStep d : doses) {
            if (d.amount().isTheta()) {
                active[d.amount().thetaIndex()] = true;
            }
        }
        colOf = new int[np];
        Arrays.fill(colOf, -1);
        int nc = 0;
        for (int j = 0; j < np; j++) {
            if (active[j]) {
                colOf[j] = nc++;
            }
        }
        cols = new int[nc];
        for (int j = 0; j < np; j++) {
            if (colOf[j] >= 0) {
                cols[colOf[j]] = j;
            }
        }
        int no = problem.observables().size();
        derivRows = new int[no][];
        derivCols = new int[no][];
        int max = 0;
        for (int o = 0; o < no; o++) {
            derivRows[o] = problem.observableDerivativeRows(o);
            derivCols[o] = problem.observableDerivativeCols(o);
            max = Math.max(max, problem.observableDerivativeCount(o));
        }
        maxDeriv = max;
        boolean delays = !model.form().delaySlots().isEmpty();
        eventRoute = problem.hasEvents() || delays;
        if (eventRoute) {
            if (!doses.isEmpty()) {
                throw new UserInputException(doses.get(0).location(), "doses in a model with "
                        + (problem.hasEvents() ? "events" : "delay()") + " are not supported; write the dose "
                        + "into the model as an SBML event");
            }
            if (pre != null && delays) {
                throw new UserInputException(where, "pre-equilibration of a model with delay() is not supported "
                        + "(its history before time 0 is undefined); remove the preequilibrationConditionId or "
                        + "settle_in");
            }
            List<String> names = new ArrayList<>();
            OdeForm f = model.form();
            for (int i = 0; i < n; i++) {
                OdeForm.StateKind k = f.stateKind(i);
                String id = f.stateIds().get(i);
                names.add(k == OdeForm.StateKind.SPECIES_AMOUNT ? "amount(" + id + ")"
                        : k == OdeForm.StateKind.SPECIES_CONCENTRATION ? "concentration(" + id + ")" : id);
            }
            stateOutputs = ModelOutputs.of(model, names);
        } else {
            stateOutputs = null;
        }
        simulator = eventRoute || model.rhsSwitchCount() > 0 ? new Simulator(model, integrator) : null;
    }

    /**
     * Whether {@link #run} simulates with SBML event semantics from the condition's own initial values: models with
     * events or with {@code delay()} in their mathematics (the simulator keeps the delay history). Such experiments
     * have no pre-equilibration (refused when built) and no steady-state times (callers refuse them).
     */
    boolean hasEvents() {
        return eventRoute;
    }

    /**
     * Whether {@link #run} goes through the {@link Simulator}: models with events or {@code delay()} ({@link
     * #hasEvents}) and models with right-hand-side switches ({@link CompiledModel#rhsSwitchCount}), where the
     * sensitivities take the jump of a θ-dependent switching time. A sensitivity run there can fail where the states
     * alone integrate (a switching function tangent to the solution has no θ-derivative of its time), so callers
     * may fall back to finite differences.
     */
    boolean usesSimulator() {
        return simulator != null;
    }

    /**
     * Whether sensitivities across the events and switches are available: the model has no {@code delay()} in its
     * mathematics (the history of the sensitivities is not kept) and, with events, no time is negative (the states
     * alone then start at the first time, the sensitivities at 0).
     */
    boolean exactEventSensitivities(double[] times) {
        if (!model.form().delaySlots().isEmpty()) {
            return false;
        }
        if (!problem.hasEvents()) {
            return true;
        }
        for (double t : times) {
            if (t < 0) {
                return false;
            }
        }
        return true;
    }

    /** Number of sensitivity columns. */
    int columnCount() {
        return cols.length;
    }

    /** Per-thread arrays: the state at the current sample and scratch for the observable formulas. */
    final class State {
        final int nc = cols.length;
        /** State y at the sample (n). */
        final double[] y = new double[n];
        /** Effective parameters p_eff (m, then nc unused slots of the {@link ThetaSystem}). */
        final double[] pEff = new double[m + nc];
        /** Sensitivities {@code s[c * n + i] = dy_i/dθ_{cols[c]}} at the sample (when requested). */
        final double[] s = new double[nc * n];
        /** {@code dPeff[k * nc + c] = dp_eff,k/dθ_{cols[c]}} (when requested). */
        final double[] dPeff = new double[m * Math.max(nc, 1)];
        /** Parameter vector of the observable formulas (p_eff, globals, placeholders). */
        final double[] q = new double[problem.qLength()];
        /** Observable value and noise spread. */
        final double[] out = new double[2];
        final double[] deriv = new double[maxDeriv];
        private final double[] yAux = new double[n];
        private final double[] pDecl = new double[m];
        private final double[] pEffPre = new double[m + nc];
        private final double[] sAux = new double[nc * n];
        private final double[] dPeffPre = new double[m * Math.max(nc, 1)];
        private final double[] initVals = new double[initD == null ? 0 : initD.size()];
        private final int[] kCol = new int[m];
        private final double[] kFac = new double[m];
        private final ThetaSystem sys = new ThetaSystem(model, nc);
        private final int[] sensParams = new int[nc];

        private State() {
            Arrays.fill(kCol, -1);
            for (int c = 0; c < nc; c++) {
                sensParams[c] = m + c;
            }
        }
    }

    /** A new per-thread state. */
    State newState() {
        return new State();
    }

    /**
     * Simulates the experiment and calls {@code sample} at each time in order, with the state (and, when
     * {@code sens}, the sensitivities and dp_eff/dθ) in {@code st}. Times are taken in the order given; a time not
     * after the current one is sampled at the current time (times of a measurement block are sorted).
     *
     * @param linear  θ on the linear scale (read)
     * @param dLinear d(linear)/dθ per θ (read when {@code sens})
     * @param sens    integrate sensitivities
     * @throws IntegrationException when the integration fails or no steady state is reached
     */
    void run(State st, double[] linear, double[] dLinear, boolean sens, double[] times, Sample sample) {
        if (eventRoute) {
            runWithEvents(st, linear, dLinear, sens, times, sample);
            return;
        }
        start(st, linear, dLinear, sens);
        double t0 = 0.0;
        int from = 0;
        for (DoseStep d : doses) {
            if (from == times.length) {
                return; // no sample left: later doses change nothing that is read
            }
            int to = from;
            while (to < times.length && times[to] < d.time()) {
                to++;
            }
            segment(st, sens, t0, times, from, to, d.time(), sample);
            applyDose(st, d, linear, dLinear, sens);
            t0 = Math.max(t0, d.time());
            from = to;
        }
        segment(st, sens, t0, times, from, times.length, Double.NaN, sample);
    }

    /**
     * From the state in {@code st} at time t0: samples times[from..to) (the first route's BDF session, or the
     * simulator), then, when {@code stop} is not NaN, integrates on to {@code stop} (a dose time).
     */
    private void segment(State st, boolean sens, double t0, double[] times, int from, int to, double stop,
                         Sample sample) {
        if (simulator != null) {
            runOnSimulator(st, sens, t0, times, from, to, stop, sample);
            return;
        }
        BdfSession ses = null;
        double t = t0;
        for (int i = from; i <= to; i++) {
            double tm = i < to ? times[i] : stop;
            if (tm > t) {
                if (ses == null) {
                    ses = integrator.start(st.sys, t, st.y, st.pEff, null, sens ? st.sensParams : null,
                            sens ? st.s : null);
                }
                if (tm == Double.POSITIVE_INFINITY) {
                    steady.run(ses, model, st.sys, st.sensParams, st.pEff, st.y, sens ? st.s : null,
                            "condition '" + sim.id() + "'");
                } else {
                    ses.advance(tm, st.y, sens ? st.s : null);
                }
                t = tm;
            }
            if (i < to) {
                sample.at(i, t);
            }
        }
    }

    /**
     * Applies a dose at its time to the state (or p_eff) in {@code st} and, when {@code sens}, to the
     * sensitivities (or dp_eff/dθ, then the {@link ThetaSystem}'s columns); then restores the fast equilibrium.
     */
    private void applyDose(State st, DoseStep d, double[] linear, double[] dLinear, boolean sens) {
        ValueSource a = d.amount();
        double v = a.isTheta() ? linear[a.thetaIndex()] : a.constant();
        int cA = a.isTheta() ? colOf[a.thetaIndex()] : -1;
        double dv = a.isTheta() && sens ? dLinear[a.thetaIndex()] : 0.0;
        int nc = st.nc;
        if (d.state() >= 0) {
            int i = d.state();
            double size = d.sizeParameter() >= 0 ? st.pEff[d.sizeParameter()] : 1.0;
            st.y[i] = (d.add() ? st.y[i] : 0.0) + v * size;
            if (sens) {
                for (int c = 0; c < nc; c++) {
                    double ds = (c == cA ? dv * size : 0.0)
                            + (d.sizeParameter() >= 0 ? v * st.dPeff[d.sizeParameter() * nc + c] : 0.0);
                    st.s[c * n + i] = (d.add() ? st.s[c * n + i] : 0.0) + ds;
                }
            }
        } else {
            int k = d.parameter();
            st.pEff[k] = (d.add() ? st.pEff[k] : 0.0) + v;
            if (sens) {
                for (int c = 0; c < nc; c++) {
                    st.dPeff[k * nc + c] = (d.add() ? st.dPeff[k * nc + c] : 0.0) + (c == cA ? dv : 0.0);
                }
                st.sys.setColumns(st.dPeff);
            }
        }
        if (model.fastReactionCount() > 0) {
            model.equilibrateFast(d.time(), st.y, st.pEff);
            if (sens) {
                model.projectFastSensitivities(d.time(), st.y, st.pEff, st.s, st.dPeff, nc);
            }
        }
    }

    /**
     * State, effective parameters and (when {@code sens}) their θ-derivatives at time 0 of the simulation
     * condition: its initial values, or the steady state of the pre-equilibration condition with the species the
     * simulation condition re-initialises. Leaves the {@link ThetaSystem} on the simulation condition's columns.
     */
    private void start(State st, double[] linear, double[] dLinear, boolean sens) {
        int nc = st.nc;
        if (pre != null) {
            initial(st, pre, linear, dLinear, sens, st.y, st.pEffPre, st.s, st.dPeffPre);
            if (sens) {
                st.sys.setColumns(st.dPeffPre);
            }
            BdfSession ses = integrator.start(st.sys, 0.0, st.y, st.pEffPre, null, sens ? st.sensParams : null,
                    sens ? st.s : null);
            steady.run(ses, model, st.sys, st.sensParams, st.pEffPre, st.y, sens ? st.s : null,
                    "pre-equilibration condition '" + pre.id() + "'");
            initial(st, sim, linear, dLinear, sens, st.yAux, st.pEff, st.sAux, st.dPeff);
            for (int i : sim.reinit()) {
                st.y[i] = st.yAux[i];
                if (sens) {
                    for (int c = 0; c < nc; c++) {
                        st.s[c * n + i] = st.sAux[c * n + i];
                    }
                }
            }
            if (model.fastReactionCount() > 0) {
                // the re-initialised species and the new parameters move the fast equilibrium
                model.equilibrateFast(0.0, st.y, st.pEff);
                if (sens) {
                    model.projectFastSensitivities(0.0, st.y, st.pEff, st.s, st.dPeff, nc);
                }
            }
        } else {
            initial(st, sim, linear, dLinear, sens, st.y, st.pEff, st.s, st.dPeff);
        }
        if (sens) {
            st.sys.setColumns(st.dPeff);
        }
    }

    /**
     * Models with right-hand-side switches (no events, no delay()), from the state of {@link #start} at time 0: the
     * times up to the first +inf on the {@link Simulator}, which stops at every switch and adds the sensitivity jump
     * of a θ-dependent switching time; then, for +inf, on the simulator past the last switch on time ({@link
     * Simulator#lastTimeSwitch}, up to {@link SteadyState#maxTime}) and a steady-state run from there (see the class
     * comment). As on the direct route, a time not after the current one is sampled at the current time.
     */
    private void runOnSimulator(State st, boolean sens, double t0, double[] allTimes, int from, int to, double stop,
                                Sample sample) {
        double[] times = Arrays.copyOfRange(allTimes, from, Double.isNaN(stop) ? to : to + 1);
        if (!Double.isNaN(stop)) {
            times[to - from] = stop;
        }
        int nf = 0;
        double tLast = t0;
        while (nf < times.length && times[nf] != Double.POSITIVE_INFINITY) {
            tLast = Math.max(tLast, times[nf]);
            nf++;
        }
        int ns = Double.isNaN(stop) ? nf : nf - 1;
        double[] simTimes = times;
        if (nf < times.length) {
            // the steady state lies after the last switch on time: until then the state can be at rest
            double tSwitch = simulator.lastTimeSwitch(tLast, steady.maxTime(), st.y, st.pEff);
            simTimes = Arrays.copyOf(times, Double.isNaN(tSwitch) ? nf : nf + 1);
            if (!Double.isNaN(tSwitch)) {
                simTimes[nf] = tSwitch;
                tLast = tSwitch;
            }
        }
        int nr = simTimes.length;
        int nc = st.nc;
        double[] ys = new double[nr * n];
        double[] ss = sens ? new double[nr * nc * n] : null;
        if (sens) {
            simulator.simulateSensitivities(simTimes, st.sys, t0, st.y, st.pEff, st.sensParams, st.s, st.dPeff, ys,
                    ss);
        } else {
            simulator.simulateStates(simTimes, st.sys, t0, st.y, st.pEff, ys);
        }
        double t = t0;
        for (int i = 0; i < nr; i++) {
            t = Math.max(t, simTimes[i]);
            System.arraycopy(ys, i * n, st.y, 0, n);
            if (sens) {
                System.arraycopy(ss, i * nc * n, st.s, 0, nc * n);
            }
            if (i < ns) {
                sample.at(from + i, t);
            }
        }
        if (nf == times.length) {
            return;
        }
        BdfSession ses = integrator.start(st.sys, tLast, st.y, st.pEff, null, sens ? st.sensParams : null,
                sens ? st.s : null);
        steady.run(ses, model, st.sys, st.sensParams, st.pEff, st.y, sens ? st.s : null,
                "condition '" + sim.id() + "'");
        for (int i = nf; i < times.length; i++) {
            sample.at(from + i, Double.POSITIVE_INFINITY);
        }
    }

    /**
     * Models with events: sensitivities across the events when {@code sens} (requires
     * {@link #exactEventSensitivities}), else the states alone by {@link Simulator#simulate}.
     */
    private void runWithEvents(State st, double[] linear, double[] dLinear, boolean sens, double[] times,
                               Sample sample) {
        if (pre != null) {
            runWithEventsAfterSettling(st, linear, dLinear, sens, times, sample);
            return;
        }
        initial(st, sim, linear, dLinear, sens, st.y, st.pEff, st.s, st.dPeff);
        double[] grid = eventGrid(times);
        int nc = st.nc;
        double[] ys = new double[grid.length * n];
        double[] ss = sens ? new double[grid.length * nc * n] : null;
        if (!sens) {
            Trajectory tr = simulator.simulate(grid, st.pDecl, stateOutputs);
            for (int i = 0; i < grid.length; i++) {
                for (int k = 0; k < n; k++) {
                    ys[i * n + k] = tr.value(i, k);
                }
            }
        } else {
            st.sys.setColumns(st.dPeff);
            simulator.simulateSensitivities(grid, st.sys, 0.0, st.y, st.pEff, st.sensParams, st.s, st.dPeff, ys, ss);
        }
        sampleEventGrid(st, sens, times, grid, ys, ss, sample);
    }

    /**
     * The times the event route simulates for {@code times} (sorted): the finite ones as they are, and when some are
     * +inf (steady state), after the last finite time (or 0) the points {@code t + 10^k}, k = 0, 1, ... up to
     * {@link SteadyState#maxTime}: the simulator runs on with events active, and the steady state is the first of
     * these points where the state (and sensitivities) have settled ({@link #sampleEventGrid}).
     */
    private double[] eventGrid(double[] times) {
        int nf = 0;
        double last = 0.0;
        while (nf < times.length && times[nf] != Double.POSITIVE_INFINITY) {
            last = Math.max(last, times[nf]);
            nf++;
        }
        if (nf == times.length) {
            return times;
        }
        List<Double> tail = new ArrayList<>();
        for (double d = 1.0; last + d <= steady.maxTime(); d *= 10.0) {
            tail.add(last + d);
        }
        double[] grid = Arrays.copyOf(times, nf + tail.size());
        for (int k = 0; k < tail.size(); k++) {
            grid[nf + k] = tail.get(k);
        }
        return grid;
    }

    /**
     * Samples the finite times from the simulated grid and each +inf time at the first tail point of the grid where
     * {@link SteadyState#settled} holds.
     *
     * @throws IntegrationException when no tail point is settled
     */
    private void sampleEventGrid(State st, boolean sens, double[] times, double[] grid, double[] ys, double[] ss,
                                 Sample sample) {
        int nc = st.nc;
        int nf = 0;
        while (nf < times.length && times[nf] != Double.POSITIVE_INFINITY) {
            nf++;
        }
        for (int i = 0; i < nf; i++) {
            System.arraycopy(ys, i * n, st.y, 0, n);
            if (sens) {
                System.arraycopy(ss, i * nc * n, st.s, 0, nc * n);
            }
            sample.at(i, grid[i]);
        }
        if (nf == times.length) {
            return;
        }
        int j = nf;
        while (j < grid.length) {
            System.arraycopy(ys, j * n, st.y, 0, n);
            if (sens) {
                System.arraycopy(ss, j * nc * n, st.s, 0, nc * n);
            }
            double[] previous = j > nf ? Arrays.copyOfRange(ys, (j - 1) * n, j * n) : null;
            if (steady.settled(model, st.sys, st.sensParams, grid[j], st.y, st.pEff, sens ? st.s : null,
                    previous)) {
                break;
            }
            j++;
        }
        if (j == grid.length) {
            throw new IntegrationException(grid[grid.length - 1], String.format(java.util.Locale.ROOT,
                    "condition '%s': no steady state up to t = %.3g with the model's events", sim.id(),
                    grid[grid.length - 1]));
        }
        for (int i = nf; i < times.length; i++) {
            sample.at(i, Double.POSITIVE_INFINITY);
        }
    }

    /**
     * Models with events and a pre-equilibration: the steady state of the pre-equilibration condition as on the other
     * routes ({@link #start}: integration of states and sensitivities until both settle; events do not fire during
     * it, as it computes a steady state rather than a history), the simulation condition's re-initialised species on
     * top, then the simulator with SBML event semantics from that state at time 0 (a trigger true at 0 counts as
     * its initial value). As elsewhere, a time not after the current one is sampled at the current time.
     */
    private void runWithEventsAfterSettling(State st, double[] linear, double[] dLinear, boolean sens,
                                            double[] times, Sample sample) {
        start(st, linear, dLinear, sens);
        double[] at = new double[times.length];
        double t = 0.0;
        for (int i = 0; i < times.length; i++) {
            t = Math.max(t, times[i]);
            at[i] = t;
        }
        double[] grid = eventGrid(at);
        int nc = st.nc;
        double[] ys = new double[grid.length * n];
        double[] ss = sens ? new double[grid.length * nc * n] : null;
        if (sens) {
            simulator.simulateSensitivities(grid, st.sys, 0.0, st.y, st.pEff, st.sensParams, st.s, st.dPeff, ys, ss);
        } else {
            simulator.simulateStates(grid, st.sys, 0.0, st.y, st.pEff, ys);
        }
        sampleEventGrid(st, sens, at, grid, ys, ss, sample);
    }

    /**
     * Initial state, effective parameters and (when {@code sens}) their θ-derivatives for condition c:
     * y0 into {@code y}, p_eff into {@code pEff[0..m)}, dy0/dθ into {@code s} (column-major by θ column),
     * dp_eff/dθ into {@code dPeff[k * nc + c]}.
     */
    private void initial(State st, Condition c, double[] linear, double[] dLinear, boolean sens, double[] y,
                         double[] pEff, double[] s, double[] dPeff) {
        c.declared(linear, st.pDecl);
        double[] pe = new double[m];
        model.initialValues(0.0, st.pDecl, y, pe);
        System.arraycopy(pe, 0, pEff, 0, m);
        if (!sens) {
            return;
        }
        int nc = st.nc;
        Arrays.fill(s, 0, nc * n, 0.0);
        Arrays.fill(dPeff, 0, m * nc, 0.0);
        if (nc == 0) {
            return;
        }
        for (int i = 0; i < c.targetCount(); i++) {
            int j = c.targetTheta(i);
            st.kCol[c.target(i)] = colOf[j];
            st.kFac[c.target(i)] = dLinear[j];
        }
        initD.evaluate(y, st.pDecl, st.initVals);
        int[] r = initD.rows;
        int[] k = initD.cols;
        for (int e = 0; e < r.length; e++) {
            int col = st.kCol[k[e]];
            if (col < 0) {
                continue;
            }
            double v = st.initVals[e] * st.kFac[k[e]];
            if (r[e] < n) {
                s[col * n + r[e]] += v;
            } else {
                dPeff[(r[e] - n) * nc + col] += v;
            }
        }
        for (int i = 0; i < c.targetCount(); i++) {
            st.kCol[c.target(i)] = -1;
        }
        // initialValues projected y onto the fast equilibrium; s is the derivative of the unprojected state
        model.projectFastSensitivities(0.0, y, pEff, s, dPeff, nc);
    }

    /**
     * Fills {@code st.q}: p_eff, then the globals and the placeholders of measurement {@code me} (θ-valued ones
     * from {@code linear}; NaN when {@code linear} is null).
     */
    void fillQ(State st, Measurement me, double[] linear) {
        double[] q = st.q;
        System.arraycopy(st.pEff, 0, q, 0, m);
        problem.fillPlaceholders(q, me, linear);
    }

    /**
     * Adds dh/dθ into {@code gradH} and dσ/dθ into {@code gradS} (skipped when null) for observable o of
     * measurement {@code me} at the current sample ({@link #fillQ} called first): ∂/∂y · dy/dθ (when
     * {@code sens}) + ∂/∂p_eff · dp_eff/dθ (when {@code sens}) + ∂/∂(globals, placeholders) · d(linear)/dθ.
     */
    void chain(State st, Measurement me, int o, double t, double[] dLinear, boolean sens, double[] gradH,
               double[] gradS) {
        int cnt = problem.observableDerivativeCount(o);
        problem.evaluateObservableDerivatives(o, t, st.y, st.q, st.deriv);
        int[] dr = derivRows[o];
        int[] dc = derivCols[o];
        int nc = st.nc;
        int gOff = m;
        int oOff = problem.obsPlaceholderOffset();
        int nOff = problem.noisePlaceholderOffset();
        for (int e = 0; e < cnt; e++) {
            double v = st.deriv[e];
            if (v == 0.0) {
                continue;
            }
            double[] g = dr[e] == 0 ? gradH : gradS;
            if (g == null) {
                continue;
            }
            int var = dc[e];
            if (var < n) {
                if (sens) {
                    for (int c = 0; c < nc; c++) {
                        g[cols[c]] += v * st.s[c * n + var];
                    }
                }
                continue;
            }
            int k = var - n;
            if (k < gOff) {
                if (sens) {
                    for (int c = 0; c < nc; c++) {
                        g[cols[c]] += v * st.dPeff[k * nc + c];
                    }
                }
                continue;
            }
            ValueSource src;
            if (k < oOff) {
                src = problem.globalSources().get(k - gOff);
            } else if (k < nOff) {
                src = me.obsParameters().get(k - oOff);
            } else {
                src = me.noiseParameters().get(k - nOff);
            }
            if (src.isTheta()) {
                g[src.thetaIndex()] += v * dLinear[src.thetaIndex()];
            }
        }
    }
}
