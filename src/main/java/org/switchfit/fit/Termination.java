package org.switchfit.fit;

/** Why a local Levenberg-Marquardt run stopped. */
public enum Termination {
    /** The projected gradient's max-norm fell below the gradient tolerance (first-order optimal on the box). */
    GRADIENT,
    /** Actual and predicted relative reductions of the cost both fell below the cost tolerance. */
    COST_CHANGE,
    /** An accepted step was shorter than the step tolerance relative to |θ|. */
    STEP_SIZE,
    /** The cost is (numerically) zero: every residual vanishes. */
    ZERO_RESIDUAL,
    /** The iteration limit was reached before convergence. */
    MAX_ITERATIONS,
    /** The evaluation limit was reached before convergence. */
    MAX_EVALUATIONS,
    /** The damping parameter grew past its limit without an acceptable step (no further descent possible). */
    NO_PROGRESS,
    /**
     * No acceptable step was found as for {@link #NO_PROGRESS}, but the undamped Gauss-Newton model promises no
     * gain above (a margin times) the objective's measured evaluation noise: a local optimum to within the
     * accuracy of the integration.
     */
    WITHIN_NOISE,
    /**
     * The gradient is exactly zero at the start although the cost is not: the objective does not change with any
     * estimated parameter there (a flat region, such as switching thresholds held at the end of their control
     * range), so the run never moved and located nothing. (A run that descends onto a plateau and stops there ends
     * with {@link #GRADIENT}: it did find lower cost.)
     */
    FLAT;

    /** True for the reasons that indicate convergence (a local optimum on the box). */
    public boolean converged() {
        return this == GRADIENT || this == COST_CHANGE || this == STEP_SIZE || this == ZERO_RESIDUAL
                || this == WITHIN_NOISE;
    }
}
