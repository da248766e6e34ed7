package org.switchfit.model;

/**
 * A compartment. {@code size} is NaN when not given (then an initial assignment or rule must define it).
 *
 * @param spatialDimensions 0, 1, 2 or 3 (NaN when unset in L3)
 */
public record Compartment(String id, double size, double spatialDimensions, boolean constant) {
}
