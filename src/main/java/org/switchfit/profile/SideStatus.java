package org.switchfit.profile;

/** How one side (direction) of a profile ended. */
public enum SideStatus {
    /** The likelihood ratio rose above the largest threshold: the side is closed. */
    CLOSED,
    /** A bound of the profiled quantity was reached below the threshold: open. */
    OPEN_AT_BOUND,
    /** The step limit was reached below the threshold: open as far as explored. */
    OPEN_STEP_LIMIT,
    /** Re-optimisation failed repeatedly even with the smallest step; the side stops where it was. */
    FAILED
}
