package org.switchfit.objective;

import org.switchfit.problem.FreeParameter;

/**
 * An estimated parameter that is exactly the noise spread σ of a set of normal-noise measurements and enters the
 * objective nowhere else: not in the model, not in an observable formula, without a prior. Its residuals are the
 * pairs {@code r_i = d_i / σ} ({@link #dataRows}) and {@code sqrt(2 ln σ + C_i)} ({@link #logRows}), so for fixed
 * predictions the NLL part {@code Σ d_i² / (2σ²) + N ln σ} is minimised in closed form by
 * {@code σ² = Σ d_i² / N} (the analytic inner problem of hierarchical optimisation, Loos, Krause, Sadiq and
 * Hasenauer 2018, "Hierarchical optimization for the efficient parametrization of ODE models", Bioinformatics
 * 34(24):4266-4273, doi:10.1093/bioinformatics/bty514). An optimizer may use it to move σ to its conditional
 * optimum and update residuals and Jacobian rows without a new simulation.
 *
 * @param parameter  θ index
 * @param definition the parameter (scale, bounds)
 * @param dataRows   residual indices of the rows {@code d_i / σ}
 * @param logRows    residual indices of the rows {@code sqrt(2 ln σ + C_i)}, one per data row
 */
public record NoiseScale(int parameter, FreeParameter definition, int[] dataRows, int[] logRows) {

    public NoiseScale {
        dataRows = dataRows.clone();
        logRows = logRows.clone();
    }

    @Override
    public int[] dataRows() {
        return dataRows.clone();
    }

    @Override
    public int[] logRows() {
        return logRows.clone();
    }

    /** σ at θ. */
    public double sigma(double theta) {
        return definition.toLinear(theta);
    }

    /** θ of σ. */
    public double theta(double sigma) {
        return definition.toTheta(sigma);
    }

    /** (dσ/dθ) / σ at θ. */
    public double logDerivative(double theta) {
        return definition.linearDerivative(theta) / definition.toLinear(theta);
    }
}
