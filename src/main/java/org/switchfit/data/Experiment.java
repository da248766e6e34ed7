package org.switchfit.data;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.switchfit.util.SourceLocation;

/**
 * One experiment of a switchfit problem: the values it sets (parameters, initial values), an optional
 * pre-equilibration and dosing events. Immutable; maps keep file order.
 *
 * @param id              experiment id
 * @param parameterValues parameter id to value (number or estimated-parameter id) during the experiment
 * @param initialValues   species or compartment id to its value at time 0
 * @param settleIn        id of another experiment whose settings are applied while the system settles to a
 *                        steady state before time 0; null to start directly from the initial values
 * @param doses           dosing events in time order
 * @param location        where it was declared
 */
public record Experiment(String id, Map<String, ValueRef> parameterValues, Map<String, ValueRef> initialValues,
        String settleIn, List<Dose> doses, SourceLocation location) {

    /** Copies the collections (keeping order). */
    public Experiment {
        parameterValues = Collections.unmodifiableMap(new LinkedHashMap<>(parameterValues));
        initialValues = Collections.unmodifiableMap(new LinkedHashMap<>(initialValues));
        doses = List.copyOf(doses);
    }
}
