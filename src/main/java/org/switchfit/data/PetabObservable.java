package org.switchfit.data;

import org.switchfit.util.SourceLocation;

/**
 * A row of a PEtab v1 observable table. Formulas are kept as text (the model side parses them).
 * Immutable.
 *
 * @param id                observableId
 * @param name              observableName, empty when absent
 * @param formula           observableFormula
 * @param noiseFormula      noiseFormula (the standard deviation, or the Laplace scale)
 * @param transformation    observableTransformation, {@link ParameterScale#LIN} when absent
 * @param noiseDistribution noiseDistribution, {@link NoiseDistribution#NORMAL} when absent
 * @param location          file and line
 */
public record PetabObservable(String id, String name, String formula, String noiseFormula,
        ParameterScale transformation, NoiseDistribution noiseDistribution, SourceLocation location) {

    /** Noise distributions of PEtab v1. */
    public enum NoiseDistribution {
        /** Normal with standard deviation = noiseFormula. */
        NORMAL,
        /** Laplace with scale = noiseFormula. */
        LAPLACE
    }
}
