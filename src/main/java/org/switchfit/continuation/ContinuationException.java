package org.switchfit.continuation;

/**
 * A steady-state or continuation computation did not converge (Newton divergence, singular Jacobian away from a
 * known singular point, non-finite values). Not a programming error: callers usually record it per start or
 * per objective evaluation.
 */
public class ContinuationException extends RuntimeException {
    private static final long serialVersionUID = 1L;

    /** @param message what failed and with which numbers (formatted with Locale.ROOT by the caller) */
    public ContinuationException(String message) {
        super(message);
    }
}
