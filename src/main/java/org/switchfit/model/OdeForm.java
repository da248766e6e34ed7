package org.switchfit.model;

import java.util.ArrayDeque;
import java.util.ArrayList;
import java.util.Deque;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.switchfit.expr.Block;
import org.switchfit.expr.Derivative;
import org.switchfit.expr.Expr;
import org.switchfit.expr.Op;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UnsupportedConstructException;
import org.switchfit.util.UserInputException;

/**
 * The ODE form of a {@link Model} following SBML Level 3 Version 2 semantics (section 4 of the specification).
 *
 * <p><b>States</b> {@code y}: every species without an assignment rule (its amount; its concentration when it has
 * a rate rule and is not {@code hasOnlySubstanceUnits}), and every compartment, parameter or species reference
 * that has a rate rule or is the target of an event assignment (zero derivative unless a rate rule).
 *
 * <p><b>Parameters</b> {@code p}: one entry per quantity not defined by an assignment rule, holding its declared
 * value, in the order compartments, species, global parameters, species references with ids, local parameters
 * ({@code reactionId.paramId}). Species entries hold the declared initial amount, or the declared initial
 * concentration when {@link #speciesDeclaredAsConcentration} says so. Entries for quantities that are states only
 * seed the initial values; the others are used by the right-hand side.
 *
 * <p><b>Runtime locals</b>: assignment rules (and solved algebraic rules), species concentrations of amount
 * states, reaction rates and rates of change ({@code rateOf}) in dependency order; cycles are reported.
 *
 * <p><b>Initial block</b>: from declared values p, computes {@code y0} followed by the effective parameters
 * (initial assignments applied), evaluating initial assignments, assignment rules and declared values in
 * dependency order at the start time.
 */
public final class OdeForm {
    /** Physical meaning of a state. */
    public enum StateKind { SPECIES_AMOUNT, SPECIES_CONCENTRATION, COMPARTMENT, PARAMETER, SPECIES_REFERENCE }

    /** Avogadro's number as fixed by SBML Level 3 Version 1 (6.02214179e23). */
    public static final double AVOGADRO = 6.02214179e23;

    private enum QType { COMPARTMENT, SPECIES, PARAMETER, SPECIES_REF, LOCAL_PARAMETER, REACTION }

    private final Model model;
    private final String file;
    private final Map<String, QType> types = new LinkedHashMap<>();
    private final Map<String, Double> declared = new HashMap<>();
    private final Map<String, Boolean> constantFlag = new HashMap<>();
    private final Map<String, Expr> assignRules = new LinkedHashMap<>();
    private final Map<String, Expr> rateRules = new LinkedHashMap<>();
    private final Set<String> eventTargets = new HashSet<>();
    private final Set<String> reactionChanged = new HashSet<>();

    private final List<String> stateIds = new ArrayList<>();
    private final List<StateKind> stateKinds = new ArrayList<>();
    private final Map<String, Integer> stateIndex = new HashMap<>();
    private final List<String> paramIds = new ArrayList<>();
    private final Map<String, Integer> paramIndex = new HashMap<>();
    private double[] paramValues;
    private final Set<String> speciesConc = new HashSet<>();

    /** Runtime definitions in symbol form, keyed by local name. */
    private final Map<String, Expr> defs = new LinkedHashMap<>();
    private final Map<String, Integer> localIndex = new HashMap<>();
    private final Set<String> rateInProgress = new HashSet<>();
    private Block runtime;
    private Block init;
    private final List<BoundEvent> events = new ArrayList<>();
    private final Map<String, Expr> derivSymbolic = new HashMap<>();
    private final List<Event> resolvedEvents = new ArrayList<>();
    private final List<Expr> delaySlots = new ArrayList<>();
    private final List<Expr> delayLags = new ArrayList<>();
    /** Fast reactions (rapid equilibrium) in model order, their constraints and amount directions. */
    private final List<String> fastIds = new ArrayList<>();
    private final List<Expr> fastSymbolic = new ArrayList<>();
    private final List<Expr> fastDirectionSymbolic = new ArrayList<>();
    private final List<Expr> fastConstraints = new ArrayList<>();
    private final List<Expr> fastDirections = new ArrayList<>();

    private OdeForm(Model model) {
        this.model = model;
        this.file = model.source();
    }

    /**
     * Builds the ODE form.
     *
     * @throws UnsupportedConstructException for delays, unsolvable algebraic rules, more than three coupled fast
     *                                      reactions
     * @throws UserInputException for undefined ids, cyclic definitions and similar model errors
     */
    public static OdeForm of(Model model) {
        OdeForm f = new OdeForm(model);
        f.build();
        return f;
    }

    // ------------------------------------------------------------------ public results

    public Model model() {
        return model;
    }

    public int stateCount() {
        return stateIds.size();
    }

    public List<String> stateIds() {
        return List.copyOf(stateIds);
    }

    public StateKind stateKind(int i) {
        return stateKinds.get(i);
    }

    /** State index of a quantity id, or -1. */
    public int stateIndex(String id) {
        return stateIndex.getOrDefault(id, -1);
    }

    public int parameterCount() {
        return paramIds.size();
    }

    /** Parameter names in p order. */
    public List<String> parameterIds() {
        return List.copyOf(paramIds);
    }

    /** Parameter index by name, or -1. */
    public int parameterIndex(String id) {
        return paramIndex.getOrDefault(id, -1);
    }

