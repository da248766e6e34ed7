package org.switchfit.data;

import org.switchfit.util.SourceLocation;

/**
 * One steady-state measurement of a dose-response curve: the control parameter is held at {@code dose} and the
 * system is at the steady state reached from the low or the high branch (which matters where the system is
 * bistable). Immutable.
 *
 * @param experiment experiment id (its other settings apply)
 * @param observable observable id
 * @param control    id of the control parameter that the dose sets
 * @param dose       value of the control parameter
 * @param value      measured value
 * @param sigma      known standard deviation of this point, NaN when not given
 * @param history    which state the steady state was approached from
 * @param location   file and line of the row
 */
public record DoseResponsePoint(String experiment, String observable, String control, double dose, double value,
        double sigma, History history, SourceLocation location) {

    /** The state a steady state was approached from. */
    public enum History {
        /** Approached from the low (off) state, e.g. by raising the dose. */
        LOW,
        /** Approached from the high (on) state, e.g. by lowering the dose. */
        HIGH
    }
}
