package org.switchfit.objective;

import java.util.Arrays;
import java.util.Locale;
import org.switchfit.data.ParameterScale;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.Measurement;
import org.switchfit.problem.ObservableDef;
import org.switchfit.problem.SimulationExperiment;
import org.switchfit.problem.ValueSource;
import org.switchfit.util.UserInputException;

/**
 * Residuals of the measurements of one {@link SimulationExperiment}, with exact gradients from forward
 * sensitivities dy/dθ, simulated by {@link ExperimentSimulation} (initial-assignment derivatives, optional
 * pre-equilibration, staggered BDF sensitivities, sensitivities across events).
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
    private final SimulationExperiment exp;
    private final int n;
    private final int m;
    private final int np;
    private final int[] rows;
    private final double[] times;
    private final int[] rowOffset;
    private final boolean[] sigmaVariable;
    private final double[] fixedSigma;
    private final double[] shift;
    private final int size;
    private final double constant;
    private final ExperimentSimulation simulation;
    private final ThreadLocal<Work> work;
    /** Models with events: Jacobian from sensitivities with event jumps (else finite differences). */
    private final boolean exactEventGradients;

    ExperimentBlock(EstimationProblem problem, InitialDerivative initD, int experiment, SolverSettings settings,
                    SteadyState steady) {
        this.problem = problem;
        this.exp = problem.experiments().get(experiment);
        this.n = problem.compiled().stateCount();
        this.m = problem.compiled().parameterCount();
        this.np = problem.parameterCount();
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
                throw new UserInputException(me.location(), String.format(Locale.ROOT,
                        "noise spread of observable '%s' evaluates to %s; it must be positive: correct the noise "
                        + "formula or the noiseParameters", od.id(), s));
            } else {
                c += od.noise() == ObservableDef.Noise.LAPLACE ? Math.log(2.0 * s) : 0.5 * LOG_2PI + Math.log(s);
            }
        }
        size = off;
        constant = c;
        times = new double[rows.length];
        for (int i = 0; i < rows.length; i++) {
            times[i] = problem.measurements().get(rows[i]).time();
        }
        simulation = new ExperimentSimulation(problem, experiment, initD, settings, steady, false,
                rows.length > 0 ? problem.measurements().get(rows[0]).location() : null);
        if (simulation.hasEvents()) {
            for (int row : rows) {
                Measurement me = problem.measurements().get(row);
                if (me.time() == Double.POSITIVE_INFINITY) {
                    throw new UserInputException(me.location(), "steady-state measurements of a model with events "
                            + "are not supported; give a finite time");
                }
            }
        }
        exactEventGradients = simulation.hasEvents() && simulation.exactEventSensitivities(times);
        work = ThreadLocal.withInitial(Work::new);
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
        ExperimentSimulation.fillPlaceholders(problem, q, me, null);
        double[] out = new double[2];
        problem.evaluateObservable(me.observable(), 0.0, new double[n], q, out);
        return out[1];
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
        final ExperimentSimulation.State st = simulation.newState();
        final double[] gradH = new double[np];
        final double[] gradS = new double[np];
    }

    @Override
    public void evaluate(EvaluationContext ctx, double[] r, int offset, double[] jac) {
        if (simulation.hasEvents()) {
            evaluateWithEvents(ctx, r, offset, jac);
            return;
        }
        Work w = work.get();
        boolean sens = jac != null && w.st.nc > 0;
        double[] linear = ctx.linearValues();
        double[] dLinear = dLinear(ctx);
        try {
            simulation.run(w.st, linear, dLinear, sens, times,
                    (i, t) -> row(ctx, w, i, t, linear, dLinear, sens, r, offset, jac));
        } catch (IntegrationException e) {
            throw new ObjectiveException("experiment '" + exp.id() + "': " + e.getMessage(), e);
        }
    }

    private double[] dLinear(EvaluationContext ctx) {
        double[] dLinear = new double[np];
        for (int j = 0; j < np; j++) {
            dLinear[j] = ctx.linearDerivative(j);
        }
        return dLinear;
    }

    private void row(EvaluationContext ctx, Work w, int i, double t, double[] linear, double[] dLinear, boolean sens,
                     double[] r, int offset, double[] jac) {
        Measurement me = problem.measurements().get(rows[i]);
        int o = me.observable();
        ObservableDef od = problem.observables().get(o);
        ExperimentSimulation.State st = w.st;
        simulation.fillQ(st, me, linear);
        problem.evaluateObservable(o, t, st.y, st.q, st.out);
        double h = st.out[0];
        double sigma = sigmaVariable[i] ? st.out[1] : fixedSigma[i];
        if (ctx != null) {
            ctx.record(rows[i], h, sigma);
        }
        if (jac != null) {
            Arrays.fill(w.gradH, 0.0);
            Arrays.fill(w.gradS, 0.0);
            simulation.chain(st, me, o, t, dLinear, sens, w.gradH, w.gradS);
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
        if (jac != null) {
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
     * Models with events: simulation with SBML event semantics ({@link ExperimentSimulation}). The Jacobian comes
     * from forward sensitivities carried across the events by their jump conditions, exact up to the integration
     * tolerance. Models with {@code delay()} in their mathematics, measurement times before 0, and evaluations
     * whose sensitivity integration fails while the states alone integrate fall back to central finite
     * differences on θ (step {@link #FD_STEP} on the estimation scale; accuracy about rtol / FD_STEP relative).
     */
    private void evaluateWithEvents(EvaluationContext ctx, double[] r, int offset, double[] jac) {
        double[] linear = ctx.linearValues();
        if (jac == null) {
            simulateRows(ctx, linear, r, offset);
            return;
        }
        if (exactEventGradients) {
            Work w = work.get();
            double[] dLinear = dLinear(ctx);
            try {
                simulation.run(w.st, linear, dLinear, true, times,
                        (i, t) -> row(ctx, w, i, t, linear, dLinear, true, r, offset, jac));
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

    /** Central-difference step on the estimation scale for models with events. */
    static final double FD_STEP = 1e-4;

    /** Residuals (no Jacobian) of a model with events, at θ given on the linear scale. */
    private void simulateRows(EvaluationContext ctx, double[] linear, double[] r, int offset) {
        Work w = work.get();
        try {
            simulation.run(w.st, linear, null, false, times,
                    (i, t) -> row(ctx, w, i, t, linear, null, false, r, offset, null));
        } catch (IntegrationException e) {
            throw new ObjectiveException("experiment '" + exp.id() + "': " + e.getMessage(), e);
        }
    }
}
