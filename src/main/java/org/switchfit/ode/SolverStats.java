package org.switchfit.ode;

/** Counters of one integration session. */
public record SolverStats(long steps, long rejectedSteps, long rhsCalls, long jacobianCalls, long factorizations) {
}
