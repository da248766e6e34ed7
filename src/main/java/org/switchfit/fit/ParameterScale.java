package org.switchfit.fit;

/**
 * The scale a parameter is estimated on, so that results on the estimation scale can be reported on the linear
 * (model) scale as well. Immutable.
 */
public enum ParameterScale {
    /** θ = p. */
    LINEAR,
    /** θ = log10(p). */
    LOG10,
    /** θ = ln(p). */
    LN;

    /** Converts an estimation-scale value to the linear scale (±∞ and NaN pass through the transform). */
    public double toLinear(double estimationValue) {
        switch (this) {
            case LOG10:
                return Math.pow(10.0, estimationValue);
            case LN:
                return Math.exp(estimationValue);
            default:
                return estimationValue;
        }
    }
}
