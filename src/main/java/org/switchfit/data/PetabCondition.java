package org.switchfit.data;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;
import org.switchfit.util.SourceLocation;

/**
 * A row of a PEtab v1 condition table: the values a simulation condition assigns to model entities.
 * An empty field or NaN is kept as the number NaN, which PEtab v1 defines as "keep the model's value"
 * (for species: do not re-initialise after pre-equilibration). Immutable.
 *
 * @param id       conditionId
 * @param name     conditionName, empty when absent
 * @param values   entity id (column name) to number or parameter id, in column order
 * @param location file and line
 */
public record PetabCondition(String id, String name, Map<String, ValueRef> values, SourceLocation location) {

    /** Copies the map, keeping column order. */
    public PetabCondition {
        values = Collections.unmodifiableMap(new LinkedHashMap<>(values));
    }
}
