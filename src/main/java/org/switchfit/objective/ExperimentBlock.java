package org.switchfit.objective;

import java.util.Arrays;
import java.util.Locale;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.Measurement;
import org.switchfit.problem.ObservableDef;
import org.switchfit.problem.SimulationExperiment;
import org.switchfit.problem.ValueSource;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Residuals of the measurements of one {@link SimulationExperiment}, with exact gradients from forward
 * sensitivities dy/dθ, simulated by {@link ExperimentSimulation} (initial-assignment derivatives, optional
 * pre-equilibration, staggered BDF sensitivities, sensitivities across events).
 *
 * <p>Residuals per measurement by {@link NoiseResidual} (normal or Laplace noise on the observable's scale, a
 * second residual {@code sqrt(2 log σ + C)} when σ depends on θ or the state). C is
 * {@link NoiseResidual#SIGMA_SHIFT}, except when σ is directly an estimated parameter with a positive lower bound
 * L: then {@code C = max(1, 1 - 2 log L)} (real on the whole box, and a smaller constant keeps the cost, and so the
 * optimizer's relative stopping tests, close to the NLL).
 */
final class ExperimentBlock implements ResidualBlock {
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
    /**
     * Models simulated by the simulator (events, delay(), right-hand-side switches): Jacobian from sensitivities
     * with event and switch jumps (else finite differences).
     */
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
            off += NoiseResidual.size(sigmaVariable[i]);
            if (sigmaVariable[i]) {
                shift[i] = sigmaShift(me, od);
            } else if (!(s > 0) || s == Double.POSITIVE_INFINITY) {
                throw new UserInputException(me.location(), String.format(Locale.ROOT,
                        "noise spread of observable '%s' evaluates to %s for this data point; it must be positive and "
                        + "finite: correct the observable's noise definition (%s) or the noise values given for this "
                        + "point (its sigma, or in PEtab its noiseParameters)",
                        od.id(), s, od.location() == null ? "" : SourceLocation.ofLine(od.location().file(),
                        od.location().line())));
            }
            c = NoiseResidual.addConstant(c, od, me.value(), sigmaVariable[i], s, shift[i]);
        }
        size = off;
        constant = c;
        times = new double[rows.length];
        for (int i = 0; i < rows.length; i++) {
            times[i] = problem.measurements().get(rows[i]).time();
        }
        simulation = new ExperimentSimulation(problem, experiment, initD, settings, steady, false,
                rows.length > 0 ? problem.measurements().get(rows[0]).location() : null);
        if (simulation.hasEvents() && !problem.compiled().form().delaySlots().isEmpty()) {
            for (int row : rows) {
                Measurement me = problem.measurements().get(row);
                if (me.time() == Double.POSITIVE_INFINITY) {
                    throw new UserInputException(me.location(), "steady-state measurements of a model with "
                            + "delay() are not supported; give a finite time");
                }
            }
        }
        exactEventGradients = simulation.usesSimulator() && simulation.exactEventSensitivities(times);
        work = ThreadLocal.withInitial(Work::new);
    }

    /** C for a row with variable σ (see the class comment). */
    private double sigmaShift(Measurement me, ObservableDef od) {
        if (od.sigma().op() != org.switchfit.expr.Op.PARAM || od.sigma().index() < m) {
            return NoiseResidual.SIGMA_SHIFT;
        }
        ValueSource src = slotSource(me, od.sigma().index());
        if (!src.isTheta()) {
            return NoiseResidual.SIGMA_SHIFT;
        }
        double lower = problem.parameters().get(src.thetaIndex()).lower();
        return lower > 0 ? Math.max(1.0, 1.0 - 2.0 * Math.log(lower)) : NoiseResidual.SIGMA_SHIFT;
    }

    /** Where q slot {@code k >= m} of a row gets its value: a global, an observable or a noise placeholder. */
    private ValueSource slotSource(Measurement me, int k) {
        int oOff = problem.obsPlaceholderOffset();
        int nOff = problem.noisePlaceholderOffset();
        return k < oOff ? problem.globalSources().get(k - m)
                : k < nOff ? me.obsParameters().get(k - oOff) : me.noiseParameters().get(k - nOff);
    }

    /**
     * σ when it is a constant for this row, else NaN. The row's constant globals and placeholders are put into the
     * noise formula first, so a term they zero (noiseParameters {@code 0.2;0} of {@code a + b * X}) does not make
     * σ variable.
     */
    private double constantSigma(Measurement me, ObservableDef od) {
        if (Double.isFinite(me.fixedSigma())) {
            return me.fixedSigma();
        }
        org.switchfit.expr.Expr sigma = od.sigma().mapLeaves(e -> {
            if (e.op() != org.switchfit.expr.Op.PARAM || e.index() < m || slotSource(me, e.index()).isTheta()) {
                return e;
            }
            return org.switchfit.expr.Expr.constant(slotSource(me, e.index()).constant());
        });
        if (sigma.isConst()) {
            return sigma.value();
        }
        boolean variable = sigma.contains(e -> {
            switch (e.op()) {
                case STATE:
                case LOCAL:
                case TIME:
                    return true;
                case PARAM:
                    return e.index() < m || slotSource(me, e.index()).isTheta();
                default:
                    return false;
            }
        });
        if (variable) {
            return Double.NaN;
        }
        double[] q = new double[problem.qLength()];
        problem.fillPlaceholders(q, me, null);
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
        if (simulation.usesSimulator()) {
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

    /**
     * States without sensitivities at each time (sorted, +inf only for models without events or delay()) into
     * {@code y[i]} (new arrays) and p_eff at each time into {@code pAt[i]} (new arrays, length m; doses can change it),
     * by the same
     * {@link ExperimentSimulation} as the residuals, on this thread's state.
     *
     * @throws IntegrationException when the integration fails or no steady state is reached
     */
    void states(double[] linear, double[] times, double[][] y, double[][] pAt) {
        if (simulation.hasEvents()) {
            for (double t : times) {
                if (t == Double.POSITIVE_INFINITY) {
                    throw new IllegalArgumentException("experiment '" + exp.id() + "': steady state (time +inf) "
                            + "of a model with events or delay() is not supported");
                }
            }
        }
        ExperimentSimulation.State st = work.get().st;
        simulation.run(st, linear, null, false, times, (i, t) -> {
            y[i] = st.y.clone();
            pAt[i] = Arrays.copyOf(st.pEff, m);
        });
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
        int status = NoiseResidual.write(od, h, me.value(), sigma, sigmaVariable[i], shift[i], w.gradH, w.gradS, np,
                r, offset + rowOffset[i], jac);
        if (status == NoiseResidual.UNUSABLE) {
            throw new UnusablePredictionException(me.location(), String.format(Locale.ROOT, "experiment '%s' at t = "
                    + "%.6g: %s", exp.id(), t, NoiseResidual.whyUnusable(od, h, sigma)));
        }
        if (status == NoiseResidual.SIGMA_BELOW_SHIFT) {
            throw new ObjectiveException(String.format(Locale.ROOT, "experiment '%s', observable '%s': noise "
                    + "spread %.3g is below exp(-%.1f)", exp.id(), od.id(), sigma, shift[i] / 2));
        }
    }

    /**
     * Models simulated by the simulator ({@link ExperimentSimulation#usesSimulator}: events, delay(), right-hand-side
     * switches). The Jacobian comes from forward sensitivities carried across the events and switches by their jump
     * conditions, exact up to the integration tolerance. Models with {@code delay()} in their mathematics,
     * measurement times before 0 in models with events, and evaluations whose sensitivity integration fails while the
     * states alone integrate (e.g. a switching function tangent to the solution) fall back to central finite
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

    /** Central-difference step on the estimation scale for models on the simulator (events, delay(), switches). */
    static final double FD_STEP = 1e-4;

    /** Residuals (no Jacobian) of a model on the simulator, at θ given on the linear scale. */
    private void simulateRows(EvaluationContext ctx, double[] linear, double[] r, int offset) {
        Work w = work.get();
        try {
            simulation.run(w.st, linear, null, false, times,
                    (i, t) -> row(ctx, w, i, t, linear, null, false, r, offset, null));
        } catch (IntegrationException e) {
            throw new ObjectiveException("experiment '" + exp.id() + "': " + e.getMessage(), e);
        }
    }

    /**
     * The residuals θ_j scales as a pure factor ({@link OutputFactor}): every row whose prediction or noise
     * spread reads θ_j (through a global, an observable or a noise placeholder) must have a linear data
     * transformation, normal noise, a constant σ that does not read θ_j, and a prediction that is θ_j times a
     * factor free of θ_j (a product, possibly nested or divided by terms free of θ_j); otherwise null. Whether θ_j
     * reaches the model through the conditions is the caller's check.
     */
    @Override
    public int[] factorResiduals(int j) {
        int[] out = new int[rows.length];
        int c = 0;
        for (int i = 0; i < rows.length; i++) {
            Measurement me = problem.measurements().get(rows[i]);
            ObservableDef od = problem.observables().get(me.observable());
            java.util.function.Predicate<org.switchfit.expr.Expr> readsJ =
                    e -> e.op() == org.switchfit.expr.Op.PARAM && slotReads(me, e.index(), j);
            boolean inH = od.prediction().contains(readsJ);
            boolean inS = !Double.isFinite(me.fixedSigma()) && od.sigma().contains(readsJ);
            if (!inH && !inS) {
                continue;
            }
            if (inS || sigmaVariable[i] || od.transformation() != org.switchfit.data.ParameterScale.LIN
                    || od.noise() != ObservableDef.Noise.NORMAL || !pureFactor(od.prediction(), readsJ)) {
                return null;
            }
            out[c++] = rowOffset[i];
        }
        return Arrays.copyOf(out, c);
    }

    /** Whether slot k of the observable parameter vector q holds θ_j for row me. */
    private boolean slotReads(Measurement me, int k, int j) {
        int oOff = problem.obsPlaceholderOffset();
        int nOff = problem.noisePlaceholderOffset();
        if (k < m) {
            return false; // model parameters reach θ only through the conditions
        }
        ValueSource src;
        if (k < oOff) {
            src = problem.globalSources().get(k - m);
        } else if (k < nOff) {
            src = k - oOff < me.obsParameters().size() ? me.obsParameters().get(k - oOff) : null;
        } else {
            src = k - nOff < me.noiseParameters().size() ? me.noiseParameters().get(k - nOff) : null;
        }
        return src != null && src.thetaIndex() == j;
    }

    /** h is the marked symbol times (or divided by) expressions that do not contain it. */
    private static boolean pureFactor(org.switchfit.expr.Expr h,
                                      java.util.function.Predicate<org.switchfit.expr.Expr> mark) {
        if (mark.test(h)) {
            return true;
        }
        switch (h.op()) {
            case MUL: {
                int found = 0;
                for (int a = 0; a < h.argCount(); a++) {
                    org.switchfit.expr.Expr f = h.arg(a);
                    if (pureFactor(f, mark)) {
                        found++;
                    } else if (f.contains(mark)) {
                        return false;
                    }
                }
                return found == 1;
            }
            case DIV:
                return pureFactor(h.arg(0), mark) && !h.arg(1).contains(mark);
            default:
                return false;
        }
    }
}
