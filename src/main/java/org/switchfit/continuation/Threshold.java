package org.switchfit.continuation;

/**
 * A model's switching threshold in its control parameter, with its gradient with respect to all parameters.
 *
 * @param kind     which definition applied (fold, or steepest response when monostable)
 * @param control  index of the control parameter
 * @param value    the threshold (a value of the control parameter)
 * @param gradient d value / d p_k for every parameter k of the system (0 for the control itself)
 * @param state    the equilibrium at the threshold
 * @param fold     the fold when {@code kind == FOLD}, else null
 */
public record Threshold(Kind kind, int control, double value, double[] gradient, double[] state, Fold fold) {

    /** Which definition produced the threshold. */
    public enum Kind {
        /** Bistable at the given parameters: the threshold is a fold (saddle-node) of the branch. */
        FOLD,
        /** Monostable: the threshold is the point of steepest response of the single branch. */
        STEEPEST_RESPONSE
    }

    /** Copies the arrays. */
    public Threshold {
        gradient = gradient.clone();
        state = state.clone();
    }

    @Override
    public double[] gradient() {
        return gradient.clone();
    }

    @Override
    public double[] state() {
        return state.clone();
    }
}