    /** Declared parameter values (copy). */
    public double[] parameterValues() {
        return paramValues.clone();
    }

    /** True when the species' p entry holds a declared initial concentration rather than an amount. */
    public boolean speciesDeclaredAsConcentration(String speciesId) {
        return speciesConc.contains(speciesId);
    }

    /** Runtime block: locals in dependency order, outputs dy/dt (length n). Uses y and effective p. */
    public Block runtime() {
        return runtime;
    }

    /** Initial block: reads declared p (y unused), outputs y0 (n entries) then effective p (m entries). */
    public Block initial() {
        return init;
    }

    /** Bound expressions x of the delay nodes, by slot (the runtime uses {@code DELAY(slot, lag)} nodes). */
    public List<Expr> delaySlots() {
        return List.copyOf(delaySlots);
    }

    /** Bound lag expressions of the delay nodes, by slot. */
    public List<Expr> delayLags() {
        return List.copyOf(delayLags);
    }

    /** Ids of the fast reactions (rapid equilibrium), in model order. */
    public List<String> fastReactionIds() {
        return List.copyOf(fastIds);
    }

    /**
     * Equilibrium constraints {@code g_j(t, y, p) = 0}, one per fast reaction (its kinetic law, runtime form); the
     * right-hand side keeps them constant, {@link org.switchfit.ode.CompiledModel} brings the state onto them.
     */
    public List<Expr> fastConstraints() {
        return List.copyOf(fastConstraints);
    }

    /**
     * Change of each state per unit extent of each fast reaction, flat {@code [i * k + j]} for state i and fast
     * reaction j (stoichiometry times conversion factor; 0 for states no fast reaction changes).
     */
    public List<Expr> fastDirections() {
        return List.copyOf(fastDirections);
    }

    public List<BoundEvent> events() {
        return List.copyOf(events);
    }

    /** All quantity ids (compartments, species, parameters, species references, local parameters, reactions). */
    public Set<String> quantityIds() {
        return java.util.Collections.unmodifiableSet(types.keySet());
    }

    /**
     * Runtime expression of the SBML value of a quantity (species: concentration unless hasOnlySubstanceUnits;
     * reaction: rate), using y, p and runtime locals.
     *
     * @throws UserInputException for unknown ids
     */
    public Expr symbolValue(String id) {
        return bind(Expr.symbol(id), "output '" + id + "'");
    }

    /** Runtime expression of a species amount. */
    public Expr amount(String speciesId) {
        Species s = requireSpecies(speciesId);
        Expr v = symbolValue(speciesId);
        return s.hasOnlySubstanceUnits() ? v : Expr.mul(v, symbolValue(s.compartment()));
    }

    /** Runtime expression of a species concentration. */
    public Expr concentration(String speciesId) {
        Species s = requireSpecies(speciesId);
        Expr v = symbolValue(speciesId);
        return s.hasOnlySubstanceUnits() ? Expr.div(v, symbolValue(s.compartment())) : v;
    }

    /** True when id names a species. */
    public boolean isSpecies(String id) {
        return types.get(id) == QType.SPECIES;
    }

    private Species requireSpecies(String id) {
        Species s = model.species(id);
        if (s == null) {
            throw new UserInputException(SourceLocation.ofElement(file, id), "is not a species of the model; "
                    + "use a species id");
        }
        return s;
    }

    // ------------------------------------------------------------------ construction

    private void build() {
        collectQuantities();
        // event targets first: an algebraic rule is solved for a quantity nothing else sets (collectRules)
        for (Event e : model.events()) {
            for (Event.Assignment a : e.assignments()) {
                requireKnown(a.variable(), "event '" + e.id() + "'");
                if (types.get(a.variable()) == QType.REACTION) {
                    throw new UserInputException(SourceLocation.ofElement(file, e.id()),
                            "assigns to reaction '" + a.variable() + "'; event assignments must target quantities");
                }
                eventTargets.add(a.variable());
            }
        }
        collectRules();
        for (Reaction r : model.reactions()) {
            for (SpeciesRef s : refs(r)) {
                requireKnown(s.species(), "reaction '" + r.id() + "'");
                Species sp = model.species(s.species());
                if (!sp.boundaryCondition() && !sp.constant()) {
                    reactionChanged.add(sp.id());
                }
            }
        }
        solveAlgebraicRules();
        classify();
        buildRuntime();
        buildInitial();
        bindEvents();
    }

    private static List<SpeciesRef> refs(Reaction r) {
        List<SpeciesRef> l = new ArrayList<>(r.reactants());
        l.addAll(r.products());
        return l;
    }

    private void addQuantity(String id, QType t, double value, boolean constant) {
        if (types.containsKey(id)) {
            throw new UserInputException(SourceLocation.ofElement(file, id), "id is defined twice; rename one");
        }
        types.put(id, t);
        declared.put(id, value);
        constantFlag.put(id, constant);
    }

