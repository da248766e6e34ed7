package org.switchfit.sbml;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.sbml.jsbml.SBMLDocument;
import org.sbml.jsbml.SBase;
import org.sbml.jsbml.ext.comp.CompConstants;
import org.sbml.jsbml.ext.comp.CompModelPlugin;
import org.sbml.jsbml.ext.comp.CompSBMLDocumentPlugin;
import org.sbml.jsbml.ext.comp.CompSBasePlugin;
import org.sbml.jsbml.ext.comp.Deletion;
import org.sbml.jsbml.ext.comp.ExternalModelDefinition;
import org.sbml.jsbml.ext.comp.Port;
import org.sbml.jsbml.ext.comp.ReplacedBy;
import org.sbml.jsbml.ext.comp.ReplacedElement;
import org.sbml.jsbml.ext.comp.SBaseRef;
import org.sbml.jsbml.ext.comp.Submodel;
import org.switchfit.expr.Expr;
import org.switchfit.expr.Op;
import org.switchfit.model.Compartment;
import org.switchfit.model.Event;
import org.switchfit.model.InitialAssignment;
import org.switchfit.model.Model;
import org.switchfit.model.Parameter;
import org.switchfit.model.Reaction;
import org.switchfit.model.Rule;
import org.switchfit.model.Species;
import org.switchfit.model.SpeciesRef;

/**
 * Flattens SBML hierarchical model composition (comp package, version 1) into one {@link Model}: submodel
 * instances are converted with ids prefixed {@code submodelId__}; deletions remove elements; replaced elements
 * and replacedBy redirect every reference to the surviving element (a replacedElement conversion factor c turns a
 * reference to the replaced quantity x into E / c). Ports are followed to their ids. Submodel time and extent
 * conversion factors are not supported (the caller falls back to the JSBML flattener, which reports them).
 */
final class CompFlattener {
    private final String file;
    private final Path dir;
    private final SBMLDocument rootDoc;
    /**
     * Every submodel element that a lower level renamed (replacedBy: it survives under the replaced element's id),
     * old prefixed id to new; a reference from a higher level to the old id follows the chain.
     */
    private final Map<String, String> renamedBelow = new HashMap<>();

    private CompFlattener(SBMLDocument doc, Path path, String file) {
        this.rootDoc = doc;
        this.file = file;
        this.dir = path.toAbsolutePath().getParent();
    }

    /** Flattens, or returns null when the model uses comp features this flattener does not handle. */
    static Model tryFlatten(SBMLDocument doc, Path path, String file, String[] whyNot) {
        try {
            CompFlattener f = new CompFlattener(doc, path, file);
            Model m = f.flatten(doc.getModel(), doc, "", 0);
            return new Model(m.id(), file, m.compartments(), m.species(), m.parameters(), m.reactions(), m.rules(),
                    m.initialAssignments(), m.events(), m.conversionFactor());
        } catch (Unhandled e) {
            whyNot[0] = e.getMessage();
            return null;
        }
    }

    /** Signals a comp feature outside this flattener's scope. */
    private static final class Unhandled extends RuntimeException {
        private static final long serialVersionUID = 1L;

        Unhandled(String msg) {
            super(msg, null, false, false);
        }
    }

    /** A model definition together with the document it lives in. */
    private record Def(org.sbml.jsbml.Model model, SBMLDocument doc) {
    }

