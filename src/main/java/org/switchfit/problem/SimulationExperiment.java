package org.switchfit.problem;

/**
 * One simulation: an optional pre-equilibration condition (simulated to steady state first), then the
 * simulation condition from time 0, and the measurements taken on it. Immutable.
 *
 * @param id               display id ({@code pre:sim} or {@code sim})
 * @param condition        index of the simulation condition
 * @param preequilibration index of the pre-equilibration condition, or -1
 * @param measurements     indices into {@link EstimationProblem#measurements()}, sorted by time (stable)
 * @param doses            doses applied during the simulation, sorted by time (stable); a measurement at a dose
 *                         time sees the state after the dose
 */
public record SimulationExperiment(String id, int condition, int preequilibration, int[] measurements,
                                   java.util.List<DoseStep> doses) {

    public SimulationExperiment {
        measurements = measurements.clone();
        java.util.List<DoseStep> sorted = new java.util.ArrayList<>(doses);
        sorted.sort(java.util.Comparator.comparingDouble(DoseStep::time));
        doses = java.util.List.copyOf(sorted);
    }

    /** An experiment without doses. */
    public SimulationExperiment(String id, int condition, int preequilibration, int[] measurements) {
        this(id, condition, preequilibration, measurements, java.util.List.of());
    }

    /** Copy with these doses. */
    public SimulationExperiment withDoses(java.util.List<DoseStep> newDoses) {
        return new SimulationExperiment(id, condition, preequilibration, measurements, newDoses);
    }

    @Override
    public int[] measurements() {
        return measurements.clone();
    }
}
