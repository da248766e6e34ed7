/**
 * Variable-order variable-step BDF in Nordsieck form with forward sensitivities and root finding.
 *
 * <p>Layering: part of {@code ode}; may import project packages {model, expr, linalg, util} and the parent
 * {@code org.switchfit.ode} interfaces.
 */
package org.switchfit.ode.bdf;
