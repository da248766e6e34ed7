package org.switchfit.objective;

import org.switchfit.problem.Condition;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.FreeParameter;

/**
 * What a {@link ResidualBlock} sees of one objective evaluation: θ on the estimation scale, the linear values and
 * dx/dθ, per-condition declared parameter vectors with their θ-Jacobians, and optional sinks for simulated values.
 * One instance per evaluation; not thread-safe.
 */
public final class EvaluationContext {
    private final EstimationProblem problem;
    private final double[] theta;
    private final double[] linear;
    private final double[] dLinear;
    final double[] simulated;
    final double[] sigmas;
    /** Sink for switching-data rows of a detailed evaluation, or null. */
    private final java.util.List<SwitchingFit> switching;

    EvaluationContext(EstimationProblem problem, double[] theta, double[] simulated, double[] sigmas) {
        this(problem, theta, simulated, sigmas, null);
    }

    EvaluationContext(EstimationProblem problem, double[] theta, double[] simulated, double[] sigmas,
                      java.util.List<SwitchingFit> switching) {
        this.problem = problem;
        this.theta = theta;
        int np = theta.length;
        this.linear = new double[np];
        this.dLinear = new double[np];
        for (int j = 0; j < np; j++) {
            FreeParameter p = problem.parameters().get(j);
            linear[j] = p.toLinear(theta[j]);
            dLinear[j] = p.linearDerivative(theta[j]);
        }
        this.simulated = simulated;
        this.sigmas = sigmas;
        this.switching = switching;
    }

    /** The problem. */
    public EstimationProblem problem() {
        return problem;
    }

    /** Number of estimated parameters. */
    public int parameterCount() {
        return theta.length;
    }

    /** θ_j on the estimation scale. */
    public double theta(int j) {
        return theta[j];
    }

    /** Linear value of θ_j. */
    public double linear(int j) {
        return linear[j];
    }

    /** Linear values (shared array; do not modify). */
    double[] linearValues() {
        return linear;
    }

    /** dx_j/dθ_j (x the linear value). */
    public double linearDerivative(int j) {
        return dLinear[j];
    }

    /** Declared model parameter vector p(θ) of condition c (new array, length m). */
    public double[] declaredParameters(int c) {
        Condition cond = problem.conditions().get(c);
        double[] p = new double[problem.compiled().parameterCount()];
        cond.declared(linear, p);
        return p;
    }

    /** Dense dp/dθ of condition c: {@code d[k * np + j] = ∂p_k/∂θ_j} (new array, m x np). */
    public double[] declaredParameterJacobian(int c) {
        Condition cond = problem.conditions().get(c);
        int np = theta.length;
        double[] d = new double[problem.compiled().parameterCount() * np];
        for (int i = 0; i < cond.targetCount(); i++) {
            int j = cond.targetTheta(i);
            d[cond.target(i) * np + j] = dLinear[j];
        }
        return d;
    }

    /** Records the simulated observable value and spread of measurement i (when a sink was requested). */
    void record(int i, double h, double sigma) {
        if (simulated != null) {
            simulated[i] = h;
            sigmas[i] = sigma;
        }
    }

    /** Whether switching-data rows are being recorded ({@link #record(SwitchingFit)}). */
    boolean recordsSwitching() {
        return switching != null;
    }

    /** Records one switching-threshold or dose-response row (when a sink was requested). */
    void record(SwitchingFit row) {
        if (switching != null) {
            switching.add(row);
        }
    }
}
