package org.switchfit.model;

import java.util.List;
import org.switchfit.expr.Expr;

/**
 * A reaction. The kinetic law (null when absent, meaning rate 0) uses symbols; local parameters appear as symbols
 * {@code reactionId.paramId} and are listed in {@code localParameters}.
 */
public record Reaction(String id, List<SpeciesRef> reactants, List<SpeciesRef> products, Expr kineticLaw,
                       List<Parameter> localParameters, boolean reversible, boolean fast) {
    public Reaction {
        reactants = List.copyOf(reactants);
        products = List.copyOf(products);
        localParameters = List.copyOf(localParameters);
    }
}
