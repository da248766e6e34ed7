package org.switchfit.model;

import java.util.List;
import org.switchfit.expr.Expr;

/**
 * An SBML event. {@code delay} and {@code priority} may be null.
 *
 * @param initialValue              trigger value assumed just before the start time
 * @param persistent                whether a pending execution survives the trigger becoming false
 * @param useValuesFromTriggerTime  whether assignment values are computed when triggered (else when executed)
 */
public record Event(String id, Expr trigger, boolean initialValue, boolean persistent, Expr delay, Expr priority,
                    boolean useValuesFromTriggerTime, List<Assignment> assignments) {
    public Event {
        assignments = List.copyOf(assignments);
    }

    /** One event assignment. */
    public record Assignment(String variable, Expr math) {
    }
}
