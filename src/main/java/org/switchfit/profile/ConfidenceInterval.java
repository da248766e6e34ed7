package org.switchfit.profile;

/**
 * A profile-likelihood confidence interval {θ : 2 (nll(θ) - nll*) ≤ threshold}. Open ends are ±∞.
 *
 * @param level          confidence level, e.g. 0.95
 * @param degreesOfFreedom chi-square degrees of freedom of the threshold (1 pointwise, #free parameters
 *                       simultaneous)
 * @param threshold      the chi-square quantile used
 * @param lower          lower end on the estimation scale (-∞ when open)
 * @param upper          upper end on the estimation scale (+∞ when open)
 * @param lowerLinear    lower end on the linear scale
 * @param upperLinear    upper end on the linear scale
 */
public record ConfidenceInterval(double level, int degreesOfFreedom, double threshold, double lower, double upper,
                                 double lowerLinear, double upperLinear) {

    /** True when both ends are finite. */
    public boolean closed() {
        return Double.isFinite(lower) && Double.isFinite(upper);
    }
}
