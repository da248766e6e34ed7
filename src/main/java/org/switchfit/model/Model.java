package org.switchfit.model;

import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;

/**
 * Our immutable model: compartments, species, parameters, reactions, rules, initial assignments and events, with
 * identifiers resolved (function definitions inlined, local parameters renamed {@code reactionId.paramId}). All
 * mathematics uses {@link org.switchfit.expr.Op#SYMBOL} leaves naming model quantities; a symbol means the SBML
 * value of the quantity (species: concentration unless {@code hasOnlySubstanceUnits}; reaction: its rate; species
 * reference: its stoichiometry). Thread-safe.
 *
 * @param id                model id (may be empty)
 * @param source            file name for messages (may be null)
 * @param conversionFactor  model-wide species conversion factor parameter id, or null
 */
public record Model(String id, String source, List<Compartment> compartments, List<Species> species,
                    List<Parameter> parameters, List<Reaction> reactions, List<Rule> rules,
                    List<InitialAssignment> initialAssignments, List<Event> events, String conversionFactor) {

    public Model {
        compartments = List.copyOf(compartments);
        species = List.copyOf(species);
        parameters = List.copyOf(parameters);
        reactions = List.copyOf(reactions);
        rules = List.copyOf(rules);
        initialAssignments = List.copyOf(initialAssignments);
        events = List.copyOf(events);
    }

    /** Compartment by id, or null. */
    public Compartment compartment(String cid) {
        for (Compartment c : compartments) {
            if (c.id().equals(cid)) {
                return c;
            }
        }
        return null;
    }

    /** Species by id, or null. */
    public Species species(String sid) {
        for (Species s : species) {
            if (s.id().equals(sid)) {
                return s;
            }
        }
        return null;
    }

    /** Every species reference that has an id, by id. */
    public Map<String, SpeciesRef> speciesRefsById() {
        Map<String, SpeciesRef> m = new LinkedHashMap<>();
        for (Reaction r : reactions) {
            for (SpeciesRef s : r.reactants()) {
                if (s.id() != null) {
                    m.put(s.id(), s);
                }
            }
            for (SpeciesRef s : r.products()) {
                if (s.id() != null) {
                    m.put(s.id(), s);
                }
            }
        }
        return m;
    }
}
