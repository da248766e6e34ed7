package org.switchfit.ode;

import org.switchfit.ode.bdf.BdfIntegrator;

/**
 * Chooses an {@link Integrator} for {@link SolverSettings}: {@code BDF} and {@code AUTO} give the variable-order
 * BDF ({@link BdfIntegrator}), {@code DORMAND_PRINCE} the explicit Dormand-Prince 8(5,3).
 *
 * <p>AUTO currently means BDF for every model: biochemical models are stiff often enough (fast binding next to slow
 * synthesis), and BDF on a non-stiff model costs a small constant factor, while an explicit method on a stiff model
 * can cost orders of magnitude. {@link AutoIntegrator} is the alternative that starts explicit and switches to BDF
 * when the explicit step budget runs out (used by the conformance runner).
 */
public final class Integrators {
    private Integrators() {
    }

    /** The integrator for the settings' method. */
    public static Integrator create(SolverSettings settings) {
        if (settings.method() == SolverSettings.Method.DORMAND_PRINCE) {
            return new DormandPrinceIntegrator(settings);
        }
        return new BdfIntegrator(settings);
    }

    /** True: BDF and AUTO use the stiff BDF method. */
    public static boolean isStiffAvailable() {
        return true;
    }
}
