package org.switchfit.ode;

/**
 * The fast reactions of a model could not be brought to rapid equilibrium (a rate law that does not vanish along its
 * reaction, or not a number). Names the fast reaction whose rate stayed largest; like any
 * {@link IntegrationException} it fails one simulation, not the program.
 */
public class FastEquilibriumException extends IntegrationException {
    private static final long serialVersionUID = 1L;

    private final String reaction;

    public FastEquilibriumException(double time, String reaction, String reason) {
        super(time, "fast reaction '" + reaction + "': " + reason);
        this.reaction = reaction;
    }

    /** Id of the fast reaction whose rate stayed largest. */
    public String reaction() {
        return reaction;
    }
}
