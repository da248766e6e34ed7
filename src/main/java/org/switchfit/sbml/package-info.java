/**
 * Reads SBML (via JSBML) into the model package, keeping source locations.
 *
 * <p>Layering: may import project packages {model, expr, util} only.
 */
package org.switchfit.sbml;
