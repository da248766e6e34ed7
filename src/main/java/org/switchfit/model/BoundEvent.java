package org.switchfit.model;

import java.util.List;
import org.switchfit.expr.Expr;

/**
 * An event with its mathematics bound to states, parameters and runtime locals of an {@link OdeForm}.
 *
 * @param delay    null when none
 * @param priority null when none
 */
public record BoundEvent(String id, Expr trigger, boolean initialValue, boolean persistent, Expr delay,
                         Expr priority, boolean useValuesFromTriggerTime, List<Target> targets) {
    public BoundEvent {
        targets = List.copyOf(targets);
    }

    /**
     * One assignment: state {@code stateIndex} receives {@code value}, multiplied by {@code scale} evaluated after
     * all assignments of the event are applied (the compartment size when a concentration sets an amount state),
     * unless scale is null.
     */
    public record Target(String variable, int stateIndex, Expr value, Expr scale) {
    }
}
