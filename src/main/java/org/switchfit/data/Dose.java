package org.switchfit.data;

import org.switchfit.util.SourceLocation;

/**
 * A dosing event of an experiment: at {@code time} the {@code target} (species, parameter or compartment id) is
 * set to {@code amount} or increased by it. Immutable.
 *
 * @param time     event time (model time units), at or after 0
 * @param target   id of the model quantity changed
 * @param action   set or add
 * @param amount   the new value or the increment (a number or a parameter id)
 * @param location where it was declared
 */
public record Dose(double time, String target, Action action, ValueRef amount, SourceLocation location) {

    /** What a dose does to its target. */
    public enum Action {
        /** target := amount. */
        SET,
        /** target := target + amount. */
        ADD
    }
}
