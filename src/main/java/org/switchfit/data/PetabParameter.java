package org.switchfit.data;

import org.switchfit.util.SourceLocation;

/**
 * A row of a PEtab v1 parameter table. Bounds and nominal value are on the linear scale; empty fields are NaN
 * (allowed by PEtab v1 for bounds of parameters that are not estimated). Immutable.
 *
 * @param id                  parameterId
 * @param name                parameterName, empty when absent
 * @param scale               parameterScale
 * @param lower               lowerBound, NaN when empty
 * @param upper               upperBound, NaN when empty
 * @param nominal             nominalValue, NaN when empty
 * @param estimate            estimate = 1
 * @param initializationPrior initialization prior (for sampling starts), or null
 * @param objectivePrior      prior added to the objective, or null
 * @param location            file and line
 */
public record PetabParameter(String id, String name, ParameterScale scale, double lower, double upper,
        double nominal, boolean estimate, Prior initializationPrior, Prior objectivePrior, SourceLocation location) {
}
