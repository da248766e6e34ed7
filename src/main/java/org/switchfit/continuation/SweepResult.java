package org.switchfit.continuation;

/**
 * One simulated ramp of the control parameter.
 *
 * @param rate           dλ/dt of the ramp (negative when sweeping down)
 * @param parameter      sampled λ values in ramp order
 * @param readout        c^T y at the samples
 * @param jumpParameter  λ where |d(c^T y)/dλ| is largest along the ramp (parabolic interpolation between
 *                       samples): the jump when the state switches branches
 * @param maxSlope       that largest |d(c^T y)/dλ|
 */
public record SweepResult(double rate, double[] parameter, double[] readout, double jumpParameter,
                          double maxSlope) {

    /** Copies the arrays. */
    public SweepResult {
        parameter = parameter.clone();
        readout = readout.clone();
    }

    @Override
    public double[] parameter() {
        return parameter.clone();
    }

    @Override
    public double[] readout() {
        return readout.clone();
    }
}
