package org.switchfit.fit;

import org.switchfit.objective.Objective;
import org.switchfit.objective.ObjectiveException;

/**
 * Test-scope objective for curve fits y_i = f(x_i; b) + ε_i, ε_i ~ N(0, σ²) with known σ:
 * r_i = (f(x_i; b) - y_i) / σ, nll = ½|r|² (the constant n·ln(σ√(2π)) is included so c ≠ 0 is exercised).
 */
public final class CurveObjective implements Objective {

    /** A model function with its gradient in b. */
    public interface Model {
        /** Returns f(x; b) and writes ∂f/∂b_k into grad (length b.length). */
        double value(double x, double[] b, double[] grad);
    }

    private final double[] x;
    private final double[] y;
    private final double sigma;
    private final int np;
    private final Model model;

    public CurveObjective(double[] x, double[] y, double sigma, int np, Model model) {
        this.x = x.clone();
        this.y = y.clone();
        this.sigma = sigma;
        this.np = np;
        this.model = model;
    }

    @Override
    public int parameterCount() {
        return np;
    }

    @Override
    public int residualCount() {
        return x.length;
    }

    @Override
    public double evaluate(double[] theta, double[] residuals, double[] jacobian) {
        double[] grad = new double[np];
        double s = 0;
        for (int i = 0; i < x.length; i++) {
            double f = model.value(x[i], theta, grad);
            double ri = (f - y[i]) / sigma;
            residuals[i] = ri;
            s += ri * ri;
            if (jacobian != null) {
                for (int k = 0; k < np; k++) {
                    jacobian[i * np + k] = grad[k] / sigma;
                }
            }
        }
        if (!Double.isFinite(s)) {
            throw new ObjectiveException("non-finite residual");
        }
        return 0.5 * s + x.length * Math.log(sigma * Math.sqrt(2 * Math.PI));
    }

    /** Sum of squared raw errors Σ (y - f)², the NIST "residual sum of squares". */
    public double residualSumOfSquares(double[] b) {
        double[] r = new double[x.length];
        evaluate(b, r, null);
        double s = 0;
        for (double v : r) {
            s += v * v * sigma * sigma;
        }
        return s;
    }
}
