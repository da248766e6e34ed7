package org.switchfit.profile;

/**
 * One point of a profile: the profiled quantity held at {@code value}, all other parameters re-optimised.
 *
 * @param value the profiled parameter (estimation scale) or prediction value
 * @param nll   the minimal negative log-likelihood with the quantity held at {@code value}
 * @param theta the optimising parameters on the estimation scale (copied in and out)
 */
public record ProfilePoint(double value, double nll, double[] theta) {

    public ProfilePoint {
        theta = theta.clone();
    }

    @Override
    public double[] theta() {
        return theta.clone();
    }

    /** The likelihood-ratio statistic {@code 2 (nll - nllOptimum)} of this point. */
    public double deltaChi2(double nllOptimum) {
        return 2 * (nll - nllOptimum);
    }
}
