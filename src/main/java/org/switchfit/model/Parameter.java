package org.switchfit.model;

/** A global parameter, or a reaction-local one (id {@code reactionId.paramId}, always constant). */
public record Parameter(String id, double value, boolean constant) {
}