    private void collectQuantities() {
        for (Compartment c : model.compartments()) {
            addQuantity(c.id(), QType.COMPARTMENT, c.size(), c.constant());
        }
        for (Species s : model.species()) {
            if (model.compartment(s.compartment()) == null) {
                throw new UserInputException(SourceLocation.ofElement(file, s.id()),
                        "species names compartment '" + s.compartment() + "', which is not defined; define it");
            }
            double v = s.initialAmount();
            if (Double.isNaN(v) && !Double.isNaN(s.initialConcentration())) {
                v = s.initialConcentration();
                speciesConc.add(s.id());
            }
            addQuantity(s.id(), QType.SPECIES, v, s.constant());
        }
        for (Parameter p : model.parameters()) {
            addQuantity(p.id(), QType.PARAMETER, p.value(), p.constant());
        }
        for (Reaction r : model.reactions()) {
            for (SpeciesRef s : refs(r)) {
                if (s.id() != null) {
                    double st = s.stoichiometryMath() != null ? Double.NaN
                            : Double.isNaN(s.stoichiometry()) ? 1.0 : s.stoichiometry();
                    addQuantity(s.id(), QType.SPECIES_REF, st, s.constant());
                }
            }
        }
        for (Reaction r : model.reactions()) {
            addQuantity(r.id(), QType.REACTION, Double.NaN, false);
            for (Parameter p : r.localParameters()) {
                types.put(p.id(), QType.LOCAL_PARAMETER);
                declared.put(p.id(), p.value());
                constantFlag.put(p.id(), true);
            }
        }
    }

    private void requireKnown(String id, String where) {
        if (!types.containsKey(id)) {
            throw new UserInputException(SourceLocation.ofElement(file, id), "is used by " + where
                    + " but not defined in the model; define it or correct the id");
        }
    }

    private void collectRules() {
        for (Rule r : model.rules()) {
            if (r.kind() == Rule.Kind.ALGEBRAIC) {
                continue;
            }
            requireKnown(r.variable(), "a rule");
            if (assignRules.containsKey(r.variable()) || rateRules.containsKey(r.variable())) {
                throw new UserInputException(SourceLocation.ofElement(file, r.variable()),
                        "is the target of more than one rule; keep one");
            }
            if (r.kind() == Rule.Kind.ASSIGNMENT) {
                assignRules.put(r.variable(), r.math());
            } else {
                rateRules.put(r.variable(), r.math());
            }
        }
        for (InitialAssignment ia : model.initialAssignments()) {
            requireKnown(ia.symbol(), "an initial assignment");
        }
    }

    /** Inlines assignment rules recursively (used to analyse algebraic rules). */
    private Expr inlineAssignments(Expr e, int depth) {
        if (depth > 50) {
            return e;
        }
        return e.mapLeaves(x -> {
            if (x.op() == Op.SYMBOL && assignRules.containsKey(x.name())) {
                return inlineAssignments(assignRules.get(x.name()), depth + 1);
            }
            return x;
        });
    }

    private void solveAlgebraicRules() {
        List<Rule> pending = new ArrayList<>();
        for (Rule r : model.rules()) {
            if (r.kind() == Rule.Kind.ALGEBRAIC) {
                pending.add(r);
            }
        }
        boolean greedy = false;
        // rules solved by choice among several undetermined quantities: rule, the quantity chosen, the others
        List<Object[]> choices = new ArrayList<>();
        while (!pending.isEmpty()) {
            boolean progress = false;
            for (int i = 0; i < pending.size() && !progress; i++) {
                Rule r = pending.get(i);
                Expr f = inlineAssignments(r.math(), 0);
                List<String> cands = new ArrayList<>();
                f.forEach(x -> {
                    if (x.op() == Op.SYMBOL && isAlgebraicCandidate(x.name()) && !cands.contains(x.name())) {
                        cands.add(x.name());
                    }
                });
                if (cands.isEmpty() || (cands.size() > 1 && !greedy)) {
                    continue;
                }
                // prefer quantities the modeller did not mark as externally set (boundary species last)
                cands.sort(java.util.Comparator.comparing(c -> types.get(c) == QType.SPECIES
                        && model.species(c).boundaryCondition()));
                for (String c : cands) {
                    Expr var = Expr.symbol(c);
                    Expr a = Derivative.of(f, var, null);
                    if (a.isConst(0.0) || a.references(Op.SYMBOL, -1, c)) {
                        continue;
                    }
                    Expr b = f.mapLeaves(x -> x.sameVariable(var) ? Expr.ZERO : x);
                    if (cands.size() > 1) {
                        choices.add(new Object[] {r, c, cands});
                    }
                    assignRules.put(c, Expr.neg(Expr.div(b, a)));
                    pending.remove(i);
                    progress = true;
                    greedy = false;
                    break;
                }
            }
            if (!progress) {
                if (greedy) {
                    break;
                }
                greedy = true;
            }
        }
        if (!pending.isEmpty()) {
            Rule r = pending.get(0);
            throw new UnsupportedConstructException(SourceLocation.ofElement(file,
                    r.elementId() != null ? r.elementId() : "algebraic rule"),
                    "an algebraic rule (0 = " + r.math() + ") that is not linear in exactly one undetermined "
                            + "quantity", "rewrite it as an assignment rule");
        }
        // SBML: the algebraic rules must determine their quantities uniquely (the model is neither over- nor
        // underdetermined; from memory). A choice that leaves another quantity of the same rule determined by
        // nothing means two unknowns share one equation (0 = u + v - 1): refuse rather than pick one. A boundary
        // species left over is fine: the SBML Test Suite (case 01787) solves for the other species then.
        for (Object[] ch : choices) {
            Rule r = (Rule) ch[0];
            @SuppressWarnings("unchecked")
            List<String> cands = (List<String>) ch[2];
            for (String other : cands) {
                if (!other.equals(ch[1]) && isAlgebraicCandidate(other) && isBoundary(other) == isBoundary(
                        (String) ch[1])) {
                    throw new UserInputException(SourceLocation.ofElement(file, r.elementId() != null
                            ? r.elementId() : "algebraic rule"), "the algebraic rule 0 = " + r.math() + " leaves "
                            + "both '" + ch[1] + "' and '" + other + "' undetermined (one equation, two unknowns; "
                            + "SBML requires the model not to be underdetermined); give one of them a rule or "
                            + "declare it constant");
                }
            }
        }
    }

