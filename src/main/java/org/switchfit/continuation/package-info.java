/**
 * Steady states, conservation laws, pseudo-arclength continuation, folds, Hopf points, fold sensitivities, fold
 * curves and cusps, switching thresholds and simulated hysteresis sweeps.
 *
 * <p>Entry points: {@link org.switchfit.continuation.ConservationLaws} (exact laws, {@code reduce}),
 * {@link org.switchfit.continuation.SteadyStateSolver}, {@link org.switchfit.continuation.PseudoArclength}
 * ({@code trace} gives a {@link org.switchfit.continuation.Branch}), {@link org.switchfit.continuation.Folds}
 * (sensitivities), {@link org.switchfit.continuation.Thresholds}, {@link org.switchfit.continuation.FoldCurves}
 * and {@link org.switchfit.continuation.BistableRegion}, {@link org.switchfit.continuation.HysteresisSweep}.
 * All linear solves go through the package-private {@code LinearSolver} (dense LU today, chosen in
 * {@code LinearSolvers}); eigenvalues and the SVD fallback use Hipparchus inside this package only.
 *
 * <p>Layering: may import project packages {ode, linalg, model, expr, util} only.
 */
package org.switchfit.continuation;
