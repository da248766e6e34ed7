package org.switchfit.objective;

/**
 * A negative log-likelihood written as a sum of squares plus a constant, over parameters θ on the estimation
 * scale (e.g. log10 of rate constants): {@code nll(θ) = 0.5 * Σ_i r_i(θ)^2 + c}, c independent of θ. Terms that
 * are not squares (log σ normalisation with estimated σ, Laplace noise, priors) are written as extra residuals by
 * the implementation.
 *
 * <p>Jacobian layout: {@code jac[i * np + k] = ∂r_i/∂θ_k}, np = {@link #parameterCount()}, i &lt;
 * {@link #residualCount()}. Implementations are thread-safe (each call uses its own workspace or is
 * synchronised per thread).
 */
public interface Objective {

    /** Number of estimated parameters. */
    int parameterCount();

    /** Number of residuals (fixed for the objective's lifetime). */
    int residualCount();

    /**
     * Evaluates residuals and optionally their Jacobian.
     *
     * @param theta     parameters on the estimation scale (read)
     * @param residuals receives r (length residualCount)
     * @param jacobian  receives ∂r/∂θ (row-major), or null when not needed
     * @return the negative log-likelihood {@code 0.5 * |r|^2 + c}
     * @throws ObjectiveException when the model cannot be evaluated at θ (integration failure, non-finite values)
     */
    double evaluate(double[] theta, double[] residuals, double[] jacobian);

    /**
     * Parameters that enter the residuals only as a factor of predictions with a constant noise spread
     * ({@link OutputFactor}), for optimizers that set them to their closed-form conditional optimum. The default
     * is none, which is always correct.
     */
    default java.util.List<OutputFactor> outputFactors() {
        return java.util.List.of();
    }
}