    private boolean isBoundary(String id) {
        return types.get(id) == QType.SPECIES && model.species(id).boundaryCondition();
    }

    private boolean isAlgebraicCandidate(String id) {
        QType t = types.get(id);
        if (t == null || t == QType.REACTION || t == QType.LOCAL_PARAMETER) {
            return false;
        }
        if (Boolean.TRUE.equals(constantFlag.get(id))) {
            return false;
        }
        return !assignRules.containsKey(id) && !rateRules.containsKey(id) && !reactionChanged.contains(id)
                && !eventTargets.contains(id);
    }

    private void classify() {
        List<String> plist = new ArrayList<>();
        for (Map.Entry<String, QType> e : types.entrySet()) {
            String id = e.getKey();
            QType t = e.getValue();
            if (t == QType.REACTION) {
                continue;
            }
            if (assignRules.containsKey(id)) {
                if (reactionChanged.contains(id)) {
                    throw new UserInputException(SourceLocation.ofElement(file, id), "species is changed by "
                            + "reactions and by an assignment rule; set boundaryCondition=\"true\" or drop one");
                }
                if (eventTargets.contains(id)) {
                    throw new UserInputException(SourceLocation.ofElement(file, id), "is set by an assignment rule "
                            + "and by an event; drop one of them");
                }
                continue;
            }
            plist.add(id);
            boolean isState = t == QType.SPECIES || rateRules.containsKey(id) || eventTargets.contains(id);
            if (isState) {
                int i = stateIds.size();
                stateIds.add(id);
                stateIndex.put(id, i);
                StateKind k;
                switch (t) {
                    case SPECIES: {
                        Species s = model.species(id);
                        k = rateRules.containsKey(id) && !s.hasOnlySubstanceUnits()
                                ? StateKind.SPECIES_CONCENTRATION : StateKind.SPECIES_AMOUNT;
                        if (rateRules.containsKey(id) && reactionChanged.contains(id)) {
                            throw new UserInputException(SourceLocation.ofElement(file, id), "species is changed by "
                                    + "reactions and by a rate rule; set boundaryCondition=\"true\" or drop one");
                        }
                        break;
                    }
                    case COMPARTMENT:
                        k = StateKind.COMPARTMENT;
                        break;
                    case SPECIES_REF:
                        k = StateKind.SPECIES_REFERENCE;
                        break;
                    default:
                        k = StateKind.PARAMETER;
                }
                stateKinds.add(k);
            }
        }
        // p order: compartments, species, parameters, species refs, local parameters (declaration order within)
        for (QType t : new QType[] {QType.COMPARTMENT, QType.SPECIES, QType.PARAMETER, QType.SPECIES_REF,
            QType.LOCAL_PARAMETER}) {
            for (String id : plist) {
                if (types.get(id) == t) {
                    paramIndex.put(id, paramIds.size());
                    paramIds.add(id);
                }
            }
        }
        paramValues = new double[paramIds.size()];
        for (int k = 0; k < paramIds.size(); k++) {
            paramValues[k] = declared.get(paramIds.get(k));
        }
    }

    private boolean isAmountStateWithConcSymbol(String id) {
        Integer i = stateIndex.get(id);
        if (i == null || types.get(id) != QType.SPECIES) {
            return false;
        }
        return stateKinds.get(i) == StateKind.SPECIES_AMOUNT && !model.species(id).hasOnlySubstanceUnits();
    }

    // ------------------------------------------------------------------ runtime

    private Expr stoichiometry(Reaction r, SpeciesRef s) {
        if (s.stoichiometryMath() != null) {
            return s.stoichiometryMath();
        }
        if (s.id() != null) {
            return Expr.symbol(s.id());
        }
        return Expr.constant(Double.isNaN(s.stoichiometry()) ? 1.0 : s.stoichiometry());
    }

