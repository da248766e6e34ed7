/**
 * switchfit's own immutable model: states, parameters, rules, reactions, events with ids resolved.
 *
 * <p>Layering: may import project packages {expr, util} only.
 */
package org.switchfit.model;
