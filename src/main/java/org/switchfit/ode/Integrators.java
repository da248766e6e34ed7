package org.switchfit.ode;

/**
 * Chooses an {@link Integrator} for {@link SolverSettings}. Until the stiff BDF integrator is available, every
 * method maps to {@link DormandPrinceIntegrator}; {@link #isStiffAvailable()} tells callers which is the case.
 */
public final class Integrators {
    private Integrators() {
    }

    /** The integrator for the settings' method. */
    public static Integrator create(SolverSettings settings) {
        return new DormandPrinceIntegrator(settings);
    }

    /** True when BDF/AUTO use a stiff method (false: they fall back to Dormand-Prince). */
    public static boolean isStiffAvailable() {
        return false;
    }
}