    private void buildRuntime() {
        for (Map.Entry<String, Expr> e : assignRules.entrySet()) {
            defs.put(e.getKey(), e.getValue());
        }
        for (String id : stateIds) {
            if (isAmountStateWithConcSymbol(id)) {
                defs.put(id, Expr.div(Expr.state(stateIndex.get(id), id + " amount"),
                        Expr.symbol(model.species(id).compartment())));
            }
        }
        for (Reaction r : model.reactions()) {
            defs.put(r.id(), r.kineticLaw() == null ? Expr.ZERO : r.kineticLaw());
        }
        // derivatives in symbol form
        Map<String, List<Expr>> speciesTerms = new HashMap<>();
        for (Reaction r : model.reactions()) {
            for (int side = 0; side < 2; side++) {
                for (SpeciesRef s : side == 0 ? r.reactants() : r.products()) {
                    if (!reactionChanged.contains(s.species())) {
                        continue;
                    }
                    Expr st = stoichiometry(r, s);
                    Expr term = Expr.mul(st, Expr.symbol(r.id()));
                    speciesTerms.computeIfAbsent(s.species(), k -> new ArrayList<>())
                            .add(side == 0 ? Expr.neg(term) : term);
                }
            }
        }
        for (int i = 0; i < stateIds.size(); i++) {
            String id = stateIds.get(i);
            Expr d;
            if (rateRules.containsKey(id)) {
                d = rateRules.get(id);
            } else if (speciesTerms.containsKey(id)) {
                d = Expr.add(speciesTerms.get(id));
                Species s = model.species(id);
                String cf = s.conversionFactor() != null ? s.conversionFactor() : model.conversionFactor();
                if (cf != null) {
                    requireKnown(cf, "species '" + id + "' as conversion factor");
                    d = Expr.mul(Expr.symbol(cf), d);
                }
            } else {
                d = Expr.ZERO;
            }
            derivSymbolic.put(id, d);
        }
        buildFastEquilibrium();
        // resolve rateOf everywhere
        for (String k : new ArrayList<>(defs.keySet())) {
            defs.put(k, resolveRateOf(defs.get(k)));
        }
        List<Expr> derivs = new ArrayList<>();
        for (String id : stateIds) {
            derivs.add(resolveRateOf(derivSymbolic.get(id)));
        }
        for (Event e : model.events()) {
            List<Event.Assignment> as = new ArrayList<>();
            for (Event.Assignment a : e.assignments()) {
                as.add(new Event.Assignment(a.variable(), resolveRateOf(a.math())));
            }
            resolvedEvents.add(new Event(e.id(), resolveRateOf(e.trigger()), e.initialValue(), e.persistent(),
                    e.delay() == null ? null : resolveRateOf(e.delay()),
                    e.priority() == null ? null : resolveRateOf(e.priority()), e.useValuesFromTriggerTime(), as));
        }
        // order definitions
        List<String> order = topoSort(defs, "assignment rules and reaction rates");
        List<String> names = new ArrayList<>();
        List<Expr> bound = new ArrayList<>();
        for (String k : order) {
            Expr b = bind(defs.get(k), "'" + k + "'");
            localIndex.put(k, names.size());
            names.add(k);
            bound.add(b);
        }
        List<Expr> outs = new ArrayList<>();
        for (int i = 0; i < derivs.size(); i++) {
            outs.add(bind(derivs.get(i), "the rate of change of '" + stateIds.get(i) + "'"));
        }
        runtime = new Block(names, bound, outs);
        for (int j = 0; j < fastIds.size(); j++) {
            String ctx = "fast reaction '" + fastIds.get(j) + "'";
            fastConstraints.add(bind(resolveRateOf(fastSymbolic.get(j)), ctx));
        }
        for (Expr d : fastDirectionSymbolic) {
            fastDirections.add(bind(resolveRateOf(d), "fast reaction stoichiometry"));
        }
    }

    /**
     * Rapid equilibrium of the fast reactions (SBML Level 2 and Level 3 Version 1: a fast reaction is at
     * equilibrium on the time scale of the others). The state stays on the manifold {@code g(y) = 0} of the fast
     * rate laws g: the fluxes w of the fast reactions are not their laws but the solution of the differentiated
     * constraints {@code dg/dt = ∂g/∂t + Σ_s ∂g/∂s · ds/dt = 0}, linear in w because ds/dt = (slow terms) + D w
     * (index reduction of the differential-algebraic system). Each group of coupled fast reactions (at most three)
     * is solved by Cramer's rule; a singular group (a law that does not depend on its own extent, such as a rate
     * constant of 0) gets w = 0. The flux of a fast reaction is {@code w + g}: on the manifold g = 0, so the
     * trajectory is the rapid-equilibrium one; off it (integration drift) dg/dt = B g with B = ∂g/∂ξ, stable where
     * the fast subsystem's equilibrium is, so drift decays on the fast reactions' own time scale. The steady states
     * of this right-hand side are exactly those of the rapid-equilibrium system (f = 0 and g = 0 when B is
     * regular), and its Jacobian there has the reduced system's eigenvalues plus those of B, so continuation,
     * folds and stability need nothing special. The manifold itself is reached by a projection at the start and
     * after events and switches ({@link org.switchfit.ode.CompiledModel#equilibrateFast}).
     */
    private void buildFastEquilibrium() {
        List<Reaction> fast = new ArrayList<>();
        for (Reaction r : model.reactions()) {
            if (r.fast()) {
                fast.add(r);
            }
        }
        int k = fast.size();
        if (k == 0) {
            return;
        }
        Expr[] flux = new Expr[k];
        for (int j = 0; j < k; j++) {
            fastIds.add(fast.get(j).id());
            flux[j] = Expr.symbol(fast.get(j).id());
        }
        Expr[][] coupling = new Expr[k][k];
        Expr[] rest = new Expr[k];
        for (int j = 0; j < k; j++) {
            Reaction r = fast.get(j);
            Expr g = inlineAssignments(r.kineticLaw() == null ? Expr.ZERO : r.kineticLaw(), 0);
            if (g.contains(x -> x.op() == Op.RATEOF || x.op() == Op.DELAY
                    || x.op() == Op.SYMBOL && fastIds.contains(x.name()))) {
                throw new UnsupportedConstructException(SourceLocation.ofElement(file, r.id()),
                        "a fast reaction whose rate uses rateOf, delay or the rate of a fast reaction",
                        "write its rate law in the model's quantities");
            }
            fastSymbolic.add(g);
            Expr total = timeDerivative(g, this::symbolRate);
            for (int l = 0; l < k; l++) {
                coupling[j][l] = Derivative.of(total, flux[l], null);
            }
            rest[j] = total.mapLeaves(x -> x.op() == Op.SYMBOL && fastIds.contains(x.name()) ? Expr.ZERO : x);
        }
        for (String id : stateIds) {
            Expr d = derivSymbolic.get(id);
            for (int l = 0; l < k; l++) {
                fastDirectionSymbolic.add(Derivative.of(d, flux[l], null));
            }
        }
        // groups of coupled fast reactions (connected through non-zero coupling entries)
        int[] group = new int[k];
        for (int j = 0; j < k; j++) {
            group[j] = j;
        }
        for (int j = 0; j < k; j++) {
            for (int l = 0; l < k; l++) {
                if (l != j && !coupling[j][l].isConst(0.0)) {
                    int a = root(group, j);
                    int b = root(group, l);
                    group[Math.max(a, b)] = Math.min(a, b);
                }
            }
        }
        for (int g0 = 0; g0 < k; g0++) {
            if (root(group, g0) != g0) {
                continue;
            }
            List<Integer> idx = new ArrayList<>();
            for (int j = 0; j < k; j++) {
                if (root(group, j) == g0) {
                    idx.add(j);
                }
            }
            if (idx.size() > 3) {
                throw new UnsupportedConstructException(SourceLocation.ofElement(file, fastIds.get(g0)),
                        "more than three coupled fast reactions (" + idx.size() + ")",
                        "model some of them as ordinary reactions with large rate constants");
            }
            int q = idx.size();
            Expr[][] c = new Expr[q][q];
            Expr[] rhs = new Expr[q];
            for (int a = 0; a < q; a++) {
                rhs[a] = Expr.neg(rest[idx.get(a)]);
                for (int b = 0; b < q; b++) {
                    c[a][b] = coupling[idx.get(a)][idx.get(b)];
                }
            }
            Expr det = determinant(c);
            for (int b = 0; b < q; b++) {
                Expr[][] cb = new Expr[q][];
                for (int a = 0; a < q; a++) {
                    cb[a] = c[a].clone();
                    cb[a][b] = rhs[a];
                }
                // no piecewise guard: its condition det == 0 would be a right-hand-side switch
                Expr w = det.isConst() ? (det.isConst(0.0) ? Expr.ZERO : Expr.div(determinant(cb), det))
                        : Expr.call(Op.DIV_OR_ZERO, determinant(cb), det);
                // flux = w + law: w keeps the equilibrium, the law (0 on it) pulls a state that is off it back
                Reaction r = fast.get(idx.get(b));
                defs.put(r.id(), Expr.add(w, r.kineticLaw() == null ? Expr.ZERO : r.kineticLaw()));
            }
        }
    }

