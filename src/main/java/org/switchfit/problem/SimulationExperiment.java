package org.switchfit.problem;

/**
 * One simulation: an optional pre-equilibration condition (simulated to steady state first), then the
 * simulation condition from time 0, and the measurements taken on it. Immutable.
 *
 * @param id               display id ({@code pre:sim} or {@code sim})
 * @param condition        index of the simulation condition
 * @param preequilibration index of the pre-equilibration condition, or -1
 * @param measurements     indices into {@link EstimationProblem#measurements()}, sorted by time (stable)
 */
public record SimulationExperiment(String id, int condition, int preequilibration, int[] measurements) {

    public SimulationExperiment {
        measurements = measurements.clone();
    }

    @Override
    public int[] measurements() {
        return measurements.clone();
    }
}
