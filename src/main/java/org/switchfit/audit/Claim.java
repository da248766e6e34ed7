package org.switchfit.audit;

import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.Map;

/**
 * One checked claim of a fit directory. Immutable.
 *
 * @param id     short identifier, e.g. {@code nll}, {@code optimality}, {@code profile k_stim upper},
 *               {@code input datasets/x.csv}
 * @param holds  whether the re-derived numbers support the claim
 * @param text   one line with the numbers (recorded, recomputed, tolerance)
 * @param values the same numbers by name (NaN allowed), in insertion order
 */
public record Claim(String id, boolean holds, String text, Map<String, Double> values) {

    /** Copies the map (null becomes empty). */
    public Claim {
        values = values == null ? Map.of() : Collections.unmodifiableMap(new LinkedHashMap<>(values));
    }

    /** The line printed for this claim: {@code holds} or {@code fails}, the id and the text. */
    public String line() {
        return (holds ? "holds  " : "fails  ") + id + ": " + text;
    }
}