    private Def resolve(String ref, SBMLDocument doc, int depth) {
        if (depth > 20) {
            throw new Unhandled("model definitions nest too deeply");
        }
        CompSBMLDocumentPlugin dp = (CompSBMLDocumentPlugin) doc.getExtension(CompConstants.shortLabel);
        if (doc.getModel() != null && ref.equals(doc.getModel().getId())) {
            return new Def(doc.getModel(), doc);
        }
        if (dp != null) {
            org.sbml.jsbml.ext.comp.ModelDefinition md = dp.getModelDefinition(ref);
            if (md != null) {
                return new Def(md, doc);
            }
            ExternalModelDefinition emd = dp.getExternalModelDefinition(ref);
            if (emd != null) {
                String src = emd.getSource();
                if (src.startsWith("file:")) {
                    src = src.substring(5);
                }
                Path p = dir.resolve(src);
                SBMLDocument ext;
                try {
                    synchronized (SbmlReader.PARSE_LOCK) {
                        ext = new org.sbml.jsbml.SBMLReader().readSBML(p.toFile());
                    }
                } catch (Exception e) {
                    throw new Unhandled("cannot read external model " + p);
                }
                String mr = emd.isSetModelRef() ? emd.getModelRef() : ext.getModel().getId();
                return resolve(mr, ext, depth + 1);
            }
        }
        throw new Unhandled("model definition '" + ref + "' not found");
    }

    private Model flatten(org.sbml.jsbml.Model m, SBMLDocument doc, String prefix, int depth) {
        CompModelPlugin plug = (CompModelPlugin) m.getExtension(CompConstants.shortLabel);
        List<Model> parts = new ArrayList<>();
        Map<String, Def> subDefs = new HashMap<>();
        Set<String> remove = new HashSet<>();
        Set<String> deleted = new HashSet<>();
        Map<String, String> idRename = new HashMap<>();
        Map<String, Expr> localAlias = new HashMap<>();
        if (plug != null) {
            for (Submodel s : plug.getListOfSubmodels()) {
                Def def = resolve(s.getModelRef(), doc, depth);
                String sp = prefix + s.getId() + "__";
                subDefs.put(s.getId(), def);
                Model sub = flatten(def.model(), def.doc(), sp, depth + 1);
                Expr tcf = s.isSetTimeConversionFactor() ? Expr.symbol(prefix + s.getTimeConversionFactor()) : null;
                Expr ecf = s.isSetExtentConversionFactor() ? Expr.symbol(prefix + s.getExtentConversionFactor())
                        : null;
                if (tcf != null || ecf != null) {
                    sub = convertUnits(sub, tcf, ecf, replacedIn(m, s.getId(), def, sp, depth));
                }
                parts.add(sub);
                for (Deletion d : s.getListOfDeletions()) {
                    String tid = target(d, def, sp, depth);
                    remove.add(tid);
                    deleted.add(tid);
                    int dot = tid.lastIndexOf('.');
                    if (dot > 0 && !d.isSetSBaseRef() && tid.startsWith(sp)) {
                        // a deleted local parameter ("reactionId.paramId", no SId has a dot): its kinetic law now
                        // reads the submodel's global of that name (SBML scoping)
                        localAlias.put(tid, Expr.symbol(sp + tid.substring(dot + 1)));
                    }
                }
            }
        }
        parts.add(new SbmlReader.Builder(m, file, prefix, doc.getLevel()).build(false));
        Map<String, Expr> alias = new HashMap<>(localAlias);
        // replaced element -> conversion factor: a value the submodel assigns to it is multiplied by the factor
        Map<String, Expr> assignedScale = new HashMap<>();
        Map<String, String> rename = new HashMap<>();
        for (SBase el : elements(m)) {
            CompSBasePlugin cp = (CompSBasePlugin) el.getExtension(CompConstants.shortLabel);
            if (cp == null) {
                continue;
            }
            String eid = prefix + idOf(el);
            for (ReplacedElement re : cp.getListOfReplacedElements()) {
                if (re.isSetDeletion()) {
                    continue;
                }
                Def def = subDefs.get(re.getSubmodelRef());
                if (def == null) {
                    throw new Unhandled("unknown submodel " + re.getSubmodelRef());
                }
                String tid = target(re, def, prefix + re.getSubmodelRef() + "__", depth);
                remove.add(tid);
                rename.put(tid, eid);
                Expr repl = Expr.symbol(eid);
                if (re.isSetConversionFactor()) {
                    repl = Expr.div(repl, Expr.symbol(prefix + re.getConversionFactor()));
                    assignedScale.put(tid, Expr.symbol(prefix + re.getConversionFactor()));
                }
                alias.put(tid, repl);
            }
            if (cp.isSetReplacedBy()) {
                ReplacedBy rb = cp.getReplacedBy();
                Def def = subDefs.get(rb.getSubmodelRef());
                if (def == null) {
                    throw new Unhandled("unknown submodel " + rb.getSubmodelRef());
                }
                String tid = target(rb, def, prefix + rb.getSubmodelRef() + "__", depth);
                // the submodel element survives under the parent's id
                remove.add(eid);
                idRename.put(tid, eid);
                rename.put(tid, eid);
                alias.put(tid, Expr.symbol(eid));
            }
        }
        Model merged = merge(m.getId(), parts, remove, deleted, idRename, alias, rename, assignedScale);
        renamedBelow.putAll(idRename);
        return merged;
    }

