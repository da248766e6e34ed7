package org.switchfit.objective;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;
import org.switchfit.data.DoseResponsePoint;
import org.switchfit.data.ParameterScale;
import org.switchfit.problem.ObservableDef;
import org.switchfit.problem.ValueSource;
import org.switchfit.util.UserInputException;

/**
 * Residuals of steady-state dose-response points of one (experiment, control, history): the control is held at
 * each dose d and the observable is read at the stable steady state reached from the low or the high state.
 *
 * <p><b>Which steady state.</b> History LOW: the attractor reached from the condition's initial state at the lower
 * end of the control range, followed by a quasi-static sweep up through the doses in steps of 1/200 of the range;
 * history HIGH: the same from the upper end, sweeping down. Each step is a Newton correction from the previous
 * state, accepted when it converges to a linearly stable state with no negative species (beyond -1e-9 of the largest) within 10% (relative) of the previous one (a Newton step past a fold can land on a stable but non-physical root with negative concentrations); otherwise
 * the state relaxes by backward-Euler pseudo-time from the previous state ({@link SwitchingModel#attractor}), which
 * is the jump of a real sweep past a fold. Conservation totals are those of the initial state.
 *
 * <p><b>Gradient.</b> Exact by the implicit function theorem on the conservation-reduced system,
 * {@code dx/dθ = -J_r^{-1} (∂F/∂(p_eff, T)) d(p_eff, T)/dθ} (see {@link SwitchingModel#stateSensitivity}), chained
 * through the observable and noise formulas.
 *
 * <p><b>Noise.</b> {@link NoiseResidual}, as in {@link ExperimentBlock}: normal {@code r = (m' - h') / σ} or
 * Laplace, on the observable's scale (lin/log/log10); σ from the point when given, else the observable's noise
 * formula; a θ-dependent σ adds the residual {@code sqrt(2 log σ + C)}, C = {@link NoiseResidual#SIGMA_SHIFT}. Failures raise {@link ObjectiveException}. Immutable
 * and thread-safe (per-evaluation arrays only).
 */
final class DoseResponseBlock implements ResidualBlock {
    private static final int STEPS_PER_RANGE = 200;

    private final SwitchingModel sm;
    private final int cond;
    private final int control;
    private final boolean low;
    private final double lower;
    private final double upper;
    private final double[] doses;
    private final double[] values;
    private final int[] obs;
    private final double[] fixedSigma;
    private final boolean[] variable;
    private final int[] rowOffset;
    private final int size;
    private final double constant;
    private final String label;
    private final String experimentId;
    private final String controlId;

    DoseResponseBlock(SwitchingModel sm, List<DoseResponsePoint> points, double lower, double upper) {
        this.sm = sm;
        List<DoseResponsePoint> sorted = new ArrayList<>(points);
        DoseResponsePoint first = sorted.get(0);
        this.low = first.history() == DoseResponsePoint.History.LOW;
        sorted.sort(Comparator.comparingDouble(p -> low ? p.dose() : -p.dose()));
        this.cond = sm.condition(first.experiment(), first.location());
        this.control = sm.control(first.control(), first.location());
        this.lower = lower;
        this.upper = upper;
        int k = sorted.size();
        doses = new double[k];
        values = new double[k];
        obs = new int[k];
        fixedSigma = new double[k];
        variable = new boolean[k];
        rowOffset = new int[k];
        int off = 0;
        double c = 0;
        List<ObservableDef> defs = sm.problem.observables();
        for (int i = 0; i < k; i++) {
            DoseResponsePoint p = sorted.get(i);
            int o = -1;
            for (int j = 0; j < defs.size(); j++) {
                if (defs.get(j).id().equals(p.observable())) {
                    o = j;
                }
            }
            if (o < 0) {
                throw UserInputException.of(p.location(), "refers to observable '%s', which the problem file does "
                        + "not declare; declare it or correct the id", p.observable());
            }
            if (!(p.dose() >= lower && p.dose() <= upper) || !Double.isFinite(p.value())) {
                throw UserInputException.of(p.location(), "dose %s or value %s is not usable; give finite numbers",
                        p.dose(), p.value());
            }
            ObservableDef od = defs.get(o);
            if (od.transformation() != ParameterScale.LIN && !(p.value() > 0)) {
                throw UserInputException.of(p.location(), "value %s is not positive but observable '%s' has "
                        + "log-normal noise; remove the point or use gaussian noise", p.value(), p.observable());
            }
            doses[i] = p.dose();
            values[i] = p.value();
            obs[i] = o;
            fixedSigma[i] = Double.isFinite(p.sigma()) ? p.sigma() : Double.NaN;
            variable[i] = Double.isNaN(fixedSigma[i]);
            rowOffset[i] = off;
            off += NoiseResidual.size(variable[i]);
            if (!variable[i] && !(fixedSigma[i] > 0)) {
                throw UserInputException.of(p.location(), "sigma %s is not positive; give a positive sigma",
                        p.sigma());
            }
            c = NoiseResidual.addConstant(c, od, p.value(), variable[i], fixedSigma[i], NoiseResidual.SIGMA_SHIFT);
        }
        size = off;
        constant = c;
        experimentId = first.experiment();
        controlId = first.control();
        label = String.format(Locale.ROOT, "dose response in '%s' of experiment '%s' from the %s state",
                first.control(), first.experiment(), low ? "low" : "high");
    }

