/**
 * Joins data to a model: estimated parameters, scales, bounds, observables; PEtab import.
 *
 * <p>Layering: may import project packages {data, model, expr, sbml, util} only.
 */
package org.switchfit.problem;
