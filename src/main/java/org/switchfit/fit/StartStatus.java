package org.switchfit.fit;

/** Outcome class of one multistart start. */
public enum StartStatus {
    /** The local optimizer converged ({@link Termination#converged()}). */
    CONVERGED,
    /** The local optimizer stopped on a limit (iterations, evaluations, no progress); θ is its last point. */
    NOT_CONVERGED,
    /** The start could not be evaluated (objective exception, non-finite values); no θ. */
    FAILED
}
