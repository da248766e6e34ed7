package org.switchfit.objective;

import java.util.List;
import java.util.Locale;
import org.switchfit.continuation.Branch;
import org.switchfit.continuation.ContinuationException;
import org.switchfit.continuation.PseudoArclength;
import org.switchfit.continuation.ContinuationSettings;
import org.switchfit.continuation.Threshold;
import org.switchfit.continuation.Thresholds;
import org.switchfit.data.SwitchingThreshold;

/**
 * Residuals of measured switching thresholds of one (experiment, control, direction):
 * {@code r_i = (λ*(θ) - λ_i) / σ_i} with the Gaussian constant {@code 0.5 log(2π σ_i²)} per point.
 *
 * <p><b>Model threshold.</b> λ* is the fold that ends the branch the system is on when the control is swept in
 * the measured direction ({@link Thresholds#switchOn}: fold ending the low branch when sweeping up from the lower
 * end of the control range; {@link Thresholds#switchOff}: fold ending the high branch when sweeping down from the
 * upper end). The sweep starts from the attractor reached from the condition's initial state at that end of the
 * range (backward-Euler pseudo-time, {@link SwitchingModel#attractor}); conservation totals are those of the
 * condition's initial state. When the model is monostable at θ, λ* is the point of steepest response of the single
 * branch (continuation of the threshold through the cusp, see {@link Thresholds}), so the residual stays defined and
 * continuous and a fit started in the monostable region can move into the bistable one. The readout weights of the
 * steepest response are fixed at construction (state gradient of the chosen observable at the nominal initial
 * state), so they do not depend on θ. When even the steepest response lies at an end of the control range, λ* is
 * that end (the steepest point over the range, clamped; gradient 0), so starts far in the monostable region still
 * evaluate and the other data move them.
 *
 * <p><b>Gradient.</b> Folds: exact, from the left/right null vectors (implicit function theorem,
 * {@link org.switchfit.continuation.Folds#parameterGradient}) with respect to the reduced parameters
 * (p_eff, totals), chained with d(p_eff, T)/dθ of the condition. Steepest response: implicit differentiation with
 * inner five-point differences (accuracy about 1e-5 relative, see {@link Thresholds}).
 *
 * <p>Failures (no steady state, threshold outside the control range) raise {@link ObjectiveException}.
 * Immutable and thread-safe (each evaluation allocates its own small arrays; none are shared).
 */
final class ThresholdBlock implements ResidualBlock {
    private static final double LOG_2PI = Math.log(2.0 * Math.PI);

    private final SwitchingModel sm;
    private final int cond;
    private final int control;
    private final boolean up;
    private final double lower;
    private final double upper;
    private final double[] readout;
    private final double[] values;
    private final double[] sigmas;
    private final double constant;
    private final String label;
    private final String experimentId;
    private final String controlId;

    /**
     * @param points  thresholds of one experiment, control and direction (non-empty)
     * @param readout readout weights on the full state (length n) for the steepest-response fallback
     */
    ThresholdBlock(SwitchingModel sm, List<SwitchingThreshold> points, double lower, double upper,
                   double[] readout) {
        this.sm = sm;
        SwitchingThreshold first = points.get(0);
        this.cond = sm.condition(first.experiment(), first.location());
        this.control = sm.control(first.control(), first.location());
        this.up = first.direction() == SwitchingThreshold.Direction.UP;
        this.lower = lower;
        this.upper = upper;
        this.readout = readout.clone();
        this.values = new double[points.size()];
        this.sigmas = new double[points.size()];
        double c = 0;
        for (int i = 0; i < values.length; i++) {
            SwitchingThreshold t = points.get(i);
            if (!(t.sigma() > 0) || !Double.isFinite(t.value())) {
                throw org.switchfit.util.UserInputException.of(t.location(), "threshold value %s with sigma %s: "
                        + "give a finite value and a positive sigma", t.value(), t.sigma());
            }
            values[i] = t.value();
            sigmas[i] = t.sigma();
            c += 0.5 * LOG_2PI + Math.log(t.sigma());
        }
        this.constant = c;
        this.experimentId = first.experiment();
        this.controlId = first.control();
        this.label = String.format(Locale.ROOT, "switch-%s threshold of '%s' in experiment '%s'", up ? "on" : "off",
                first.control(), first.experiment());
    }

    /** Id of this fold, e.g. {@code rest/stimulus/up}. */
    String id() {
        return sm.problem.conditions().get(cond).id() + "/" + sm.model.parameterIds().get(control) + "/"
                + (up ? "up" : "down");
    }

    @Override
    public int size() {
        return values.length;
    }

    @Override
    public double constant() {
        return constant;
    }

