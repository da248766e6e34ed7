package org.switchfit.model;

/**
 * A species. Exactly one of {@code initialAmount}, {@code initialConcentration} is normally non-NaN (both NaN when
 * an initial assignment defines the value).
 *
 * @param conversionFactor parameter id scaling reaction contributions, or null
 */
public record Species(String id, String compartment, double initialAmount, double initialConcentration,
                      boolean hasOnlySubstanceUnits, boolean boundaryCondition, boolean constant,
                      String conversionFactor) {
}
