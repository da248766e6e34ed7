package org.switchfit.objective;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.switchfit.data.ParameterScale;
import org.switchfit.ode.CompiledModel;
import org.switchfit.model.OdeForm;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.ModelOutputs;
import org.switchfit.ode.Simulator;
import org.switchfit.ode.Trajectory;
import org.switchfit.util.UserInputException;
import org.switchfit.ode.SolverSettings;
import org.switchfit.ode.bdf.BdfIntegrator;
import org.switchfit.ode.bdf.BdfSession;
import org.switchfit.problem.Condition;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.Measurement;
import org.switchfit.problem.ObservableDef;
import org.switchfit.problem.SimulationExperiment;
import org.switchfit.problem.ValueSource;

/**
 * Residuals of the measurements of one {@link SimulationExperiment}, with exact gradients from forward
 * sensitivities: BDF with staggered sensitivities ({@link BdfSession}) for dy/dθ through a {@link ThetaSystem},
 * initial sensitivities from the derivative of the initial block (initial assignments) times dp/dθ, optional
 * pre-equilibration by integrating states and sensitivities until the right-hand side is negligible (see
 * {@link SteadyState}), then the simulation condition from time 0 with re-initialised species.
 *
 * <p>Residuals per measurement (transformed data m' and prediction h' for log/log10 observables): normal noise
 * {@code r = (m' - h') / σ}; Laplace {@code r = sign(m' - h') sqrt(2 |m' - h'| / b)}. When σ depends on θ (or on
 * the state) a second residual {@code sqrt(2 log σ + C)} carries the normalisation, C = {@link #SIGMA_SHIFT}; its
 * square is exact, so the returned NLL is exact. Constant normalisations ({@code 0.5 log(2πσ²)}, {@code log 2b},
 * the log-data Jacobian {@code log m'} or {@code log(m' ln 10)}, as PEtab v1 defines the likelihood) go into
 * {@link #constant()}.
 */
final class ExperimentBlock implements ResidualBlock {
    /**
     * Default C in {@code sqrt(2 log σ + C)}: makes the residual real for σ &gt; exp(-C/2) ≈ 2e-22; smaller σ raise
     * an {@link ObjectiveException}. When σ is directly an estimated parameter with a positive lower bound L,
     * {@code C = max(1, 1 - 2 log L)} instead (real on the whole box, and a smaller constant keeps the cost, and so
     * the optimizer's relative stopping tests, close to the NLL).
     */
    static final double SIGMA_SHIFT = 100.0;
    private static final double LN10 = Math.log(10.0);
    private static final double LOG_2PI = Math.log(2.0 * Math.PI);

    private final EstimationProblem problem;
    private final CompiledModel model;
    private final InitialDerivative initD;
    private final SimulationExperiment exp;
    private final Condition sim;
    private final Condition pre;
    private final int n;
    private final int m;
    private final int np;
    private final int[] cols;
    private final int[] colOf;
    private final int[] rows;
    private final int[] rowOffset;
    private final boolean[] sigmaVariable;
    private final double[] fixedSigma;
    private final double[] shift;
    private final int size;
    private final double constant;
    private final BdfIntegrator integrator;
    private final SteadyState steady;
    private final ThreadLocal<Work> work;
    private final int[][] derivRows;
    private final Simulator simulator;
    private final List<org.switchfit.expr.Expr> timeSwitches;
    private final ModelOutputs stateOutputs;
    private final int[][] derivCols;
    /**
     * Models with events or right-hand-side switches (simulator path): Jacobian from sensitivities with jumps
     * (else finite differences).
     */
    private final boolean exactEventGradients;

