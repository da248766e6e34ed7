/**
 * Compiled ODE systems, stiff and non-stiff integrators, forward sensitivities, events, simulation.
 *
 * <p>Layering: may import project packages {model, expr, linalg, util} only.
 */
package org.switchfit.ode;
