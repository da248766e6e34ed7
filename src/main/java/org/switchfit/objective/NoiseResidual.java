package org.switchfit.objective;

import java.util.Locale;
import org.switchfit.data.ParameterScale;
import org.switchfit.problem.ObservableDef;

/**
 * The noise model of one data row, shared by the residual blocks that compare a prediction h with a measured
 * value m ({@link ExperimentBlock}, {@link DoseResponseBlock}).
 *
 * <p>On the observable's scale (m' and h' are m and h for lin, their log or log10 otherwise): normal noise
 * {@code r = (m' - h') / σ}; Laplace {@code r = sign(m' - h') sqrt(2 |m' - h'| / b)}. When σ depends on θ (or on
 * the state) a second residual {@code sqrt(2 log σ + C)} carries the normalisation, C a shift (see
 * {@link #SIGMA_SHIFT}); its square is exact, so the NLL is exact. Constant normalisations ({@code 0.5 log(2πσ²)},
 * {@code log 2b}, the log-data Jacobian {@code log m'} or {@code log(m' ln 10)}, as PEtab v1 defines the
 * likelihood) go into the block's constant ({@link #addConstant}). Stateless.
 */
final class NoiseResidual {
    /**
     * Default C in {@code sqrt(2 log σ + C)}: makes the residual real for σ &gt; exp(-C/2) ≈ 2e-22; smaller σ are
     * reported by {@link #SIGMA_BELOW_SHIFT}.
     */
    static final double SIGMA_SHIFT = 100.0;
    /** {@link #write} status: residuals (and Jacobian rows) written. */
    static final int OK = 0;
    /** {@link #write} status: the transformed prediction is not finite or σ is not positive and finite. */
    static final int UNUSABLE = 1;
    /** {@link #write} status: σ is below exp(-C/2), so {@code 2 log σ + C} is not positive. */
    static final int SIGMA_BELOW_SHIFT = 2;
    private static final double LN10 = Math.log(10.0);
    private static final double LOG_2PI = Math.log(2.0 * Math.PI);

    private NoiseResidual() {
    }

    /**
     * Why {@link #write} returned {@link #UNUSABLE} for prediction h and noise spread σ, and what to change: one
     * clause for a message that names the row before it.
     */
    static String whyUnusable(ObservableDef od, double h, double sigma) {
        if (Double.isNaN(h) || Double.isInfinite(h)) {
            return String.format(Locale.ROOT, "the prediction of observable '%s' is %s; check its formula and the "
                    + "row's observableParameters, or use other nominal or start values", od.id(), h);
        }
        if (od.transformation() != ParameterScale.LIN && !(h > 0)) {
            return String.format(Locale.ROOT, "observable '%s' is %s-transformed but its prediction is %.6g (a log "
                    + "needs a positive value); use nominal or start values where it is positive, add an offset to the "
                    + "observable formula, or model the data on the linear scale", od.id(),
                    od.transformation().token(), h);
        }
        return String.format(Locale.ROOT, "the noise spread of observable '%s' is %.6g, not positive and finite; "
                + "correct the noise formula, the row's noiseParameters or the values of the parameters it uses",
                od.id(), sigma);
    }

    /** Number of residuals of a row: 2 when σ is variable, else 1. */
    static int size(boolean sigmaVariable) {
        return sigmaVariable ? 2 : 1;
    }

    /** The log-data Jacobian term of a measured value: log m (log), log(m ln 10) (log10), 0 (lin). */
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

    /**
     * Adds one row's constant to {@code c}: the log-data term, then {@code 0.5 log 2π - C/2} (normal) or
     * {@code log 2 - C/2} (Laplace) for a variable σ, else {@code 0.5 log(2π) + log σ} or {@code log 2σ}.
     *
     * @param sigma the constant σ (or Laplace b) of the row; ignored when {@code sigmaVariable}
     * @param shift C of the row; ignored unless {@code sigmaVariable}
     */
    static double addConstant(double c, ObservableDef od, double value, boolean sigmaVariable, double sigma,
                              double shift) {
        double sum = c + transformConstant(od.transformation(), value);
        if (sigmaVariable) {
            return sum + ((od.noise() == ObservableDef.Noise.LAPLACE ? Math.log(2.0) : 0.5 * LOG_2PI) - 0.5 * shift);
        }
        return sum + (od.noise() == ObservableDef.Noise.LAPLACE ? Math.log(2.0 * sigma)
                : 0.5 * LOG_2PI + Math.log(sigma));
    }

    /**
     * Writes the residual(s) of one row at {@code r[ro]} (and {@code r[ro + 1]} for a variable σ) and, when
     * {@code jac} is given, their rows {@code jac[row * np + j]} from dh/dθ and dσ/dθ.
     *
     * @param h             the prediction, untransformed
     * @param value         the measured value, untransformed
     * @param sigma         σ (or Laplace b) of the row
     * @param sigmaVariable whether σ depends on θ or the state (second residual)
     * @param shift         C of the second residual
     * @param gradH         dh/dθ (read when {@code jac} is given)
     * @param gradS         dσ/dθ (read when {@code jac} is given and σ is variable)
     * @return {@link #OK}, {@link #UNUSABLE} (nothing written) or {@link #SIGMA_BELOW_SHIFT} (no Jacobian written);
     *         the caller turns the failures into an {@link ObjectiveException} naming the row
     */
    static int write(ObservableDef od, double h, double value, double sigma, boolean sigmaVariable, double shift,
                     double[] gradH, double[] gradS, int np, double[] r, int ro, double[] jac) {
        double hm = h;
        double mv = value;
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
            return UNUSABLE;
        }
        double d = mv - hm;
        double res;
        double dResDhm;
        double dResDs;
        if (od.noise() == ObservableDef.Noise.LAPLACE) {
            double su = Math.sqrt(2.0 * Math.abs(d) / sigma);
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
        if (sigmaVariable) {
            double arg = 2.0 * Math.log(sigma) + shift;
            if (!(arg > 0)) {
                return SIGMA_BELOW_SHIFT;
            }
            rs = Math.sqrt(arg);
            r[ro + 1] = rs;
        }
        if (jac != null) {
            int base = ro * np;
            for (int j = 0; j < np; j++) {
                jac[base + j] = dResDhm * dhm * gradH[j] + (sigmaVariable ? dResDs * gradS[j] : 0.0);
            }
            if (sigmaVariable) {
                int b2 = (ro + 1) * np;
                double f = 1.0 / (rs * sigma);
                for (int j = 0; j < np; j++) {
                    jac[b2 + j] = f * gradS[j];
                }
            }
        }
        return OK;
    }
}