    /**
     * Applies submodel conversion factors (comp specification, section 3.5.1): submodel time is parent time
     * divided by the time factor, so rates per submodel time are divided by it and durations multiplied; reaction
     * extents are multiplied by the extent factor. A reaction's id used in the submodel's mathematics still means
     * its rate in submodel units (SBML Test Suite 01178-01181).
     */
    private static Model convertUnits(Model m, Expr tcf, Expr ecf, Set<String> replaced) {
        // a reaction's id in the submodel's math keeps submodel units: the converted rate divided by ecf / tcf;
        // not for a replaced reaction, whose references take the replacement's own conversion factor instead
        Set<String> rids = new HashSet<>();
        m.reactions().forEach(r -> rids.add(r.id()));
        rids.removeAll(replaced);
        Expr rateFactor = ecf == null ? Expr.div(Expr.ONE, tcf) : tcf == null ? ecf : Expr.div(ecf, tcf);
        java.util.function.Function<Expr, Expr> time = e -> e == null ? e : e.mapLeaves(x -> x.op() == Op.TIME
                && tcf != null ? Expr.div(Expr.TIME, tcf)
                : x.op() == Op.SYMBOL && rids.contains(x.name()) ? Expr.div(x, rateFactor) : x);
        List<Reaction> rs = new ArrayList<>();
        for (Reaction r : m.reactions()) {
            Expr k = time.apply(r.kineticLaw());
            if (k != null) {
                if (ecf != null) {
                    k = Expr.mul(k, ecf);
                }
                if (tcf != null) {
                    k = Expr.div(k, tcf);
                }
            }
            rs.add(new Reaction(r.id(), r.reactants(), r.products(), k, r.localParameters(), r.reversible(),
                    r.fast()));
        }
        List<Rule> rules = new ArrayList<>();
        for (Rule r : m.rules()) {
            Expr e = time.apply(r.math());
            if (r.kind() == Rule.Kind.RATE && tcf != null) {
                e = Expr.div(e, tcf);
            }
            rules.add(new Rule(r.kind(), r.variable(), e, r.elementId()));
        }
        List<InitialAssignment> ias = new ArrayList<>();
        for (InitialAssignment ia : m.initialAssignments()) {
            ias.add(new InitialAssignment(ia.symbol(), time.apply(ia.math())));
        }
        List<Event> evs = new ArrayList<>();
        for (Event e : m.events()) {
            List<Event.Assignment> as = new ArrayList<>();
            for (Event.Assignment a : e.assignments()) {
                as.add(new Event.Assignment(a.variable(), time.apply(a.math())));
            }
            Expr delay = time.apply(e.delay());
            if (delay != null && tcf != null) {
                delay = Expr.mul(delay, tcf);
            }
            evs.add(new Event(e.id(), time.apply(e.trigger()), e.initialValue(), e.persistent(), delay,
                    time.apply(e.priority()), e.useValuesFromTriggerTime(), as));
        }
        return new Model(m.id(), m.source(), m.compartments(), m.species(), m.parameters(), rs, rules, ias, evs,
                m.conversionFactor());
    }

