package org.switchfit.problem;

/**
 * Where a number used by a problem comes from: a constant, or the linear value of estimated parameter
 * {@code θ_j} (j = {@link #thetaIndex()}). Immutable.
 *
 * @param constant   the value when {@code thetaIndex < 0}
 * @param thetaIndex index into θ, or -1 for a constant
 */
public record ValueSource(double constant, int thetaIndex) {

    /** A constant. */
    public static ValueSource ofConstant(double v) {
        return new ValueSource(v, -1);
    }

    /** The linear value of θ_j. */
    public static ValueSource ofTheta(int j) {
        if (j < 0) {
            throw new IllegalArgumentException("theta index must be >= 0, got " + j);
        }
        return new ValueSource(Double.NaN, j);
    }

    /** Whether the value depends on θ. */
    public boolean isTheta() {
        return thetaIndex >= 0;
    }

    /** The value for linear parameter values {@code thetaLinear}. */
    public double value(double[] thetaLinear) {
        return thetaIndex >= 0 ? thetaLinear[thetaIndex] : constant;
    }
}
