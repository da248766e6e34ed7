package org.switchfit.ode;

import java.util.Locale;

/**
 * An integration could not continue: step size underflow, too many steps, repeated Newton failure or
 * non-finite values. Carries the time reached. Not a programming error; callers usually record it per start.
 */
public class IntegrationException extends RuntimeException {
    private static final long serialVersionUID = 1L;

    private final double time;

    public IntegrationException(double time, String reason) {
        super(String.format(Locale.ROOT, "integration stopped at t = %.6g: %s", time, reason));
        this.time = time;
    }

    /** Time at which integration stopped. */
    public double time() {
        return time;
    }
}
