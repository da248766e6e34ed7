package org.switchfit.data;

import org.switchfit.util.SourceLocation;

/**
 * A measured switching threshold: the value of a control parameter at which the system jumps to the other state
 * while the control is swept up or down (a fold, or saddle-node, of the steady-state branch). Immutable.
 *
 * @param experiment experiment id whose other settings apply
 * @param control    control parameter id
 * @param direction  sweep direction: up = switch-on threshold, down = switch-off threshold
 * @param value      measured threshold, linear scale
 * @param sigma      standard deviation of the measured threshold, positive
 * @param location   where it was given
 */
public record SwitchingThreshold(String experiment, String control, Direction direction, double value,
        double sigma, SourceLocation location) {

    /** Sweep direction of the control parameter. */
    public enum Direction {
        /** Control increased until the system switches on. */
        UP,
        /** Control decreased until the system switches off. */
        DOWN
    }
}
