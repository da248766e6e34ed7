package org.switchfit.ode;

import org.switchfit.ode.bdf.BdfIntegrator;

/** Chooses an {@link Integrator} for the method of {@link SolverSettings}. */
public final class Integrators {
    private Integrators() {
    }

    /** BDF gives the stiff BDF integrator, DORMAND_PRINCE the explicit 8(5,3) pair, AUTO {@link AutoIntegrator}. */
    public static Integrator create(SolverSettings settings) {
        switch (settings.method()) {
            case BDF:
                return new BdfIntegrator(settings);
            case DORMAND_PRINCE:
                return new DormandPrinceIntegrator(settings);
            default:
                return new AutoIntegrator(settings);
        }
    }

    /** True: BDF and AUTO use a stiff method. */
    public static boolean isStiffAvailable() {
        return true;
    }
}
