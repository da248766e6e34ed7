package org.switchfit.fit;

/**
 * Outcome of one local Levenberg-Marquardt run. Immutable value (arrays are copied on access).
 *
 * @param theta                   final parameters on the estimation scale (fixed ones included)
 * @param nll                     final negative log-likelihood {@code 0.5 |r|^2 + c}
 * @param termination             why the run stopped
 * @param iterations              accepted plus rejected trial steps
 * @param evaluations             objective evaluations (with or without Jacobian)
 * @param jacobianEvaluations     evaluations that computed the Jacobian
 * @param projectedGradientNorm   max-norm of {@code θ - P(θ - ∇nll)} over free parameters, P = projection on the box
 * @param activeBounds            per parameter: -1 at its lower bound, +1 at its upper bound, 0 otherwise
 */
public record LocalFit(double[] theta, double nll, Termination termination, int iterations, int evaluations,
                       int jacobianEvaluations, double projectedGradientNorm, int[] activeBounds) {

    public LocalFit {
        theta = theta.clone();
        activeBounds = activeBounds.clone();
    }

    @Override
    public double[] theta() {
        return theta.clone();
    }

    @Override
    public int[] activeBounds() {
        return activeBounds.clone();
    }
}
