package org.switchfit.audit;

import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.LocalFit;
import org.switchfit.objective.Objective;
import org.switchfit.objective.Prediction;

/**
 * Minimum of the NLL subject to g(θ) = z for a prediction g (a fold position or an observable), by the method of
 * multipliers (Hestenes 1969, J. Optim. Theory Appl. 4:303-320, doi:10.1007/BF00927673; Nocedal and Wright,
 * "Numerical Optimization", 2nd ed., §17.3): the bounded LM minimises the residuals extended by
 * {@code (g(θ) - z)/σ + σ·μ}, then {@code μ ← μ + (g - z)/σ²}, until |g - z| ≤ 1e-8 s (s the scale of g given by
 * the caller, about one standard error). The audit's own implementation, kept independent of the profile package's
 * so that a fault there is not reproduced here. Not thread-safe per instance; make one per solve.
 */
final class ConstrainedRefit {

    private static final int MAX_OUTER = 40;

    /** Outcome: θ, the NLL there, and the value g(θ) actually reached. */
    record Result(double[] theta, double nll, double value) {
    }

    private ConstrainedRefit() {
    }

    /**
     * @param scale positive scale of g (about its standard error); σ = 0.1 scale
     * @throws org.switchfit.objective.ObjectiveException when g or the NLL cannot be evaluated
     */
    static Result solve(FitProblem problem, Prediction g, double z, double scale, double[] warm,
                        LevenbergMarquardt lm) {
        Objective base = problem.objective();
        double sigma = 0.1 * scale;
        double mu = 0;
        double[] theta = warm.clone();
        double c = g.evaluate(theta, null) - z;
        for (int outer = 0; outer < MAX_OUTER && Math.abs(c) > 1e-8 * scale; outer++) {
            LocalFit f = lm.minimize(problem.withObjective(new Extended(base, g, z, sigma, mu)), theta);
            theta = f.theta();
            c = g.evaluate(theta, null) - z;
            mu += c / (sigma * sigma);
        }
        double nll = base.evaluate(theta, new double[base.residualCount()], null);
        return new Result(theta, nll, z + c);
    }

    /** The NLL's residuals plus the multiplier residual. */
    private record Extended(Objective base, Prediction g, double z, double sigma, double mu) implements Objective {
        @Override
        public int parameterCount() {
            return base.parameterCount();
        }

        @Override
        public int residualCount() {
            return base.residualCount() + 1;
        }

        @Override
        public double evaluate(double[] theta, double[] residuals, double[] jacobian) {
            int m = base.residualCount();
            int n = base.parameterCount();
            double[] r = new double[m];
            double[] jac = jacobian == null ? null : new double[m * n];
            double nll = base.evaluate(theta, r, jac);
            double[] grad = jacobian == null ? null : new double[n];
            double e = (g.evaluate(theta, grad) - z) / sigma + sigma * mu;
            System.arraycopy(r, 0, residuals, 0, m);
            residuals[m] = e;
            if (jacobian != null) {
                System.arraycopy(jac, 0, jacobian, 0, m * n);
                for (int k = 0; k < n; k++) {
                    jacobian[m * n + k] = grad[k] / sigma;
                }
            }
            return nll + 0.5 * e * e;
        }
    }
}