    @Override
    public int size() {
        return size;
    }

    @Override
    public double constant() {
        return constant;
    }

    @Override
    public void evaluate(EvaluationContext ctx, double[] r, int offset, double[] jac) {
        int np = ctx.parameterCount();
        boolean sens = jac != null;
        double end = low ? lower : upper;
        SwitchingModel.Start s = sm.start(ctx, cond, control, end, sens);
        double[] q = s.q;
        double[] x = sm.attractor(sm.reduced.reducedState(s.y0), q, label);
        double lam = end;
        double h = (upper - lower) / STEPS_PER_RANGE;
        for (int i = 0; i < doses.length; i++) {
            double d = doses[i];
            int steps = (int) Math.ceil(Math.abs(d - lam) / h - 1e-9);
            double from = lam;
            for (int k = 1; k <= steps; k++) {
                q[control] = k == steps ? d : from + (d - from) * k / steps;
                x = step(x, q);
            }
            q[control] = d;
            lam = d;
            if (steps == 0) {
                x = step(x, q);
            }
            point(ctx, i, x, q, s.dq, np, r, offset, jac);
        }
    }

    private double[] step(double[] x, double[] q) {
        org.switchfit.continuation.SteadyState st = sm.newton(x, q);
        if (st != null && st.stable()) {
            double[] y = st.state();
            double dmax = 0;
            for (int a = 0; a < y.length; a++) {
                dmax = Math.max(dmax, Math.abs(y[a] - x[a]) / (1 + Math.abs(x[a])));
            }
            if (dmax <= 0.1 && sm.physical(y, q)) {
                return y;
            }
        }
        return sm.attractor(x, q, label);
    }

    private void point(EvaluationContext ctx, int i, double[] x, double[] q, double[] dq, int np, double[] r,
                       int offset, double[] jac) {
        int n = sm.n;
        int m = sm.m;
        int o = obs[i];
        ObservableDef od = sm.problem.observables().get(o);
        double[] y = sm.reduced.fullState(x, q);
        double[] qe = new double[sm.problem.qLength()];
        System.arraycopy(q, 0, qe, 0, m);
        List<ValueSource> g = sm.problem.globalSources();
        for (int k = 0; k < g.size(); k++) {
            ValueSource src = g.get(k);
            qe[m + k] = src.isTheta() ? ctx.linear(src.thetaIndex()) : src.constant();
        }
        double[] out = new double[2];
        sm.problem.evaluateObservable(o, 0.0, y, qe, out);
        double hv = out[0];
        double sigma = variable[i] ? out[1] : fixedSigma[i];
        double[] gradH = null;
        double[] gradS = null;
        if (jac != null) {
            gradH = new double[np];
            gradS = new double[np];
            double[] dy = sm.stateSensitivity(x, q, dq, np, label);
            int cnt = sm.problem.observableDerivativeCount(o);
            double[] deriv = new double[cnt];
            sm.problem.evaluateObservableDerivatives(o, 0.0, y, qe, deriv);
            int[] dr = sm.problem.observableDerivativeRows(o);
            int[] dc = sm.problem.observableDerivativeCols(o);
            for (int e = 0; e < cnt; e++) {
                double v = deriv[e];
                if (v == 0.0) {
                    continue;
                }
                double[] gg = dr[e] == 0 ? gradH : gradS;
                int var = dc[e];
                if (var < n) {
                    for (int j = 0; j < np; j++) {
                        gg[j] += v * dy[var * np + j];
                    }
                    continue;
                }
                int k = var - n;
                if (k < m) {
                    for (int j = 0; j < np; j++) {
                        gg[j] += v * dq[k * np + j];
                    }
                } else if (k < m + g.size()) {
                    ValueSource src = g.get(k - m);
                    if (src.isTheta()) {
                        gg[src.thetaIndex()] += v * ctx.linearDerivative(src.thetaIndex());
                    }
                }
            }
        }
        if (ctx.recordsSwitching()) {
            ctx.record(new SwitchingFit(SwitchingFit.Data.DOSE_RESPONSE, experimentId, controlId, low ? "low" : "high",
                    od.id(), doses[i], values[i], hv, sigma, od.transformation(), null));
        }
        int status = NoiseResidual.write(od, hv, values[i], sigma, variable[i], NoiseResidual.SIGMA_SHIFT, gradH,
                gradS, np, r, offset + rowOffset[i], jac);
        if (status == NoiseResidual.UNUSABLE) {
            throw new UnusablePredictionException(null, String.format(Locale.ROOT, "%s, at dose %.6g: %s", label,
                    doses[i], NoiseResidual.whyUnusable(od, hv, sigma)));
        }
        if (status == NoiseResidual.SIGMA_BELOW_SHIFT) {
            throw new ObjectiveException(String.format(Locale.ROOT, "%s: noise spread %.3g is too small", label,
                    sigma));
        }
        Arrays.fill(out, 0.0);
    }
}