    /** dE/dt by the chain rule: ∂E/∂t plus ∂E/∂s times the given rate of each symbol s in E. */
    private static Expr timeDerivative(Expr e, java.util.function.Function<String, Expr> rate) {
        Set<String> syms = new LinkedHashSet<>();
        e.forEach(x -> {
            if (x.op() == Op.SYMBOL) {
                syms.add(x.name());
            }
        });
        List<Expr> terms = new ArrayList<>();
        terms.add(Derivative.of(e, Expr.TIME, null));
        for (String sym : syms) {
            Expr pd = Derivative.of(e, Expr.symbol(sym), null);
            if (!pd.isConst(0.0)) {
                terms.add(Expr.mul(pd, rate.apply(sym)));
            }
        }
        return Expr.add(terms);
    }

    private static int root(int[] parent, int j) {
        int r = j;
        while (parent[r] != r) {
            r = parent[r];
        }
        return r;
    }

    /** Determinant of a 1x1 to 3x3 matrix of expressions (cofactor expansion along the first row). */
    private static Expr determinant(Expr[][] c) {
        int q = c.length;
        if (q == 1) {
            return c[0][0];
        }
        List<Expr> terms = new ArrayList<>();
        for (int b = 0; b < q; b++) {
            Expr[][] minor = new Expr[q - 1][q - 1];
            for (int a = 1; a < q; a++) {
                for (int cc = 0, mc = 0; cc < q; cc++) {
                    if (cc != b) {
                        minor[a - 1][mc++] = c[a][cc];
                    }
                }
            }
            Expr t = Expr.mul(c[0][b], determinant(minor));
            terms.add(b % 2 == 0 ? t : Expr.neg(t));
        }
        return Expr.add(terms);
    }

    /**
     * Time derivative of the SBML value of a quantity in symbol form, with the fluxes of fast reactions left as
     * their reaction symbols (used to differentiate the equilibrium constraints).
     */
    private Expr symbolRate(String id) {
        Integer i = stateIndex.get(id);
        if (i == null) {
            return rateOf(id);
        }
        // a rate rule may use rateOf: resolved to its symbol, which Derivative treats as independent
        Expr d = resolveRateOf(derivSymbolic.get(id));
        if (isAmountStateWithConcSymbol(id)) {
            String c = model.species(id).compartment();
            Expr vol = Expr.symbol(c);
            return Expr.sub(Expr.div(d, vol), Expr.div(Expr.mul(Expr.symbol(id), rateOf(c)), vol));
        }
        return d;
    }