    /** Prefixed ids of the elements of submodel {@code subId} that elements of {@code m} replace. */
    private Set<String> replacedIn(org.sbml.jsbml.Model m, String subId, Def def, String sp, int depth) {
        Set<String> out = new HashSet<>();
        for (SBase el : elements(m)) {
            CompSBasePlugin cp = (CompSBasePlugin) el.getExtension(CompConstants.shortLabel);
            if (cp == null) {
                continue;
            }
            for (ReplacedElement re : cp.getListOfReplacedElements()) {
                if (!re.isSetDeletion() && subId.equals(re.getSubmodelRef())) {
                    out.add(target(re, def, sp, depth));
                }
            }
        }
        return out;
    }

    private static String idOf(SBase el) {
        if (el instanceof org.sbml.jsbml.NamedSBase && ((org.sbml.jsbml.NamedSBase) el).isSetId()) {
            return ((org.sbml.jsbml.NamedSBase) el).getId();
        }
        if (el instanceof org.sbml.jsbml.Rule && ((org.sbml.jsbml.Rule) el).isSetMetaId()) {
            return el.getMetaId();
        }
        if (el instanceof org.sbml.jsbml.Rule && !((org.sbml.jsbml.Rule) el).isAlgebraic()) {
            return ((org.sbml.jsbml.ExplicitRule) el).getVariable();
        }
        throw new Unhandled("replacement on an element without id");
    }

    private static List<SBase> elements(org.sbml.jsbml.Model m) {
        List<SBase> l = new ArrayList<>();
        l.addAll(m.getListOfCompartments());
        l.addAll(m.getListOfSpecies());
        l.addAll(m.getListOfParameters());
        l.addAll(m.getListOfReactions());
        l.addAll(m.getListOfEvents());
        for (org.sbml.jsbml.Rule r : m.getListOfRules()) {
            if (r.isSetMetaId()) {
                l.add(r); // a rule can replace a submodel's rule (matched by metaid)
            }
        }
        for (org.sbml.jsbml.Reaction r : m.getListOfReactions()) {
            l.addAll(r.getListOfReactants());
            l.addAll(r.getListOfProducts());
        }
        return l;
    }

    /** Prefixed id of the element an SBaseRef points to inside a submodel instance. */
    private String target(SBaseRef ref, Def def, String subPrefix, int depth) {
        String id;
        if (ref.isSetPortRef()) {
            CompModelPlugin p = (CompModelPlugin) def.model().getExtension(CompConstants.shortLabel);
            Port port = p == null ? null : p.getPort(ref.getPortRef());
            if (port == null) {
                throw new Unhandled("port " + ref.getPortRef());
            }
            if (port.isSetIdRef()) {
                id = port.getIdRef();
            } else if (port.isSetMetaIdRef()) {
                id = metaIdTarget(def.model(), port.getMetaIdRef());
            } else {
                throw new Unhandled("port without idRef");
            }
            if (port.isSetSBaseRef()) {
                return nested(port.getSBaseRef(), def, subPrefix, id, depth);
            }
        } else if (ref.isSetIdRef()) {
            id = ref.getIdRef();
            if (!ref.isSetSBaseRef() && def.model().getSBaseById(id) == null) {
                throw new Unhandled("model definition '" + def.model().getId() + "' has no element '" + id + "'");
            }
        } else if (ref.isSetMetaIdRef()) {
            id = metaIdTarget(def.model(), ref.getMetaIdRef());
        } else {
            throw new Unhandled("reference by unit");
        }
        if (ref.isSetSBaseRef()) {
            return nested(ref.getSBaseRef(), def, subPrefix, id, depth);
        }
        String full = subPrefix + id;
        for (int guard = 0; renamedBelow.containsKey(full) && guard < 64; guard++) {
            full = renamedBelow.get(full);
        }
        return full;
    }

