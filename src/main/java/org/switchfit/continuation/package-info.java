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
 * <p>Typical use for a measured switch-on threshold of a model with conserved moieties (N the stoichiometry
 * matrix from the model layer, {@code control} the index of the input parameter, {@code c} the readout weights on
 * the reduced states):
 * <pre>{@code
 * ReducedSystem red = ConservationLaws.of(N).reduce(sys);          // once per model
 * double[] q = red.parameters(p, y0);                               // rate parameters + totals from y0
 * Threshold on = new Thresholds(ContinuationSettings.of(lo, hi))
 *         .switchOn(red, red.reducedState(y0), q, control, c);      // value + gradient over q
 * }</pre>
 * The gradient covers the totals too ({@code q[red.totalIndex(k)]}); chain it to initial concentrations with
 * {@code ∂T_k/∂y0_i = laws.coefficients(k)[i]}.
 *
 * <p>Layering: may import project packages {ode, linalg, model, expr, util} only.
 */
package org.switchfit.continuation;
