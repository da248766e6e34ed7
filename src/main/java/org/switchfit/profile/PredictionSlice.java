package org.switchfit.profile;

import java.util.Locale;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.LocalFit;
import org.switchfit.objective.Objective;
import org.switchfit.objective.ObjectiveException;
import org.switchfit.objective.Prediction;

/**
 * Profile slice of a prediction g(θ): minimise nll(θ) subject to g(θ) = z by the method of multipliers
 * (augmented Lagrangian; Hestenes 1969, J. Optim. Theory Appl. 4:303-320, doi:10.1007/BF00927673; Powell 1969;
 * Nocedal and Wright, "Numerical Optimization", 2nd ed., §17.3). Each outer iteration minimises, with the
 * bounded LM, the least-squares problem extended by one residual {@code e = (g(θ) - z)/σ + σ μ}, i.e.
 * {@code nll + μ c + c²/(2σ²)} with c = g - z; then {@code μ ← μ + c/σ²}. Unlike the validation-profile penalty
 * with a vanishing σ (Kreutz et al. 2012, §"Validation profile"), whose constraint error is O(σ²) and whose
 * Jacobian becomes ill-conditioned as σ → 0, the multiplier update makes the constraint exact at a fixed,
 * moderate σ (0.1 × the delta-method standard error s of g): the loop stops when |c| ≤ 1e-9 s, or when |c| has
 * stagnated below 1e-4 s (the inner LM's accuracy floor; with ODE objectives at rtol 1e-10 the loop was measured to
 * stall at |c| ≈ 2e-6 s, so a floor of 1e-6 s turned reachable values into false "not reached" reports). The point is recorded at its own value g(θ) = z + c, not
 * at z, so the remaining violation does not bias the profile to first order (θ is optimal for the value it
 * attains); without that, the NLL error would be |dnll/dz|·|c| ≤ about 2.5e-6 χ² units inside the 95 % region.
 * A violation that stagnates above the floor means z cannot be reached inside the bounds
 * ({@link InfeasibleValueException}). The multiplier is carried over to the next z as a warm start.
 */
final class PredictionSlice implements Slice {

    private static final int MAX_OUTER = 60;

    private final FitProblem problem;
    private final Prediction g;
    private final LevenbergMarquardt lm;
    private final double sigma;
    private final double constraintTolerance;
    private final double noiseFloor;
    private final double lowerLimit;
    private final double upperLimit;
    private double mu;
    private int solves;

    PredictionSlice(FitProblem problem, Prediction g, LevenbergMarquardt lm, double scale, double lowerLimit,
                    double upperLimit) {
        this.problem = problem;
        this.g = g;
        this.lm = lm;
        this.sigma = 0.1 * scale;
        this.constraintTolerance = 1e-9 * scale;
        this.noiseFloor = 1e-4 * scale;
        this.lowerLimit = lowerLimit;
        this.upperLimit = upperLimit;
    }

    @Override
    public ProfilePoint solve(double z, double[] warm) {
        solves++;
        double[] theta = warm.clone();
        double c = Double.NaN;
        double bestViolation = Double.POSITIVE_INFINITY;
        int sinceImprovement = 0;
        double mu0 = mu;
        for (int outer = 0; outer < MAX_OUTER; outer++) {
            Augmented aug = new Augmented(problem.objective(), g, z, sigma, mu);
            LocalFit f = lm.minimize(problem.withObjective(aug), theta);
            theta = f.theta();
            c = g.evaluate(theta, null) - z;
            if (Math.abs(c) <= constraintTolerance) {
                break;
            }
            mu += c / (sigma * sigma);
            // Feasible problems shrink |c| by a roughly constant factor per update (linear convergence of the
            // method of multipliers); no 10 % gain in 5 updates means z is out of reach inside the bounds.
            if (Math.abs(c) < 0.9 * bestViolation) {
                bestViolation = Math.abs(c);
                sinceImprovement = 0;
            } else if (++sinceImprovement >= 5) {
                if (Math.abs(c) <= noiseFloor) {
                    // Stagnation at the inner solver's accuracy: keep the point, recorded at its own value g(θ).
                    break;
                }
                mu = mu0;
                throw new InfeasibleValueException(String.format(Locale.ROOT,
                        "prediction value %.10g is not reached inside the parameter bounds (closest %.10g)", z,
                        z + c));
            }
        }
        if (!(Math.abs(c) <= noiseFloor)) {
            mu = mu0;
            throw new ObjectiveException(String.format(Locale.ROOT,
                    "prediction constraint g = %.6g not met after %d multiplier updates (violation %.3g)", z,
                    MAX_OUTER, c));
        }
        double[] r = new double[problem.objective().residualCount()];
        double nll = problem.objective().evaluate(theta, r, null);
        return new ProfilePoint(z + c, nll, theta);
    }

    @Override
    public double lowerLimit() {
        return lowerLimit;
    }

    @Override
    public double upperLimit() {
        return upperLimit;
    }

    @Override
    public int solves() {
        return solves;
    }

    /** The objective with the augmented-Lagrangian residual appended (last row). */
    private static final class Augmented implements Objective {
        private final Objective base;
        private final Prediction g;
        private final double z;
        private final double sigma;
        private final double mu;

        Augmented(Objective base, Prediction g, double z, double sigma, double mu) {
            this.base = base;
            this.g = g;
            this.z = z;
            this.sigma = sigma;
            this.mu = mu;
        }

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
            double[] jb = jacobian == null ? null : new double[m * n];
            double nll = base.evaluate(theta, r, jb);
            System.arraycopy(r, 0, residuals, 0, m);
            double[] grad = jacobian == null ? null : new double[n];
            double e = (g.evaluate(theta, grad) - z) / sigma + sigma * mu;
            residuals[m] = e;
            if (jacobian != null) {
                System.arraycopy(jb, 0, jacobian, 0, m * n);
                for (int k = 0; k < n; k++) {
                    jacobian[m * n + k] = grad[k] / sigma;
                }
            }
            return nll + 0.5 * e * e;
        }
    }
}
