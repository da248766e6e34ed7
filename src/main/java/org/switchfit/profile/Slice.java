package org.switchfit.profile;

/**
 * The constrained sub-problem of a profile: minimise the NLL with the profiled quantity held at z. Package-
 * private; one instance per traced profile, confined to one thread.
 */
interface Slice {

    /**
     * @param z    value of the profiled quantity
     * @param warm warm start θ (not modified)
     * @return the re-optimised point
     * @throws org.switchfit.objective.ObjectiveException when the re-optimisation cannot evaluate the objective
     */
    ProfilePoint solve(double z, double[] warm);

    /** Smallest admissible z (may be -∞). */
    double lowerLimit();

    /** Largest admissible z (may be +∞). */
    double upperLimit();

    /** Number of constrained solves so far. */
    int solves();
}