    @Override
    public void evaluate(EvaluationContext ctx, double[] r, int offset, double[] jac) {
        int np = ctx.parameterCount();
        double[] grad = jac == null ? null : new double[np];
        String[] note = ctx.recordsSwitching() ? new String[1] : null;
        double lam = threshold(ctx, grad, note);
        for (int i = 0; i < values.length; i++) {
            r[offset + i] = (lam - values[i]) / sigmas[i];
            if (note != null) {
                ctx.record(new SwitchingFit(SwitchingFit.Data.THRESHOLD, experimentId, controlId, up ? "up" : "down",
                        null, Double.NaN, values[i], lam, sigmas[i], org.switchfit.data.ParameterScale.LIN, note[0]));
            }
            if (jac != null) {
                int base = (offset + i) * np;
                for (int j = 0; j < np; j++) {
                    jac[base + j] = grad[j] / sigmas[i];
                }
            }
        }
    }

    /** Model threshold λ*(θ); its gradient goes into {@code grad} (length np) when not null. */
    double threshold(EvaluationContext ctx, double[] grad) {
        return threshold(ctx, grad, null);
    }

    /**
     * Model threshold λ*(θ) and its gradient (when {@code grad} is not null); {@code note[0]} (when not null) says
     * which definition applied: {@code fold}, {@code steepest_response} or {@code range_end}.
     */
    private double threshold(EvaluationContext ctx, double[] grad, String[] note) {
        double end = up ? lower : upper;
        SwitchingModel.Start s = sm.start(ctx, cond, control, end, grad != null);
        try {
            double[] x = sm.attractor(sm.reduced.reducedState(s.y0), s.q, label);
            double[] c = new double[sm.nr];
            for (int a = 0; a < sm.nr; a++) {
                for (int i = 0; i < sm.n; i++) {
                    c[a] += readout[i] * sm.dyDx[i * sm.nr + a];
                }
            }
            Thresholds th = new Thresholds(ContinuationSettings.of(lower, upper));
            Threshold t = up ? th.switchOn(sm.reduced, x, s.q, control, c)
                    : th.switchOff(sm.reduced, x, s.q, control, c);
            if (grad != null) {
                int np = grad.length;
                double[] g = t.gradient();
                java.util.Arrays.fill(grad, 0.0);
                for (int k = 0; k < g.length; k++) {
                    if (k == control || g[k] == 0) {
                        continue;
                    }
                    for (int j = 0; j < np; j++) {
                        grad[j] += g[k] * s.dq[k * np + j];
                    }
                }
            }
            if (note != null) {
                note[0] = t.kind() == Threshold.Kind.FOLD ? "fold" : "steepest_response";
            }
            return t.value();
        } catch (ContinuationException e) {
            double bound = clampedBound(s, grad);
            if (Double.isNaN(bound)) {
                throw new ObjectiveException(label + ": " + e.getMessage(), e);
            }
            if (note != null) {
                note[0] = "range_end";
            }
            return bound;
        }
    }

    /**
     * When the model is monostable and its response is steepest at an end of the control range, the steepest point
     * over the range is that end: returns it (gradient 0, written into grad) so the residual stays defined and
     * continuous as the interior steepest point leaves the range. NaN when this is not the situation.
     */
    private double clampedBound(SwitchingModel.Start s, double[] grad) {
        try {
            double end = up ? lower : upper;
            double[] q = s.q.clone();
            q[control] = end;
            double[] x = sm.attractor(sm.reduced.reducedState(s.y0), q, label);
            Branch br = new PseudoArclength(ContinuationSettings.of(lower, upper).withEigenvalueLimit(0))
                    .trace(sm.reduced, x, q, control, up ? +1 : -1);
            if (!br.folds().isEmpty() || br.size() < 3) {
                return Double.NaN;
            }
            int best = -1;
            double bestR = -1;
            for (int i = 0; i < br.size(); i++) {
                double r = Math.abs(response(br.point(i).state(), q, br.point(i).parameter()));
                if (r > bestR) {
                    bestR = r;
                    best = i;
                }
            }
            if (best != 0 && best != br.size() - 1) {
                return Double.NaN;
            }
            if (grad != null) {
                java.util.Arrays.fill(grad, 0.0);
            }
            double lam = br.point(best).parameter();
            return Math.abs(lam - lower) < Math.abs(lam - upper) ? lower : upper;
        } catch (ContinuationException | ObjectiveException e) {
            return Double.NaN;
        }
    }

    /** c^T dy/dλ on the reduced system at (x, λ). */
    private double response(double[] x, double[] q0, double lam) {
        int nr = sm.nr;
        int mq = q0.length;
        double[] q = q0.clone();
        q[control] = lam;
        double[] jac = new double[nr * nr];
        double[] jp = new double[nr * mq];
        sm.reduced.jacobianY(0, x, q, jac);
        sm.reduced.jacobianP(0, x, q, jp);
        org.switchfit.linalg.DenseLu lu = new org.switchfit.linalg.DenseLu(nr);
        if (!lu.factor(jac) || lu.isSingular()) {
            return Double.POSITIVE_INFINITY;
        }
        double[] z = new double[nr];
        for (int a = 0; a < nr; a++) {
            z[a] = -jp[a * mq + control];
        }
        lu.solve(z);
        double r = 0;
        for (int a = 0; a < nr; a++) {
            double ca = 0;
            for (int i = 0; i < sm.n; i++) {
                ca += readout[i] * sm.dyDx[i * nr + a];
            }
            r += ca * z[a];
        }
        return r;
    }
}