    private String nested(SBaseRef inner, Def def, String subPrefix, String submodelId, int depth) {
        CompModelPlugin p = (CompModelPlugin) def.model().getExtension(CompConstants.shortLabel);
        Submodel s = p == null ? null : p.getSubmodel(submodelId);
        if (s == null) {
            throw new Unhandled("nested reference to unknown submodel " + submodelId);
        }
        Def d2 = resolve(s.getModelRef(), def.doc(), depth + 1);
        return target(inner, d2, subPrefix + submodelId + "__", depth + 1);
    }

    private static String metaIdTarget(org.sbml.jsbml.Model m, String metaId) {
        SBase el = m.getSBMLDocument() == null ? null : m.getSBMLDocument().getElementByMetaId(metaId);
        if (el == null) {
            el = m.getElementByMetaId(metaId);
        }
        if (el == null) {
            throw new Unhandled("no element has metaid '" + metaId + "'");
        }
        if (el instanceof org.sbml.jsbml.EventAssignment && el.getParent() != null
                && el.getParent().getParent() instanceof org.sbml.jsbml.Event) {
            // an event assignment has no id: "eventId#position" (events without id named as SbmlReader does)
            org.sbml.jsbml.Event ev = (org.sbml.jsbml.Event) el.getParent().getParent();
            String evId = ev.isSetId() ? ev.getId() : "event" + (m.getListOfEvents().indexOf(ev) + 1);
            return evId + "#" + ev.getListOfEventAssignments().indexOf(el);
        }
        if (el instanceof org.sbml.jsbml.LocalParameter && el.getParent() != null
                && el.getParent().getParent() != null
                && el.getParent().getParent().getParent() instanceof org.sbml.jsbml.Reaction) {
            // local parameters are global "reactionId.paramId" after reading (SbmlReader)
            org.sbml.jsbml.Reaction r = (org.sbml.jsbml.Reaction) el.getParent().getParent().getParent();
            return r.getId() + "." + ((org.sbml.jsbml.LocalParameter) el).getId();
        }
        if (el instanceof org.sbml.jsbml.NamedSBase && ((org.sbml.jsbml.NamedSBase) el).isSetId()) {
            return ((org.sbml.jsbml.NamedSBase) el).getId();
        }
        return metaId; // rules and initial assignments are matched by metaid
    }

    // ------------------------------------------------------------------ merging

