/**
 * Joins data to a model: estimated parameters, scales, bounds, observables; PEtab import.
 *
 * <p>Layering: may import project packages {data, model, expr, sbml, ode, linalg, util} only (ode: it holds the compiled model).
 */
package org.switchfit.problem;
