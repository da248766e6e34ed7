package org.switchfit.objective;

import org.switchfit.util.SourceLocation;

/**
 * A data row's prediction or noise spread cannot enter the likelihood at the given parameters (a prediction that is
 * not finite, not positive under a log transformation, or a noise spread that is not positive and finite). The
 * message names the row, the observable, the experiment and the time or dose, and says what to change. At a fit's
 * trial point it is a rejected step like any {@link ObjectiveException}; at values the user chose (the nominal values
 * that {@code check} evaluates) it is a user error.
 */
public final class UnusablePredictionException extends ObjectiveException {
    private static final long serialVersionUID = 1L;

    private final transient SourceLocation location;
    private final String detail;

    /**
     * @param location the data row, or null
     * @param detail   what is wrong there and what to do, without the location
     */
    UnusablePredictionException(SourceLocation location, String detail) {
        super(location == null ? detail : location + ": " + detail);
        this.location = location;
        this.detail = detail;
    }

    /** The data row, or null. */
    public SourceLocation location() {
        return location;
    }

    /** The message without the location. */
    public String detail() {
        return detail;
    }
}
