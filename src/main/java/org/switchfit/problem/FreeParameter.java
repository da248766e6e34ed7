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

    /**
     * The support of a uniform prior with explicit limits on the estimation scale, {@code {a, b}} (PEtab v1: the
     * density is 0 outside [a, b]; {@code uniform} limits are linear values, {@code parameterScaleUniform} ones are
     * on the estimation scale; a linear limit at or below 0 on a log scale is -infinity), or null when the prior is
     * none of these (a uniform prior without limits spans the bounds).
     */
    public double[] thetaPriorSupport() {
        if (prior == null || prior.parameters().isEmpty()) {
            return null;
        }
        double a = prior.parameter(0);
        double b = prior.parameter(1);
        switch (prior.type()) {
            case PARAMETER_SCALE_UNIFORM:
                return new double[] {a, b};
            case UNIFORM:
                return new double[] {scale.needsPositive() && !(a > 0) ? Double.NEGATIVE_INFINITY : toTheta(a),
                    toTheta(b)};
            default:
                return null;
        }
    }

    /** Lower end of the values θ can take: the lower bound, raised to a uniform prior's support. */
    public double thetaFeasibleLower() {
        double[] s = thetaPriorSupport();
        return s == null ? thetaLower() : Math.max(thetaLower(), s[0]);
    }

    /** Upper end of the values θ can take: the upper bound, lowered to a uniform prior's support. */
    public double thetaFeasibleUpper() {
        double[] s = thetaPriorSupport();
        return s == null ? thetaUpper() : Math.min(thetaUpper(), s[1]);
    }
}
