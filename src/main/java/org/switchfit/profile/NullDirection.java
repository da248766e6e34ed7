package org.switchfit.profile;

/**
 * A direction in parameter space along which the residuals do not change to first order (a right singular vector
 * of J with a negligible singular value): moving θ along it is exactly compensated.
 *
 * @param parameterIds  ids of the free parameters (order of {@code coefficients})
 * @param coefficients  unit vector on the estimation scale, sign fixed so the largest entry is positive
 * @param singularValue its singular value
 * @param description   readable form, e.g. {@code +0.707 log10(k1) -0.707 log10(k2); invariant: k1 * k2}
 */
public record NullDirection(String[] parameterIds, double[] coefficients, double singularValue,
                            String description) {

    public NullDirection {
        parameterIds = parameterIds.clone();
        coefficients = coefficients.clone();
    }

    @Override
    public String[] parameterIds() {
        return parameterIds.clone();
    }

    @Override
    public double[] coefficients() {
        return coefficients.clone();
    }
}
