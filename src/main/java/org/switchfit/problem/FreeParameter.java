package org.switchfit.problem;

import org.switchfit.data.ParameterScale;
import org.switchfit.data.Prior;
import org.switchfit.util.SourceLocation;

/**
 * An estimated parameter θ_j: id, estimation scale, bounds and nominal (start) value on the linear scale, and an
 * optional prior that enters the objective. Immutable.
 *
 * @param id       parameter id
 * @param scale    estimation scale (θ = scale(x))
 * @param lower    lower bound, linear scale, finite (positive on log scales)
 * @param upper    upper bound, linear scale, finite, above lower
 * @param nominal  nominal value, linear scale (the value {@code check} evaluates at and the first fit start)
 * @param prior    objective prior, or null
 * @param location where it was declared
 */
public record FreeParameter(String id, ParameterScale scale, double lower, double upper, double nominal,
                            Prior prior, SourceLocation location) {

    /** Linear value of θ. */
    public double toLinear(double theta) {
        return scale.toLinear(theta);
    }

    /** θ of a linear value. */
    public double toTheta(double linear) {
        return scale.toScale(linear);
    }

    /** dx/dθ at θ, x the linear value: 1, x or x ln 10. */
    public double linearDerivative(double theta) {
        switch (scale) {
            case LOG:
                return Math.exp(theta);
            case LOG10:
                return Math.pow(10.0, theta) * Math.log(10.0);
            default:
                return 1.0;
        }
    }

    /** Lower bound on the estimation scale. */
    public double thetaLower() {
        return scale.toScale(lower);
    }

    /** Upper bound on the estimation scale. */
    public double thetaUpper() {
        return scale.toScale(upper);
    }
}
