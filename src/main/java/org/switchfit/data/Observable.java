package org.switchfit.data;

import org.switchfit.util.SourceLocation;

/**
 * A measured quantity: {@code y = scale * formula + offset}, with a noise model. The formula is kept as text in
 * infix syntax; the model side parses it against the model's ids. Immutable.
 *
 * @param id              observable id, as used in data tables
 * @param formula         infix expression in model ids, e.g. {@code KinP / (Kin + KinP)}
 * @param scaleParameter  id of a scaling factor parameter, or null for 1
 * @param offsetParameter id of an offset parameter, or null for 0
 * @param noise           the noise model
 * @param location        where it was declared
 */
public record Observable(String id, String formula, String scaleParameter, String offsetParameter,
        NoiseModel noise, SourceLocation location) {
}
