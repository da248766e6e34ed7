package org.switchfit.objective;

/**
 * An independent group of residuals of a {@link LikelihoodObjective}: a timecourse experiment, the priors, or
 * (added by other packages) switching thresholds and steady-state dose responses. The objective is
 * {@code 0.5 Σ_blocks |r_b|^2 + Σ_blocks constant_b}.
 *
 * <p>A block reads θ and the per-condition model parameters through the {@link EvaluationContext}
 * ({@link EvaluationContext#declaredParameters(int)} and {@link EvaluationContext#declaredParameterJacobian(int)}
 * give p(θ) and dp/dθ of a condition, in the layout of {@link org.switchfit.ode.CompiledModel}).
 * Implementations are thread-safe (per-thread workspaces, no shared mutable state).
 */
public interface ResidualBlock {

    /** Number of residuals (fixed). */
    int size();

    /** The block's part of the constant c (independent of θ). */
    double constant();

    /**
     * Writes the residuals into {@code r[offset .. offset + size)} and, when {@code jac} is not null, their
     * derivatives into rows {@code offset .. offset + size)} of {@code jac} (row-major, {@code ctx.parameterCount()}
     * columns; the rows are zero on entry).
     *
     * @throws ObjectiveException when the block cannot be evaluated at θ
     */
    void evaluate(EvaluationContext ctx, double[] r, int offset, double[] jac);

    /**
     * How θ_j enters this block, for {@link LikelihoodObjective#outputFactors()}: the block-local indices of the
     * residuals it scales as a factor of the prediction with a constant noise spread ({@link OutputFactor}), an
     * empty array when the block does not depend on θ_j, or null when it may depend on θ_j in any other way. The
     * default, null, makes no claim.
     */
    default int[] factorResiduals(int j) {
        return null;
    }
}