    private Expr resolveRateOf(Expr e) {
        if (!e.contains(x -> x.op() == Op.RATEOF)) {
            return e;
        }
        return e.rewrite(x -> {
            if (x.op() != Op.RATEOF) {
                return null;
            }
            Expr a = x.arg(0);
            if (a.op() != Op.SYMBOL) {
                throw new UnsupportedConstructException(SourceLocation.ofElement(file, String.valueOf(a)),
                        "rateOf applied to an expression", "apply rateOf to a single quantity");
            }
            return rateOf(a.name());
        });
    }

    private Expr rateOf(String id) {
        requireKnown(id, "rateOf");
        String key = "rateOf:" + id;
        if (defs.containsKey(key)) {
            return Expr.symbol(key);
        }
        if (!rateInProgress.add(key)) {
            throw new UserInputException(SourceLocation.ofElement(file, id), "rateOf(" + id + ") depends on "
                    + "itself; break the cycle");
        }
        Expr d;
        Integer i = stateIndex.get(id);
        if (i != null) {
            Expr dd = resolveRateOf(derivSymbolic.get(id));
            if (isAmountStateWithConcSymbol(id)) {
                String c = model.species(id).compartment();
                Expr vol = Expr.symbol(c);
                Expr dv = rateOf(c);
                d = Expr.sub(Expr.div(dd, vol), Expr.div(Expr.mul(Expr.state(i, id + " amount"), dv),
                        Expr.pow(vol, Expr.constant(2.0))));
            } else {
                d = dd;
            }
        } else if (defs.containsKey(id) && types.get(id) != QType.SPECIES) {
            d = resolveRateOf(timeDerivative(defs.get(id), this::rateOf));
        } else {
            d = Expr.ZERO;
        }
        rateInProgress.remove(key);
        if (d.isConst()) {
            return d;
        }
        defs.put(key, d);
        return Expr.symbol(key);
    }

    private List<String> topoSort(Map<String, Expr> definitions, String what) {
        List<String> order = new ArrayList<>();
        Map<String, Integer> state = new HashMap<>(); // 1 visiting, 2 done
        for (String k : definitions.keySet()) {
            visit(k, definitions, state, order, new ArrayDeque<>(), what);
        }
        return order;
    }

    private void visit(String k, Map<String, Expr> definitions, Map<String, Integer> state, List<String> order,
                       Deque<String> path, String what) {
        Integer s = state.get(k);
        if (s != null && s == 2) {
            return;
        }
        if (s != null && s == 1) {
            List<String> cyc = new ArrayList<>(path);
            java.util.Collections.reverse(cyc);
            int from = cyc.indexOf(k);
            StringBuilder sb = new StringBuilder();
            for (int i = from; i < cyc.size(); i++) {
                sb.append(cyc.get(i)).append(" -> ");
            }
            sb.append(k);
            throw new UserInputException(SourceLocation.ofElement(file, k), "the " + what + " form a cycle ("
                    + sb + "); break it");
        }
        state.put(k, 1);
        path.push(k);
        Expr e = definitions.get(k);
        List<String> deps = new ArrayList<>();
        e.forEach(x -> {
            if (x.op() == Op.SYMBOL && definitions.containsKey(x.name()) && !deps.contains(x.name())) {
                deps.add(x.name());
            }
        });
        for (String d : deps) {
            visit(d, definitions, state, order, path, what);
        }
        path.pop();
        state.put(k, 2);
        order.add(k);
    }

    /** Replaces symbols by runtime leaves: locals first, then states, then parameters. */
    private Expr bind(Expr e0, String context) {
        Expr e = e0;
        if (e.contains(x -> x.op() == Op.DELAY && !x.arg(0).isConst())) {
            e = e.rewrite(x -> {
                if (x.op() != Op.DELAY) {
                    return null;
                }
                Expr xb = bind(x.arg(0), context);
                Expr lag = bind(x.arg(1), context);
                int slot = delaySlots.size();
                delaySlots.add(xb);
                delayLags.add(lag);
                return Expr.call(Op.DELAY, Expr.constant(slot), lag);
            });
        }
        return e.mapLeaves(x -> {
            if (x.op() != Op.SYMBOL) {
                return x;
            }
            String n = x.name();
            Integer l = localIndex.get(n);
            if (l != null) {
                return Expr.local(l, n);
            }
            Integer i = stateIndex.get(n);
            if (i != null) {
                return Expr.state(i, n);
            }
            Integer k = paramIndex.get(n);
            if (k != null) {
                return Expr.param(k, n);
            }
            if (defs.containsKey(n)) {
                throw new IllegalStateException("definition '" + n + "' used before it was ordered");
            }
            throw new UserInputException(SourceLocation.ofElement(file, n), "is used in " + context
                    + " but not defined in the model; define it or correct the id");
        });
    }

    // ------------------------------------------------------------------ initial values

