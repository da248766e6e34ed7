package org.switchfit.objective;

/**
 * A derived quantity g(θ) of the parameters on the estimation scale (a model prediction, a fold position, a
 * parameter combination), with its gradient. Used for prediction profiles (Kreutz et al. 2012, BMC Syst Biol
 * 6:120, doi:10.1186/1752-0509-6-120).
 *
 * <p>Implementations are thread-safe, like {@link Objective}.
 */
public interface Prediction {

    /** Number of parameters θ (equal to the objective's parameter count). */
    int parameterCount();

    /**
     * Evaluates g and optionally its gradient.
     *
     * @param theta    parameters on the estimation scale (read)
     * @param gradient receives ∂g/∂θ_k (length parameterCount), or null when not needed
     * @return g(θ)
     * @throws ObjectiveException when g cannot be evaluated at θ
     */
    double evaluate(double[] theta, double[] gradient);
}
