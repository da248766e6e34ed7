package org.switchfit.objective;

/** The objective cannot be evaluated at the given parameters (integration failure, non-finite result). */
public class ObjectiveException extends RuntimeException {
    private static final long serialVersionUID = 1L;

    public ObjectiveException(String message) {
        super(message);
    }

    public ObjectiveException(String message, Throwable cause) {
        super(message, cause);
    }
}