    ExperimentBlock(EstimationProblem problem, InitialDerivative initD, int experiment, SolverSettings settings,
                    SteadyState steady) {
        this.problem = problem;
        this.model = problem.compiled();
        this.initD = initD;
        this.exp = problem.experiments().get(experiment);
        this.sim = problem.conditions().get(exp.condition());
        this.pre = exp.preequilibration() >= 0 ? problem.conditions().get(exp.preequilibration()) : null;
        this.n = model.stateCount();
        this.m = model.parameterCount();
        this.np = problem.parameterCount();
        this.integrator = BdfIntegrator.of(settings);
        this.steady = steady;
        boolean[] active = new boolean[np];
        for (Condition c : pre == null ? List.of(sim) : List.of(sim, pre)) {
            for (int i = 0; i < c.targetCount(); i++) {
                active[c.targetTheta(i)] = true;
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
        rows = exp.measurements();
        rowOffset = new int[rows.length];
        sigmaVariable = new boolean[rows.length];
        fixedSigma = new double[rows.length];
        shift = new double[rows.length];
        int off = 0;
        double c = 0.0;
        for (int i = 0; i < rows.length; i++) {
            Measurement me = problem.measurements().get(rows[i]);
            ObservableDef od = problem.observables().get(me.observable());
            rowOffset[i] = off;
            double s = constantSigma(me, od);
            fixedSigma[i] = s;
            sigmaVariable[i] = Double.isNaN(s);
            off += sigmaVariable[i] ? 2 : 1;
            c += transformConstant(od.transformation(), me.value());
            if (sigmaVariable[i]) {
                shift[i] = sigmaShift(me, od);
                c += (od.noise() == ObservableDef.Noise.LAPLACE ? Math.log(2.0) : 0.5 * LOG_2PI) - 0.5 * shift[i];
            } else if (!(s > 0)) {
                throw new org.switchfit.util.UserInputException(me.location(), String.format(Locale.ROOT,
                        "noise spread of observable '%s' evaluates to %s; it must be positive: correct the noise "
                        + "formula or the noiseParameters", od.id(), s));
            } else {
                c += od.noise() == ObservableDef.Noise.LAPLACE ? Math.log(2.0 * s) : 0.5 * LOG_2PI + Math.log(s);
            }
        }
        size = off;
        constant = c;
        int no = problem.observables().size();
        derivRows = new int[no][];
        derivCols = new int[no][];
        for (int o = 0; o < no; o++) {
            derivRows[o] = problem.observableDerivativeRows(o);
            derivCols[o] = problem.observableDerivativeCols(o);
        }
        work = ThreadLocal.withInitial(Work::new);
        timeSwitches = timeSwitches(model);
        if (problem.hasEvents() || switchesOnTheSimulatorPath()) {
            if (pre != null) {
                throw new UserInputException(problem.measurements().get(rows[0]).location(), "pre-equilibration of"
                        + " a model with events is not supported; remove the preequilibrationConditionId");
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
            simulator = new Simulator(model, integrator);
            boolean negative = false;
            for (int row : rows) {
                negative |= problem.measurements().get(row).time() < 0;
            }
            exactEventGradients = model.form().delaySlots().isEmpty() && !negative;
        } else {
            stateOutputs = null;
            simulator = null;
            exactEventGradients = false;
        }
    }

    /**
     * Whether a model without events but with right-hand-side switches (piecewise conditions on time or states,
     * {@link CompiledModel#rhsSwitchCount}) runs on the simulator path, whose sensitivities take the jump of a
     * θ-dependent switching time: yes unless the experiment needs pre-equilibration or a steady-state measurement,
     * which that path lacks (then the direct path below stops at the time-only switches it can compute in advance,
     * {@link #timeSwitches}, without the jump).
     */
    private boolean switchesOnTheSimulatorPath() {
        if (model.rhsSwitchCount() == 0 || pre != null) {
            return false;
        }
        for (int row : rows) {
            if (problem.measurements().get(row).time() == Double.POSITIVE_INFINITY) {
                return false;
            }
        }
        return true;
    }

    static double transformConstant(ParameterScale t, double value) {
        switch (t) {
            case LOG:
                return Math.log(value);
            case LOG10:
                return Math.log(value * LN10);
            default:
                return 0.0;
        }
    }

    /** C for a row with variable σ (see {@link #SIGMA_SHIFT}). */
    private double sigmaShift(Measurement me, ObservableDef od) {
        if (od.sigma().op() != org.switchfit.expr.Op.PARAM || od.sigma().index() < m) {
            return SIGMA_SHIFT;
        }
        int k = od.sigma().index();
        int oOff = problem.obsPlaceholderOffset();
        int nOff = problem.noisePlaceholderOffset();
        ValueSource src = k < oOff ? problem.globalSources().get(k - m)
                : k < nOff ? me.obsParameters().get(k - oOff) : me.noiseParameters().get(k - nOff);
        if (!src.isTheta()) {
            return SIGMA_SHIFT;
        }
        double lower = problem.parameters().get(src.thetaIndex()).lower();
        return lower > 0 ? Math.max(1.0, 1.0 - 2.0 * Math.log(lower)) : SIGMA_SHIFT;
    }

    /** σ when it is a constant for this row, else NaN. */
    private double constantSigma(Measurement me, ObservableDef od) {
        if (Double.isFinite(me.fixedSigma())) {
            return me.fixedSigma();
        }
        int gOff = m;
        int oOff = problem.obsPlaceholderOffset();
        int nOff = problem.noisePlaceholderOffset();
        boolean variable = od.sigma().contains(e -> {
            switch (e.op()) {
                case STATE:
                case LOCAL:
                case TIME:
                    return true;
                case PARAM: {
                    int k = e.index();
                    if (k < gOff) {
                        return true;
                    }
                    if (k < oOff) {
                        return problem.globalSources().get(k - gOff).isTheta();
                    }
                    if (k < nOff) {
                        return me.obsParameters().get(k - oOff).isTheta();
                    }
                    return me.noiseParameters().get(k - nOff).isTheta();
                }
                default:
                    return false;
            }
        });
        if (variable) {
            return Double.NaN;
        }
        double[] q = new double[problem.qLength()];
        fillQ(q, me, null);
        double[] out = new double[2];
        problem.evaluateObservable(me.observable(), 0.0, new double[n], q, out);
        return out[1];
    }

    /** Fills q[m..) (globals and placeholders) for a row; p_eff part untouched. */
    private void fillQ(double[] q, Measurement me, double[] linear) {
        List<ValueSource> g = problem.globalSources();
        for (int i = 0; i < g.size(); i++) {
            q[m + i] = value(g.get(i), linear);
        }
        int oOff = problem.obsPlaceholderOffset();
        for (int i = 0; i < me.obsParameters().size(); i++) {
            q[oOff + i] = value(me.obsParameters().get(i), linear);
        }
        int nOff = problem.noisePlaceholderOffset();
        for (int i = 0; i < me.noiseParameters().size(); i++) {
            q[nOff + i] = value(me.noiseParameters().get(i), linear);
        }
    }

    private static double value(ValueSource s, double[] linear) {
        if (s.isTheta()) {
            return linear == null ? Double.NaN : linear[s.thetaIndex()];
        }
        return s.constant();
    }

    @Override
    public int size() {
        return size;
    }

    @Override
    public double constant() {
        return constant;
    }

    /** Per-thread arrays. */
    private final class Work {
        final int nc = cols.length;
        final double[] y = new double[n];
        final double[] yAux = new double[n];
        final double[] pDecl = new double[m];
        final double[] pEff = new double[m + nc];
        final double[] pEffPre = new double[m + nc];
        final double[] s = new double[nc * n];
        final double[] sAux = new double[nc * n];
        final double[] dPeff = new double[m * Math.max(nc, 1)];
        final double[] dPeffPre = new double[m * Math.max(nc, 1)];
        final double[] initVals = new double[initD == null ? 0 : initD.size()];
        final int[] kCol = new int[m];
        final double[] kFac = new double[m];
        final double[] q = new double[problem.qLength()];
        final double[] out = new double[2];
        final double[] deriv;
        final double[] gradH = new double[np];
        final double[] gradS = new double[np];
        final ThetaSystem sys = new ThetaSystem(model, nc);
        final int[] sensParams = new int[nc];

        Work() {
            int max = 0;
            for (int o = 0; o < problem.observables().size(); o++) {
                max = Math.max(max, problem.observableDerivativeCount(o));
            }
            deriv = new double[max];
            Arrays.fill(kCol, -1);
            for (int c = 0; c < nc; c++) {
                sensParams[c] = m + c;
            }
        }
    }

    /**
     * Initial state, effective parameters and (when {@code sens}) their θ-derivatives for condition c:
     * y0 into {@code y}, p_eff into {@code pEff[0..m)}, dy0/dθ into {@code s} (column-major by θ column),
     * dp_eff/dθ into {@code dPeff[k * nc + c]}.
     */
    private void initial(Work w, Condition c, double[] linear, double[] dLinear, boolean sens, double[] y,
                         double[] pEff, double[] s, double[] dPeff) {
        c.declared(linear, w.pDecl);
        double[] pe = new double[m];
        model.initialValues(0.0, w.pDecl, y, pe);
        System.arraycopy(pe, 0, pEff, 0, m);
        if (!sens) {
            return;
        }
        int nc = w.nc;
        Arrays.fill(s, 0, nc * n, 0.0);
        Arrays.fill(dPeff, 0, m * nc, 0.0);
        if (nc == 0) {
            return;
        }
        for (int i = 0; i < c.targetCount(); i++) {
            int j = c.targetTheta(i);
            w.kCol[c.target(i)] = colOf[j];
            w.kFac[c.target(i)] = dLinear[j];
        }
        initD.evaluate(y, w.pDecl, w.initVals);
        int[] r = initD.rows;
        int[] k = initD.cols;
        for (int e = 0; e < r.length; e++) {
            int col = w.kCol[k[e]];
            if (col < 0) {
                continue;
            }
            double v = w.initVals[e] * w.kFac[k[e]];
            if (r[e] < n) {
                s[col * n + r[e]] += v;
            } else {
                dPeff[(r[e] - n) * nc + col] += v;
            }
        }
        for (int i = 0; i < c.targetCount(); i++) {
            w.kCol[c.target(i)] = -1;
        }
    }

    @Override
    public void evaluate(EvaluationContext ctx, double[] r, int offset, double[] jac) {
        if (simulator != null) {
            evaluateWithEvents(ctx, r, offset, jac);
            return;
        }
        Work w = work.get();
        boolean sens = jac != null && w.nc > 0;
        double[] linear = ctx.linearValues();
        double[] dLinear = new double[np];
        for (int j = 0; j < np; j++) {
            dLinear[j] = ctx.linearDerivative(j);
        }
        int nc = w.nc;
        try {
            if (pre != null) {
                initial(w, pre, linear, dLinear, sens, w.y, w.pEffPre, w.s, w.dPeffPre);
                if (sens) {
                    w.sys.setColumns(w.dPeffPre);
                }
                BdfSession ses = integrator.start(w.sys, 0.0, w.y, w.pEffPre, null, sens ? w.sensParams : null,
                        sens ? w.s : null);
                steady.run(ses, model, w.pEffPre, w.y, sens ? w.s : null, "pre-equilibration condition '"
                        + pre.id() + "'");
                initial(w, sim, linear, dLinear, sens, w.yAux, w.pEff, w.sAux, w.dPeff);
                for (int i : sim.reinit()) {
                    w.y[i] = w.yAux[i];
                    if (sens) {
                        for (int c = 0; c < nc; c++) {
                            w.s[c * n + i] = w.sAux[c * n + i];
                        }
                    }
                }
            } else {
                initial(w, sim, linear, dLinear, sens, w.y, w.pEff, w.s, w.dPeff);
            }
            if (sens) {
                w.sys.setColumns(w.dPeff);
            }
            BdfSession ses = null;
            double[] breaks = null;
            int nextBreak = 0;
            double t = 0.0;
            for (int i = 0; i < rows.length; i++) {
                Measurement me = problem.measurements().get(rows[i]);
                double tm = me.time();
                if (tm > t) {
                    if (ses == null) {
                        ses = integrator.start(w.sys, t, w.y, w.pEff, null, sens ? w.sensParams : null,
                                sens ? w.s : null);
                        breaks = breakpoints(w.pEff, w.y);
                    }
                    if (tm == Double.POSITIVE_INFINITY) {
                        steady.run(ses, model, w.pEff, w.y, sens ? w.s : null, "condition '" + sim.id() + "'");
                    } else {
                        nextBreak = advanceTo(ses, tm, breaks, nextBreak, w.y, sens ? w.s : null);
                    }
                    t = tm;
                }
                row(ctx, w, i, me, t, linear, dLinear, sens, r, offset, jac);
            }
        } catch (IntegrationException e) {
            throw new ObjectiveException("experiment '" + exp.id() + "': " + e.getMessage(), e);
        }
    }

    private void row(EvaluationContext ctx, Work w, int i, Measurement me, double t, double[] linear,
                     double[] dLinear, boolean sens, double[] r, int offset, double[] jac) {
        int o = me.observable();
        ObservableDef od = problem.observables().get(o);
        System.arraycopy(w.pEff, 0, w.q, 0, m);
        fillQ(w.q, me, linear);
        problem.evaluateObservable(o, t, w.y, w.q, w.out);
        double h = w.out[0];
        double sigma = sigmaVariable[i] ? w.out[1] : fixedSigma[i];
        if (ctx != null) {
            ctx.record(rows[i], h, sigma);
        }
        boolean wantJac = jac != null;
        if (wantJac) {
            Arrays.fill(w.gradH, 0.0);
            Arrays.fill(w.gradS, 0.0);
            chain(w, me, o, t, dLinear, sens);
        }
        double hm = h;
        double mv = me.value();
        double dhm = 1.0;
        switch (od.transformation()) {
            case LOG:
                hm = Math.log(h);
                mv = Math.log(mv);
                dhm = 1.0 / h;
                break;
            case LOG10:
                hm = Math.log10(h);
                mv = Math.log10(mv);
                dhm = 1.0 / (h * LN10);
                break;
            default:
                break;
        }
        if (!Double.isFinite(hm) || !(sigma > 0) || !Double.isFinite(sigma)) {
            throw new ObjectiveException(String.format(Locale.ROOT, "experiment '%s', observable '%s' at t = %.6g:"
                    + " prediction %s or noise spread %s is not usable (%s)", exp.id(), od.id(), t, h, sigma,
                    me.location()));
        }
        int ro = offset + rowOffset[i];
        double d = mv - hm;
        double res;
        double dResDhm;
        double dResDs;
        if (od.noise() == ObservableDef.Noise.LAPLACE) {
            double u = 2.0 * Math.abs(d) / sigma;
            double su = Math.sqrt(u);
            res = Math.copySign(su, d);
            // d res / d hm = -1 / (sigma su), d res / d sigma = -res / (2 sigma); 0 at d = 0 (not differentiable)
            dResDhm = su > 0 ? -1.0 / (sigma * su) : 0.0;
            dResDs = -res / (2.0 * sigma);
        } else {
            res = d / sigma;
            dResDhm = -1.0 / sigma;
            dResDs = -res / sigma;
        }
        r[ro] = res;
        double rs = 0.0;
        if (sigmaVariable[i]) {
            double arg = 2.0 * Math.log(sigma) + shift[i];
            if (!(arg > 0)) {
                throw new ObjectiveException(String.format(Locale.ROOT, "experiment '%s', observable '%s': noise "
                        + "spread %.3g is below exp(-%.1f)", exp.id(), od.id(), sigma, shift[i] / 2));
            }
            rs = Math.sqrt(arg);
            r[ro + 1] = rs;
        }
        if (wantJac) {
            int base = ro * np;
            for (int j = 0; j < np; j++) {
                jac[base + j] = dResDhm * dhm * w.gradH[j] + (sigmaVariable[i] ? dResDs * w.gradS[j] : 0.0);
            }
            if (sigmaVariable[i]) {
                int b2 = (ro + 1) * np;
                double f = 1.0 / (rs * sigma);
                for (int j = 0; j < np; j++) {
                    jac[b2 + j] = f * w.gradS[j];
                }
            }
        }
    }

    /**
     * Models with events or right-hand-side switches: simulation with SBML event semantics ({@link Simulator}),
     * stopping at the switches. The Jacobian comes from forward sensitivities carried across the events and the
     * θ-dependent switching times by their jump conditions ({@link Simulator#simulateSensitivities}),
     * exact up to the integration tolerance. Models with {@code delay()} in their mathematics, measurement times
     * before 0, and evaluations whose sensitivity integration fails while the states alone integrate fall back to
     * central finite differences on θ (step {@link #FD_STEP} on the estimation scale; accuracy about
     * rtol / FD_STEP relative).
     */
    private void evaluateWithEvents(EvaluationContext ctx, double[] r, int offset, double[] jac) {
        double[] linear = ctx.linearValues();
        if (jac == null) {
            simulateRows(ctx, linear, r, offset);
            return;
        }
        if (exactEventGradients) {
            try {
                evaluateEventSensitivities(ctx, r, offset, jac);
                return;
            } catch (IntegrationException e) {
                // the sensitivity run can fail where the states alone integrate (an absolute tolerance below the
                // round-off of the sensitivities, measured on Smith_BMCSystBiol2013 at atol 1e-14): fall back to
                // finite differences for this evaluation; a failure of the states is reported below
            }
        }
        simulateRows(ctx, linear, r, offset);
        double[] rp = new double[r.length];
        double[] rm = new double[r.length];
        double[] lin = linear.clone();
        for (int j = 0; j < np; j++) {
            org.switchfit.problem.FreeParameter fp = problem.parameters().get(j);
            double th = ctx.theta(j);
            double hstep = FD_STEP * Math.max(1.0, Math.abs(th));
            lin[j] = fp.toLinear(th + hstep);
            simulateRows(null, lin, rp, offset);
            lin[j] = fp.toLinear(th - hstep);
            simulateRows(null, lin, rm, offset);
            lin[j] = linear[j];
            for (int i = offset; i < offset + size; i++) {
                jac[i * np + j] = (rp[i] - rm[i]) / (2.0 * hstep);
            }
        }
    }

    /**
     * Residuals and exact Jacobian of a model with events from sensitivities with jumps at the events.
     *
     * @throws IntegrationException when the integration of states and sensitivities fails
     */
    private void evaluateEventSensitivities(EvaluationContext ctx, double[] r, int offset, double[] jac) {
        Work w = work.get();
        int nc = w.nc;
        double[] linear = ctx.linearValues();
        double[] dLinear = new double[np];
        for (int j = 0; j < np; j++) {
            dLinear[j] = ctx.linearDerivative(j);
        }
        initial(w, sim, linear, dLinear, true, w.y, w.pEff, w.s, w.dPeff);
        w.sys.setColumns(w.dPeff);
        double[] times = measurementTimes();
        double[] ys = new double[times.length * n];
        double[] ss = new double[times.length * nc * n];
        simulator.simulateSensitivities(times, w.sys, 0.0, w.y, w.pEff, w.sensParams, w.s, w.dPeff, ys, ss);
        for (int i = 0; i < rows.length; i++) {
            System.arraycopy(ys, i * n, w.y, 0, n);
            System.arraycopy(ss, i * nc * n, w.s, 0, nc * n);
            row(ctx, w, i, problem.measurements().get(rows[i]), times[i], linear, dLinear, true, r, offset, jac);
        }
    }

    /** Measurement times of the rows; steady-state measurements are refused for models with events. */
    private double[] measurementTimes() {
        double[] times = new double[rows.length];
        for (int i = 0; i < rows.length; i++) {
            double tm = problem.measurements().get(rows[i]).time();
            if (tm == Double.POSITIVE_INFINITY) {
                throw new UserInputException(problem.measurements().get(rows[i]).location(), "steady-state "
                        + "measurements of a model with events are not supported; give a finite time");
            }
            times[i] = tm;
        }
        return times;
    }

    /** Central-difference step on the estimation scale for models with events. */
    static final double FD_STEP = 1e-4;

    private void simulateRows(EvaluationContext ctx, double[] linear, double[] r, int offset) {
        Work w = work.get();
        sim.declared(linear, w.pDecl);
        double[] pe = new double[m];
        model.initialValues(0.0, w.pDecl, w.y, pe);
        System.arraycopy(pe, 0, w.pEff, 0, m);
        double[] times = measurementTimes();
        Trajectory tr;
        try {
            tr = simulator.simulate(times, w.pDecl, stateOutputs);
        } catch (IntegrationException e) {
            throw new ObjectiveException("experiment '" + exp.id() + "': " + e.getMessage(), e);
        }
        for (int i = 0; i < rows.length; i++) {
            for (int k = 0; k < n; k++) {
                w.y[k] = tr.value(i, k);
            }
            row(ctx, w, i, problem.measurements().get(rows[i]), times[i], linear, null, false, r, offset, null);
        }
    }

    /**
     * Comparisons {@code a op b} of the model whose difference {@code a - b} involves time but no state or runtime
     * local: they switch the right-hand side at a time computable in advance (piecewise inputs). The integration
     * stops and restarts there instead of stepping across the discontinuity. Sensitivities are carried across
     * unchanged, which is exact when the switch time does not depend on θ (partial otherwise: the jump term of a
     * θ-dependent switch time is not added). Used only by experiments that stay on this direct path (with
     * pre-equilibration or steady-state measurements); the others run on the simulator path, which adds the jump
     * ({@link #switchesOnTheSimulatorPath}).
     */
    private static List<org.switchfit.expr.Expr> timeSwitches(CompiledModel model) {
        List<org.switchfit.expr.Expr> out = new ArrayList<>();
        org.switchfit.expr.Block b = model.form().runtime();
        List<org.switchfit.expr.Expr> all = new ArrayList<>(b.locals());
        all.addAll(b.outputs());
        for (org.switchfit.expr.Expr e : all) {
            e.forEach(x -> {
                if (x.op().isRelational() && x.op() != org.switchfit.expr.Op.EQ
                        && x.op() != org.switchfit.expr.Op.NEQ && x.argCount() == 2) {
                    org.switchfit.expr.Expr g = org.switchfit.expr.Expr.sub(x.arg(0), x.arg(1));
                    boolean time = g.contains(l -> l.op() == org.switchfit.expr.Op.TIME);
                    boolean other = g.contains(l -> l.op() == org.switchfit.expr.Op.STATE
                            || l.op() == org.switchfit.expr.Op.LOCAL);
                    if (time && !other && !out.contains(g)) {
                        out.add(g);
                    }
                }
            });
        }
        return out;
    }

    /** Sorted positive switch times for effective parameters p (switch functions linear in time only). */
    private double[] breakpoints(double[] p, double[] y) {
        if (timeSwitches.isEmpty()) {
            return new double[0];
        }
        double[] w = new double[0];
        double[] t = new double[timeSwitches.size()];
        int c = 0;
        for (org.switchfit.expr.Expr g : timeSwitches) {
            double g0 = org.switchfit.expr.Interpreter.evaluate(g, 0.0, y, p, w);
            double g1 = org.switchfit.expr.Interpreter.evaluate(g, 1.0, y, p, w);
            double g2 = org.switchfit.expr.Interpreter.evaluate(g, 2.0, y, p, w);
            double slope = g1 - g0;
            if (slope == 0.0 || !(Math.abs(g2 - g1 - slope) <= 1e-12 * (Math.abs(slope) + Math.abs(g0)))) {
                continue;
            }
            double tb = -g0 / slope;
            if (tb > 0 && Double.isFinite(tb)) {
                t[c++] = tb;
            }
        }
        double[] out = Arrays.copyOf(t, c);
        Arrays.sort(out);
        return out;
    }

    /** Advances to tOut, stopping and restarting at every switch time on the way; returns the next switch index. */
    private static int advanceTo(BdfSession ses, double tOut, double[] breaks, int next, double[] y, double[] s) {
        int k = next;
        while (k < breaks.length && breaks[k] <= tOut) {
            if (breaks[k] > ses.time()) {
                ses.setStopTime(breaks[k]);
                ses.advance(breaks[k], y, s);
                ses.reset(y, s);
            }
            k++;
        }
        ses.setStopTime(k < breaks.length ? breaks[k] : Double.POSITIVE_INFINITY);
        if (tOut > ses.time()) {
            ses.advance(tOut, y, s);
        }
        return k;
    }

    /** Fills gradH, gradS: dh/dθ and dσ/dθ at the current state and sensitivities. */
    private void chain(Work w, Measurement me, int o, double t, double[] dLinear, boolean sens) {
        int cnt = problem.observableDerivativeCount(o);
        problem.evaluateObservableDerivatives(o, t, w.y, w.q, w.deriv);
        int[] dr = derivRows[o];
        int[] dc = derivCols[o];
        int nc = w.nc;
        int gOff = m;
        int oOff = problem.obsPlaceholderOffset();
        int nOff = problem.noisePlaceholderOffset();
        for (int e = 0; e < cnt; e++) {
            double v = w.deriv[e];
            if (v == 0.0) {
                continue;
            }
            double[] g = dr[e] == 0 ? w.gradH : w.gradS;
            int var = dc[e];
            if (var < n) {
                if (sens) {
                    for (int c = 0; c < nc; c++) {
                        g[cols[c]] += v * w.s[c * n + var];
                    }
                }
                continue;
            }
            int k = var - n;
            if (k < gOff) {
                if (sens) {
                    for (int c = 0; c < nc; c++) {
                        g[cols[c]] += v * w.dPeff[k * nc + c];
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
