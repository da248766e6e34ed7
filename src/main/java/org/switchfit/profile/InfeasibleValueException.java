package org.switchfit.profile;

import org.switchfit.objective.ObjectiveException;

/**
 * A prediction value cannot be attained by any parameters inside the bounds (the constrained re-optimisation
 * stagnates with a non-vanishing constraint violation). Package-private signal; a profile side that meets it
 * ends as {@link SideStatus#OPEN_AT_BOUND}.
 */
final class InfeasibleValueException extends ObjectiveException {
    private static final long serialVersionUID = 1L;

    InfeasibleValueException(String message) {
        super(message);
    }
}
