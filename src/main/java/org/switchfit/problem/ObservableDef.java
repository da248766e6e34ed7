package org.switchfit.problem;

import org.switchfit.data.ParameterScale;
import org.switchfit.expr.Expr;
import org.switchfit.util.SourceLocation;

/**
 * One observable joined to the model: the prediction {@code h} and the noise spread {@code sigma} as runtime
 * expressions over the states y and the extended parameter vector q (layout in {@link EstimationProblem}), the data
 * transformation and the noise distribution. Immutable.
 *
 * @param id                observable id
 * @param prediction        h(t, y, q)
 * @param sigma             standard deviation (normal) or scale (Laplace) of the transformed data, over y and q
 * @param transformation    data transformation applied to both measurement and prediction (lin, log, log10)
 * @param noise             noise distribution
 * @param obsPlaceholders   number of observableParameter placeholders
 * @param noisePlaceholders number of noiseParameter placeholders
 * @param location          where it was declared
 */
public record ObservableDef(String id, Expr prediction, Expr sigma, ParameterScale transformation, Noise noise,
                            int obsPlaceholders, int noisePlaceholders, SourceLocation location) {

    /** Noise distributions. */
    public enum Noise {
        /** Normal: density exp(-r^2/2) / (sqrt(2 pi) sigma), r = (m - h) / sigma. */
        NORMAL,
        /** Laplace: density exp(-|m - h| / b) / (2 b). */
        LAPLACE
    }
}