    private void buildInitial() {
        Map<String, Expr> idefs = new LinkedHashMap<>();
        Map<String, Expr> ias = new HashMap<>();
        for (InitialAssignment ia : model.initialAssignments()) {
            ias.put(ia.symbol(), resolveRateOf(ia.math()));
        }
        for (Map.Entry<String, QType> en : types.entrySet()) {
            String id = en.getKey();
            QType t = en.getValue();
            Expr d;
            if (ias.containsKey(id)) {
                d = ias.get(id);
            } else if (assignRules.containsKey(id)) {
                d = defs.get(id);
            } else if (t == QType.REACTION) {
                d = defs.get(id);
            } else if (t == QType.SPECIES) {
                Species s = model.species(id);
                Expr pv = Expr.symbol("#declared:" + id);
                Expr vol = Expr.symbol(s.compartment());
                boolean conc = speciesConc.contains(id);
                if (conc == !s.hasOnlySubstanceUnits()) {
                    d = pv;
                } else if (conc) {
                    d = Expr.mul(pv, vol);
                } else {
                    d = Expr.div(pv, vol);
                }
            } else {
                d = Expr.symbol("#declared:" + id);
            }
            idefs.put(id, withoutDelays(d));
        }
        for (Map.Entry<String, Expr> en : defs.entrySet()) {
            if (en.getKey().startsWith("rateOf:")) {
                idefs.put(en.getKey(), withoutDelays(stateLeavesToSymbols(en.getValue())));
            }
        }
        List<String> order = topoSort(idefs, "initial assignments and assignment rules");
        Map<String, Integer> il = new HashMap<>();
        List<String> names = new ArrayList<>();
        List<Expr> bound = new ArrayList<>();
        for (String k : order) {
            Expr b = idefs.get(k).mapLeaves(x -> {
                if (x.op() != Op.SYMBOL) {
                    return x;
                }
                String n = x.name();
                if (n.startsWith("#declared:")) {
                    String q = n.substring("#declared:".length());
                    Integer pk = paramIndex.get(q);
                    if (pk == null) {
                        return Expr.constant(Double.NaN);
                    }
                    return Expr.param(pk, q);
                }
                Integer li = il.get(n);
                if (li == null) {
                    throw new UserInputException(SourceLocation.ofElement(file, n), "is used in the initial value of '"
                            + k + "' but not defined in the model; define it or correct the id");
                }
                return Expr.local(li, n);
            });
            il.put(k, names.size());
            names.add(k);
            bound.add(b);
        }
        List<Expr> outs = new ArrayList<>();
        for (int i = 0; i < stateIds.size(); i++) {
            String id = stateIds.get(i);
            Expr v = Expr.local(il.get(id), id);
            if (isAmountStateWithConcSymbol(id)) {
                String c = model.species(id).compartment();
                v = Expr.mul(v, Expr.local(il.get(c), c));
            }
            outs.add(v);
        }
        for (String id : paramIds) {
            outs.add(Expr.local(il.get(id), id));
        }
        init = new Block(names, bound, outs);
    }

    /** At the initial time a delayed value is the initial value (no history exists before the start). */
    private static Expr withoutDelays(Expr e) {
        if (!e.contains(x -> x.op() == Op.DELAY)) {
            return e;
        }
        return e.rewrite(x -> x.op() == Op.DELAY ? withoutDelays(x.arg(0)) : null);
    }

    /** Replaces state leaves by the symbol form of the state value (amount = value * size where needed). */
    private Expr stateLeavesToSymbols(Expr e) {
        return e.mapLeaves(x -> {
            if (x.op() != Op.STATE) {
                return x;
            }
            String id = stateIds.get(x.index());
            if (isAmountStateWithConcSymbol(id)) {
                return Expr.mul(Expr.symbol(id), Expr.symbol(model.species(id).compartment()));
            }
            return Expr.symbol(id);
        });
    }

    // ------------------------------------------------------------------ events

    /**
     * An event that resizes a compartment keeps the amounts of its species (SBML: a species' quantity is its
     * amount; its concentration follows the size). Species whose state is their concentration (a rate rule on a
     * species without hasOnlySubstanceUnits) therefore get an extra assignment {@code [S] C / C_new}, all values
     * taken before the event assigns anything, unless the event assigns the species itself (SBML Test Suite case
     * 01505).
     */
    private void addConcentrationRescaling(Event e, List<BoundEvent.Target> targets, String ctx) {
        Set<String> assigned = new HashSet<>();
        e.assignments().forEach(a -> assigned.add(a.variable()));
        for (Event.Assignment a : e.assignments()) {
            if (types.get(a.variable()) != QType.COMPARTMENT) {
                continue;
            }
            for (int i = 0; i < stateIds.size(); i++) {
                String sid = stateIds.get(i);
                if (stateKinds.get(i) != StateKind.SPECIES_CONCENTRATION || assigned.contains(sid)
                        || !model.species(sid).compartment().equals(a.variable())) {
                    continue;
                }
                Expr v = bind(Expr.div(Expr.mul(Expr.symbol(sid), Expr.symbol(a.variable())), a.math()), ctx);
                targets.add(new BoundEvent.Target(sid, i, v, null));
            }
        }
    }

    private void bindEvents() {
        for (Event e : resolvedEvents) {
            String ctx = "event '" + e.id() + "'";
            List<BoundEvent.Target> targets = new ArrayList<>();
            for (Event.Assignment a : e.assignments()) {
                Expr v = bind(a.math(), ctx);
                int si = stateIndex.get(a.variable());
                Expr scale = null;
                if (isAmountStateWithConcSymbol(a.variable())) {
                    scale = symbolValue(model.species(a.variable()).compartment());
                }
                targets.add(new BoundEvent.Target(a.variable(), si, v, scale));
            }
            addConcentrationRescaling(e, targets, ctx);
            Expr trig = bind(e.trigger(), ctx);
            Expr delay = e.delay() == null ? null : bind(e.delay(), ctx);
            Expr prio = e.priority() == null ? null : bind(e.priority(), ctx);
            events.add(new BoundEvent(e.id(), trig, e.initialValue(), e.persistent(), delay, prio,
                    e.useValuesFromTriggerTime(), targets));
        }
    }

}
