package org.switchfit.continuation;

/**
 * One simulated ramp of the control parameter.
 *
 * @param rate      dλ/dt of the ramp (negative when sweeping down)
 * @param parameter sampled λ values in ramp order
 * @param readout   c^T y at the samples
 * @param response  what the readout did along the ramp: one jump, no jump, or oscillation
 * @param jumpIndex for {@link Response#JUMP}, the sample i before the jump: the largest |readout[i + 1] -
 *                  readout[i]| of the ramp; -1 otherwise
 */
public record SweepResult(double rate, double[] parameter, double[] readout, Response response, int jumpIndex) {

    /** What the readout did along a ramp. */
    public enum Response {
        /** One change between consecutive samples stands out: the jump between two branches. */
        JUMP,
        /** The readout is flat, or changes evenly (no step larger than twice the mean step): nothing jumps. */
        NO_JUMP,
        /** The increments of the readout change sign again and again: it oscillates, so no single jump. */
        OSCILLATION
    }

    /** Validates and copies the arrays. */
    public SweepResult {
        parameter = parameter.clone();
        readout = readout.clone();
        if (parameter.length != readout.length) {
            throw new IllegalArgumentException("parameter and readout differ in length");
        }
        if ((response == Response.JUMP) != (jumpIndex >= 0 && jumpIndex + 1 < parameter.length)) {
            throw new IllegalArgumentException("a jump needs the index of the sample before it, and only a jump");
        }
    }

    @Override
    public double[] parameter() {
        return parameter.clone();
    }

    @Override
    public double[] readout() {
        return readout.clone();
    }

    /**
     * λ of the jump: the middle of the sample interval where the readout changed most (its position inside the
     * interval is not resolved by the samples); NaN when there is no jump.
     */
    public double jumpParameter() {
        return jumpIndex < 0 ? Double.NaN : 0.5 * (parameter[jumpIndex] + parameter[jumpIndex + 1]);
    }
}