    private Model merge(String id, List<Model> parts, Set<String> remove, Set<String> deleted,
                        Map<String, String> idRename, Map<String, Expr> alias, Map<String, String> rename,
                        Map<String, Expr> assignedScale) {
        // the submodel's x = f (or x' = f, x := f) for x replaced with factor c: the replacing y = c x gets c f
        java.util.function.BiFunction<String, Expr, Expr> scaled = (target, math) -> {
            Expr c = assignedScale.get(target);
            return c == null || math == null ? math : Expr.mul(c, math);
        };
        List<Compartment> comps = new ArrayList<>();
        List<Species> species = new ArrayList<>();
        List<Parameter> params = new ArrayList<>();
        List<Reaction> reactions = new ArrayList<>();
        List<Rule> rules = new ArrayList<>();
        List<InitialAssignment> ias = new ArrayList<>();
        List<Event> events = new ArrayList<>();
        String cf = null;
        for (Model p : parts) {
            for (Compartment c : p.compartments()) {
                if (!remove.contains(c.id())) {
                    comps.add(new Compartment(ren(c.id(), idRename), c.size(), c.spatialDimensions(), c.constant()));
                }
            }
            for (Species s : p.species()) {
                if (!remove.contains(s.id())) {
                    species.add(new Species(ren(s.id(), idRename), ren(s.compartment(), rename), s.initialAmount(),
                            s.initialConcentration(), s.hasOnlySubstanceUnits(), s.boundaryCondition(), s.constant(),
                            s.conversionFactor() == null ? null : ren(s.conversionFactor(), rename)));
                }
            }
            for (Parameter q : p.parameters()) {
                if (!remove.contains(q.id())) {
                    params.add(new Parameter(ren(q.id(), idRename), q.value(), q.constant()));
                }
            }
            for (Reaction r : p.reactions()) {
                if (remove.contains(r.id())) {
                    continue;
                }
                reactions.add(new Reaction(ren(r.id(), idRename), refs(r.reactants(), remove, alias, rename),
                        refs(r.products(), remove, alias, rename), sub(r.kineticLaw(), alias), r.localParameters(),
                        r.reversible(), r.fast()));
            }
            for (Rule r : p.rules()) {
                if (r.elementId() != null && (deleted.contains(r.elementId()) || remove.contains(r.elementId()))
                        || r.variable() != null && deleted.contains(r.variable())) {
                    continue;
                }
                rules.add(new Rule(r.kind(), r.variable() == null ? null : ren(r.variable(), rename),
                        r.variable() == null ? sub(r.math(), alias) : scaled.apply(r.variable(), sub(r.math(), alias)),
                        r.elementId()));
            }
            for (InitialAssignment ia : p.initialAssignments()) {
                if (deleted.contains(ia.symbol())) {
                    continue;
                }
                ias.add(new InitialAssignment(ren(ia.symbol(), rename),
                        scaled.apply(ia.symbol(), sub(ia.math(), alias))));
            }
            for (Event e : p.events()) {
                if (remove.contains(e.id())) {
                    continue;
                }
                List<Event.Assignment> as = new ArrayList<>();
                for (int i = 0; i < e.assignments().size(); i++) {
                    Event.Assignment a = e.assignments().get(i);
                    if (deleted.contains(a.variable()) || deleted.contains(e.id() + "#" + i)) {
                        continue;
                    }
                    as.add(new Event.Assignment(ren(a.variable(), rename),
                            scaled.apply(a.variable(), sub(a.math(), alias))));
                }
                events.add(new Event(ren(e.id(), idRename), sub(e.trigger(), alias), e.initialValue(), e.persistent(),
                        sub(e.delay(), alias), sub(e.priority(), alias), e.useValuesFromTriggerTime(), as));
            }
            if (p.conversionFactor() != null && cf == null) {
                cf = ren(p.conversionFactor(), rename);
            }
        }
        // a renamed target that is itself renamed again (chains) resolves in the next merge level
        dedupeInitialAssignments(ias);
        return new Model(id, file, comps, species, params, reactions, rules, ias, events, cf);
    }

    private static void dedupeInitialAssignments(List<InitialAssignment> ias) {
        // the replacing (parent) element's initial assignment wins: it comes last
        Map<String, Integer> last = new HashMap<>();
        for (int i = 0; i < ias.size(); i++) {
            last.put(ias.get(i).symbol(), i);
        }
        List<InitialAssignment> keep = new ArrayList<>();
        for (int i = 0; i < ias.size(); i++) {
            if (last.get(ias.get(i).symbol()) == i) {
                keep.add(ias.get(i));
            }
        }
        ias.clear();
        ias.addAll(keep);
    }

    private static List<SpeciesRef> refs(List<SpeciesRef> l, Set<String> remove, Map<String, Expr> alias,
                                         Map<String, String> rename) {
        List<SpeciesRef> out = new ArrayList<>();
        for (SpeciesRef s : l) {
            String rid = s.id() == null ? null : remove.contains(s.id()) ? null : s.id();
            out.add(new SpeciesRef(ren(s.species(), rename), rid, s.stoichiometry(), sub(s.stoichiometryMath(), alias),
                    s.constant()));
        }
        return out;
    }

    private static String ren(String id, Map<String, String> rename) {
        String r = rename.get(id);
        return r == null ? id : r;
    }

    private static Expr sub(Expr e, Map<String, Expr> alias) {
        if (e == null || alias.isEmpty()) {
            return e;
        }
        return e.mapLeaves(x -> {
            if (x.op() == Op.SYMBOL) {
                Expr a = alias.get(x.name());
                return a == null ? x : a;
            }
            return x;
        });
    }

    /** The document being flattened (for messages). */
    SBMLDocument document() {
        return rootDoc;
    }
}
