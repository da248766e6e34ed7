package org.switchfit.data;

import java.util.List;
import org.switchfit.util.SourceLocation;

/**
 * A row of a PEtab v1 measurement table (or of a simulated-data table, whose {@code simulation} column is read
 * into {@code value}). Immutable.
 *
 * @param observableId                 observableId
 * @param simulationConditionId        simulationConditionId
 * @param preequilibrationConditionId  preequilibrationConditionId, or null when the row has none
 * @param value                        measurement (or simulation)
 * @param time                         time; {@code +inf} means steady state
 * @param observableParameters         values for the observable formula's observableParameter placeholders,
 *                                     in order (numbers or parameter ids); empty when none
 * @param noiseParameters              values for the noise formula's noiseParameter placeholders, in order
 * @param datasetId                    datasetId, empty when absent
 * @param replicateId                  replicateId, empty when absent
 * @param location                     file and line
 */
public record PetabMeasurement(String observableId, String simulationConditionId,
        String preequilibrationConditionId, double value, double time, List<ValueRef> observableParameters,
        List<ValueRef> noiseParameters, String datasetId, String replicateId, SourceLocation location) {

    /** Copies the lists. */
    public PetabMeasurement {
        observableParameters = List.copyOf(observableParameters);
        noiseParameters = List.copyOf(noiseParameters);
    }

    /** Whether the row is a steady-state measurement (time = +inf). */
    public boolean isSteadyState() {
        return time == Double.POSITIVE_INFINITY;
    }
}
