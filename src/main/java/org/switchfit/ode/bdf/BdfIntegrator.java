package org.switchfit.ode.bdf;

import org.switchfit.ode.Integrator;
import org.switchfit.ode.OdeSystem;
import org.switchfit.ode.RootFunctions;
import org.switchfit.ode.SolverSettings;

/**
 * Variable-order (1 to 5), variable-step BDF integrator for stiff systems, with Newton iteration on the analytic
 * Jacobian, root finding and staggered forward sensitivities. See {@link BdfSession} for the method, its
 * references and the exact contract.
 *
 * <p>Immutable and thread-safe; each session it starts belongs to one thread.
 */
public final class BdfIntegrator implements Integrator {

    private final SolverSettings settings;

    /**
     * @param settings tolerances and limits; the {@code method} field is ignored (this is always BDF)
     * @throws IllegalArgumentException when rtol, atol, maxSteps or maxStepSize are not positive
     */
    public BdfIntegrator(SolverSettings settings) {
        if (!(settings.rtol() > 0) || !(settings.atol() > 0)) {
            throw new IllegalArgumentException("tolerances must be > 0, got rtol = " + settings.rtol()
                    + ", atol = " + settings.atol());
        }
        if (settings.maxSteps() <= 0) {
            throw new IllegalArgumentException("maxSteps must be > 0, got " + settings.maxSteps());
        }
        if (!(settings.maxStepSize() > 0)) {
            throw new IllegalArgumentException("maxStepSize must be > 0, got " + settings.maxStepSize());
        }
        this.settings = settings;
    }

    /** Same as the constructor. */
    public static BdfIntegrator of(SolverSettings settings) {
        return new BdfIntegrator(settings);
    }

    /** The settings this integrator was built with. */
    public SolverSettings settings() {
        return settings;
    }

    @Override
    public BdfSession start(OdeSystem sys, double t0, double[] y0, double[] p, RootFunctions roots,
                            int[] sensParams, double[] s0) {
        return new BdfSession(settings, sys, t0, y0, p, roots, sensParams, s0);
    }
}
