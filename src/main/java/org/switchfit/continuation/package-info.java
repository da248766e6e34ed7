/**
 * Steady states, conservation laws, pseudo-arclength continuation, folds and their sensitivities.
 *
 * <p>Layering: may import project packages {ode, linalg, model, util} only.
 */
package org.switchfit.continuation;
