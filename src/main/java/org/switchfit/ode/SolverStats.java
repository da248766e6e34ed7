package org.switchfit.ode;

/**
 * Counters of one integration session.
 *
 * @param steps                 accepted steps
 * @param rejectedSteps         steps rejected by the error test or by Newton failures
 * @param rhsCalls              right-hand-side evaluations
 * @param jacobianCalls         Jacobian (df/dy) evaluations
 * @param factorizations        LU factorisations of the iteration matrix
 * @param newtonIterations      Newton iterations of the state corrector (linear solves with one right-hand side)
 * @param sensitivityIterations corrector iterations of the sensitivities (each solves every column once)
 * @param restarts              restarts after {@link IntegrationSession#reset} (events, discontinuities)
 */
public record SolverStats(long steps, long rejectedSteps, long rhsCalls, long jacobianCalls, long factorizations,
                          long newtonIterations, long sensitivityIterations, long restarts) {

    /** Counters of an integrator that does not count Newton iterations, sensitivity iterations or restarts. */
    public SolverStats(long steps, long rejectedSteps, long rhsCalls, long jacobianCalls, long factorizations) {
        this(steps, rejectedSteps, rhsCalls, jacobianCalls, factorizations, 0, 0, 0);
    }
}
