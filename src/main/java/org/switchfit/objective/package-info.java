/**
 * Residuals, Jacobians and negative log-likelihoods from simulations, sensitivities and fold positions.
 *
 * <p>Layering: may import project packages {problem, ode, continuation, data, model, expr, util} only.
 */
package org.switchfit.objective;
