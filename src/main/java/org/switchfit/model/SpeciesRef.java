package org.switchfit.model;

import org.switchfit.expr.Expr;

/**
 * A reactant or product of a reaction.
 *
 * @param id                the reference's own id (SBML L2V2+), usable as a symbol for its stoichiometry, or null
 * @param stoichiometry     stoichiometry value (NaN when unset)
 * @param stoichiometryMath expression for the stoichiometry (SBML L2 stoichiometryMath), or null
 * @param constant          whether the stoichiometry is constant
 */
public record SpeciesRef(String species, String id, double stoichiometry, Expr stoichiometryMath,
                         boolean constant) {
}
