package org.switchfit.ode;

/**
 * Immutable integration settings. Tolerances follow the usual weighted RMS norm: the local error estimate e_i
 * must satisfy sqrt(mean((e_i / (atol + rtol * |y_i|))^2)) <= 1.
 *
 * @param method      which integrator family
 * @param rtol        relative tolerance (&gt; 0)
 * @param atol        absolute tolerance (&gt; 0), same for all states
 * @param maxSteps    maximum number of steps per {@code advance} call before failing
 * @param maxStepSize largest step allowed (Double.POSITIVE_INFINITY for none)
 */
public record SolverSettings(Method method, double rtol, double atol, int maxSteps, double maxStepSize) {

    /** Integrator families. */
    public enum Method {
        /** Variable-order BDF (stiff). */
        BDF,
        /** Dormand-Prince 8(5,3) (non-stiff). */
        DORMAND_PRINCE,
        /** Start non-stiff; switch to BDF when stiffness is detected. */
        AUTO
    }

    /** Defaults: BDF, rtol 1e-8, atol 1e-10, 500000 steps, no step limit. */
    public static SolverSettings defaults() {
        return new SolverSettings(Method.BDF, 1e-8, 1e-10, 500_000, Double.POSITIVE_INFINITY);
    }

    public SolverSettings withTolerances(double newRtol, double newAtol) {
        return new SolverSettings(method, newRtol, newAtol, maxSteps, maxStepSize);
    }

    public SolverSettings withMethod(Method newMethod) {
        return new SolverSettings(newMethod, rtol, atol, maxSteps, maxStepSize);
    }

    public SolverSettings withMaxStepSize(double h) {
        return new SolverSettings(method, rtol, atol, maxSteps, h);
    }
}
