package org.switchfit.sbml;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import javax.xml.stream.XMLStreamException;
import org.apache.logging.log4j.Level;
import org.apache.logging.log4j.core.config.Configurator;
import org.sbml.jsbml.AlgebraicRule;
import org.sbml.jsbml.AssignmentRule;
import org.sbml.jsbml.KineticLaw;
import org.sbml.jsbml.LocalParameter;
import org.sbml.jsbml.RateRule;
import org.sbml.jsbml.SBMLDocument;
import org.sbml.jsbml.SBMLReader;
import org.sbml.jsbml.SimpleSpeciesReference;
import org.sbml.jsbml.ext.comp.CompConstants;
import org.sbml.jsbml.ext.comp.util.CompFlatteningConverter;
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
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UnsupportedConstructException;
import org.switchfit.util.UserInputException;

/**
 * Reads SBML (Level 1 Version 2 to Level 3 Version 2 core, plus the comp package, flattened) into a {@link Model}
 * with JSBML. Function definitions are inlined; local parameters are renamed {@code reactionId.paramId}. JSBML's
 * own logging is switched off. Thread-safe (each call uses its own reader; parses are serialised).
 */
public final class SbmlReader {
    private static volatile boolean loggingConfigured;
    /** Strong reference: java.util.logging keeps loggers weakly, and a collected logger forgets its level. */
    private static final java.util.logging.Logger JUL_SBML = java.util.logging.Logger.getLogger("org.sbml");

    /**
     * Serialises JSBML's parsing: its first parses in a process initialise shared parser tables, and two threads
     * doing that at once made one parse fail with a null message ("could not be parsed as SBML (null)" for SBML Test
     * Suite cases 00001 and 00002, once in four suite runs on 2 threads). Parsing is a small part of any command.
     */
    static final Object PARSE_LOCK = new Object();

    private SbmlReader() {
    }

    /** Silences JSBML's log4j output (idempotent). */
    public static void silenceLogging() {
        if (!loggingConfigured) {
            synchronized (SbmlReader.class) {
                if (!loggingConfigured) {
                    try {
                        Configurator.setRootLevel(Level.OFF);
                        Configurator.setLevel("org.sbml", Level.OFF);
                    } catch (RuntimeException | LinkageError e) {
                        // logging backend absent: nothing to silence
                    }
                    JUL_SBML.setLevel(java.util.logging.Level.OFF);
                    loggingConfigured = true;
                }
            }
        }
    }

    /**
     * Reads a model file.
     *
     * @throws UserInputException            for unreadable, malformed or non-SBML files and undefined ids
     * @throws UnsupportedConstructException for constructs switchfit cannot simulate
     */
    public static Model read(Path path) {
        silenceLogging();
        String file = path.toString();
        if (!Files.isRegularFile(path)) {
            throw new UserInputException(SourceLocation.ofFile(file), "file not found; check the path");
        }
        SBMLDocument doc;
        String text;
        try {
            text = Files.readString(path, java.nio.charset.StandardCharsets.UTF_8);
            String xml = text;
            requireSbmlRoot(xml, file);
            if (MathMlRepair.needed(xml)) {
                try {
                    xml = MathMlRepair.repair(xml);
                } catch (Exception e) {
                    // leave the text as it is; JSBML reports what is wrong with it
                }
                synchronized (PARSE_LOCK) {
                    doc = new SBMLReader().readSBMLFromString(xml);
                }
            } else {
                synchronized (PARSE_LOCK) {
                    doc = new SBMLReader().readSBML(path.toFile());
                }
            }
        } catch (XMLStreamException e) {
            int line = e.getLocation() != null ? e.getLocation().getLineNumber() : 0;
            String msg = firstLine(e.getMessage());
            if (msg.contains("JSBML")) {
                // JSBML's own text ("... please submit a bug report ...") is about JSBML, not about the file
                throw new UserInputException(SourceLocation.ofLine(file, line), "could not be read as SBML; check "
                        + "that it is an SBML file (root element <sbml> with a <model>)", e);
            }
            throw new UserInputException(SourceLocation.ofLine(file, line), "is not well-formed XML (" + msg
                    + "); fix or re-export the file", e);
        } catch (IOException e) {
            throw new UserInputException(SourceLocation.ofFile(file), "cannot be read (" + e.getMessage()
                    + "); check permissions", e);
        } catch (UserInputException e) {
            throw e;
        } catch (RuntimeException e) {
            throw new UserInputException(SourceLocation.ofFile(file), "could not be parsed as SBML ("
                    + firstLine(String.valueOf(e.getMessage())) + "); check that it is an SBML file", e);
        }
        if (doc == null || doc.getModel() == null || doc.getLevel() < 1) {
            throw new UserInputException(SourceLocation.ofFile(file), "contains no SBML model (root element must "
                    + "be <sbml> with a <model>); pass an SBML file");
        }
        // the file's own text (before any MathML repair), read once above
        requireSupportedPackages(text, file);
        requireNumbers(text, file);
        requireUniqueIds(text, doc.getLevel(), file);
        Model flattened = null;
        // a document may declare the comp namespace (even comp:required) without using any comp element; there
        // is nothing to flatten then (unreadable text: keep the conservative choice)
        boolean compContent = text.contains(":listOf") || text.contains("listOfSubmodels")
                || text.contains("listOfModelDefinitions") || text.contains("listOfExternalModelDefinitions");
        if (compContent && (doc.isPackageEnabled(CompConstants.shortLabel)
                || doc.getModel().getExtension(CompConstants.shortLabel) != null
                || doc.getExtension(CompConstants.shortLabel) != null)) {
            String[] whyNot = new String[1];
            flattened = CompFlattener.tryFlatten(doc, path, file, whyNot);
            if (flattened == null) {
                doc = flatten(doc, path, whyNot[0]);
            }
        }
        for (String pkg : new String[] {"fbc", "arrays", "distrib", "spatial", "qual", "multi"}) {
            if (doc.isPackageEnabled(pkg)) {
                throw new UnsupportedConstructException(SourceLocation.ofFile(file), "the SBML package '" + pkg
                        + "'", "remove the package constructs");
            }
        }
        Model model = flattened != null ? flattened : new Builder(doc.getModel(), file, "", doc.getLevel())
                .build(true);
        requireRates(model);
        return model;
    }

    /**
     * A reaction without a kinetic law (or with an empty one) has no rate; SBML allows that, but the model cannot
     * be simulated when the reaction changes a species whose value nothing else determines. (Reactions that only
     * touch boundary, constant or rule-determined species are harmless and occur in the SBML Test Suite.)
     */
    private static void requireRates(Model model) {
        Set<String> ruled = new HashSet<>();
        for (Rule r : model.rules()) {
            if (r.variable() != null) {
                ruled.add(r.variable());
            }
        }
        for (Reaction r : model.reactions()) {
            if (r.kineticLaw() != null) {
                continue;
            }
            List<SpeciesRef> refs = new ArrayList<>(r.reactants());
            refs.addAll(r.products());
            for (SpeciesRef ref : refs) {
                Species s = model.species(ref.species());
                if (s != null && !s.boundaryCondition() && !s.constant() && !ruled.contains(s.id())) {
                    throw new UserInputException(SourceLocation.ofElement(model.source(), r.id()), "reaction '"
                            + r.id() + "' has no kinetic law (or its math is empty), so the rate of change of '"
                            + s.id() + "' is unknown; add a <kineticLaw> with <math> giving the reaction rate");
                }
            }
        }
    }

    /**
     * Flattens with JSBML's converter, the fallback when switchfit's own flattener declines ({@code whyNot}, its
     * reason, goes into the message when the fallback fails too).
     */
    private static SBMLDocument flatten(SBMLDocument doc, Path path, String whyNot) {
        String ours = whyNot == null ? "" : whyNot + "; ";
        try {
            doc.setLocationURI(path.toAbsolutePath().toUri().toString());
            absolutiseExternalSources(doc, path.toAbsolutePath().getParent());
            SBMLDocument flat = new CompFlatteningConverter().flatten(doc);
            if (flat == null || flat.getModel() == null) {
                throw new UnsupportedConstructException(SourceLocation.ofFile(path.toString()),
                        "hierarchical model composition that could not be flattened" + (whyNot == null ? ""
                                : " (" + whyNot + ")"), "flatten the model first");
            }
            return flat;
        } catch (UserInputException e) {
            throw e;
        } catch (RuntimeException e) {
            String theirs = e.getMessage() == null ? e.getClass().getSimpleName() : firstLine(e.getMessage());
            throw new UnsupportedConstructException(SourceLocation.ofFile(path.toString()),
                    "hierarchical model composition that could not be flattened (" + ours + "JSBML: " + theirs
                            + ")", "flatten the model first");
        }
    }

    /** Rewrites relative external model sources to absolute file URIs (JSBML resolves them against the CWD). */
    private static void absolutiseExternalSources(SBMLDocument doc, Path dir) {
        org.sbml.jsbml.ext.comp.CompSBMLDocumentPlugin plug = (org.sbml.jsbml.ext.comp.CompSBMLDocumentPlugin)
                doc.getPlugin(CompConstants.shortLabel);
        if (plug == null) {
            return;
        }
        for (org.sbml.jsbml.ext.comp.ExternalModelDefinition emd : plug.getListOfExternalModelDefinitions()) {
            String src = emd.getSource();
            if (src != null && !src.contains(":")) {
                Path f = dir.resolve(src);
                emd.setSource(f.toString());
            }
        }
    }

    /**
     * Refuses well-formed XML whose root element is not {@code <sbml>} (an HTML page, say), which JSBML reported
     * as an unreadable file with a request to file a bug report against JSBML. Text that is not well-formed is
     * left to JSBML, whose message then names the line.
     */
    static void requireSbmlRoot(String text, String file) {
        javax.xml.stream.XMLInputFactory f = safeXmlFactory();
        String root;
        try {
            javax.xml.stream.XMLStreamReader r = f.createXMLStreamReader(new java.io.StringReader(text));
            while (r.hasNext() && r.next() != javax.xml.stream.XMLStreamConstants.START_ELEMENT) {
                // skip the prolog
            }
            if (!r.isStartElement()) {
                return;
            }
            root = r.getLocalName();
        } catch (XMLStreamException | RuntimeException e) {
            return;
        }
        if (!root.equals("sbml")) {
            throw new UserInputException(SourceLocation.ofFile(file), "contains no SBML model (the root element is <"
                    + root + ">; it must be <sbml> with a <model>); pass an SBML file");
        }
    }

    /**
     * Refuses a document that declares a Level 3 package it requires ({@code pkg:required="true"} on
     * {@code <sbml>}) other than comp, the one switchfit supports: the SBML Level 3 core specification says a tool
     * must not interpret such a model without the package (from memory), since the package changes its meaning.
     * JSBML reads arrays, distrib and unknown packages quietly, and the model then ran as if they were absent.
     */
    static void requireSupportedPackages(String text, String file) {
        javax.xml.stream.XMLInputFactory f = safeXmlFactory();
        try {
            javax.xml.stream.XMLStreamReader r = f.createXMLStreamReader(new java.io.StringReader(text));
            while (r.hasNext()) {
                if (r.next() != javax.xml.stream.XMLStreamConstants.START_ELEMENT) {
                    continue;
                }
                for (int i = 0; i < r.getAttributeCount(); i++) {
                    String ns = r.getAttributeNamespace(i);
                    if (!r.getAttributeLocalName(i).equals("required") || ns == null || ns.isEmpty()
                            || !r.getAttributeValue(i).strip().equals("true")) {
                        continue;
                    }
                    String prefix = r.getAttributePrefix(i);
                    String pkg = ns.contains("/" + CompConstants.shortLabel + "/") ? CompConstants.shortLabel
                            : prefix != null && !prefix.isEmpty() ? prefix : ns;
                    if (!pkg.equals(CompConstants.shortLabel)) {
                        throw new UnsupportedConstructException(SourceLocation.ofFile(file), "the SBML Level 3 "
                                + "package '" + pkg + "' (declared required=\"true\": the specification forbids "
                                + "simulating the model without it)", "remove the package's elements and its "
                                + "declaration");
                    }
                }
                return; // only the root element declares packages
            }
        } catch (XMLStreamException e) {
            // JSBML parsed the file; leave the rest to the later checks
        }
    }

    /**
     * Numeric attributes (XML Schema double) of the core SBML elements that carry them (Level 1 spellings
     * included); elements of packages and annotations (an unprefixed name is the core namespace here) are not
     * looked at, as their attributes may be anything.
     */
    private static final java.util.regex.Pattern NUMERIC_ATTR = java.util.regex.Pattern.compile(
            "<(compartment|species|specie|parameter|localParameter|speciesReference|specieReference)\\b[^>]*?"
                    + "\\s(stoichiometry|value|size|initialAmount|initialConcentration|volume)"
                    + "\\s*=\\s*[\"']([^\"']*)[\"']");
    private static final java.util.regex.Pattern ID_ATTR = java.util.regex.Pattern.compile(
            "\\s(?:\\w+:)?id\\s*=\\s*[\"']([^\"']*)[\"']");

    /**
     * Refuses numeric attributes that are not numbers ({@code stoichiometry="x1"}, {@code value="abc"}): JSBML
     * drops them with a log message, and the element then ran with a default value (SBML types these attributes
     * as XML Schema double, which allows INF, -INF and NaN; from memory).
     */
    static void requireNumbers(String text, String file) {
        java.util.regex.Matcher mt = NUMERIC_ATTR.matcher(text);
        while (mt.find()) {
            String v = mt.group(3).strip();
            if (!isXmlDouble(v)) {
                java.util.regex.Matcher idm = ID_ATTR.matcher(mt.group(0));
                String where = idm.find() ? idm.group(1) : null;
                int line = 1;
                for (int i = 0; i < mt.start(); i++) {
                    if (text.charAt(i) == '\n') {
                        line++;
                    }
                }
                SourceLocation loc = where != null ? SourceLocation.ofElement(file, where)
                        : SourceLocation.ofLine(file, line);
                throw new UserInputException(loc, "<" + mt.group(1) + ">" + (where != null ? " at line " + line : "") + " has "
                        + mt.group(2) + "=\"" + mt.group(3) + "\", which is not a number; write a decimal number "
                        + "such as 1 or 0.5");
            }
        }
    }

    private static boolean isXmlDouble(String v) {
        if (v.equals("INF") || v.equals("-INF") || v.equals("+INF") || v.equals("NaN")) {
            return true;
        }
        if (v.isEmpty() || !v.matches("[+-]?(\\d+\\.?\\d*|\\.\\d+)([eE][+-]?\\d+)?")) {
            return false;
        }
        return true;
    }

    /** Elements whose id lies in a model's main (SId) namespace, with the word used in messages. */
    private static final Map<String, String> SID_ELEMENTS = Map.of("model", "model", "modelDefinition", "model",
            "functionDefinition", "function definition", "compartment", "compartment", "species", "species",
            "parameter", "parameter", "reaction", "reaction", "speciesReference", "species reference",
            "modifierSpeciesReference", "species reference", "event", "event");

    /**
     * SBML requires every id of the main namespace (model, function definitions, compartments, species,
     * reactions, species references, parameters, events) to be unique within a model (validity rule 10301, from
     * memory). JSBML keeps only the first of two elements with one id, so a species and a parameter called alike
     * made one of them silently vanish; the check therefore reads the text. Each model and model definition is
     * its own scope; local parameters (inside a kinetic law) are not in the namespace.
     */
    static void requireUniqueIds(String text, int level, String file) {
        javax.xml.stream.XMLInputFactory f = safeXmlFactory();
        java.util.ArrayDeque<Map<String, String>> scopes = new java.util.ArrayDeque<>();
        int inLaw = 0;
        try {
            javax.xml.stream.XMLStreamReader r = f.createXMLStreamReader(new java.io.StringReader(text));
            while (r.hasNext()) {
                int ev = r.next();
                if (ev == javax.xml.stream.XMLStreamConstants.START_ELEMENT) {
                    String name = r.getLocalName();
                    if (name.equals("kineticLaw")) {
                        inLaw++;
                    }
                    String kind = SID_ELEMENTS.get(name);
                    boolean scope = name.equals("model") || name.equals("modelDefinition");
                    if (scope) {
                        scopes.push(new HashMap<>());
                        if (level < 2) {
                            continue; // the Level 1 model name is no identifier
                        }
                    }
                    if (kind == null || inLaw > 0 || scopes.isEmpty()) {
                        continue;
                    }
                    String id = null;
                    for (int i = 0; i < r.getAttributeCount(); i++) {
                        if (r.getAttributeLocalName(i).equals(level < 2 ? "name" : "id")) {
                            id = r.getAttributeValue(i);
                        }
                    }
                    if (id == null || id.isEmpty()) {
                        continue;
                    }
                    String before = scopes.peek().putIfAbsent(id, kind);
                    if (before != null) {
                        throw new UserInputException(SourceLocation.ofElement(file, id), "the id '" + id
                                + "' is used by " + (before.equals(kind) ? "two " + kind + " elements" : "the "
                                + before + " and a " + kind) + " (line " + r.getLocation().getLineNumber()
                                + "); SBML requires ids to be unique within a model: rename one of them");
                    }
                } else if (ev == javax.xml.stream.XMLStreamConstants.END_ELEMENT) {
                    String name = r.getLocalName();
                    if (name.equals("kineticLaw")) {
                        inLaw--;
                    } else if (name.equals("model") || name.equals("modelDefinition")) {
                        scopes.pop();
                    }
                }
            }
        } catch (XMLStreamException e) {
            // JSBML parsed the file; anything this reader dislikes is left to the later checks
        }
    }

    static String firstLine(String s) {
        if (s == null) {
            return "";
        }
        String t = s.strip();
        int nl = t.indexOf('\n');
        return nl < 0 ? t : t.substring(0, nl).strip();
    }

    /** Builds our model from one JSBML model (or model definition), prefixing every id with {@code prefix}. */
    static final class Builder {
        private final org.sbml.jsbml.Model m;
        private final String file;
        private final MathConverter conv;
        private final int level;
        private final String px;
        /**
         * SBML Level 3 Version 2 made the math of rules, initial assignments, triggers and event assignments
         * optional (an element without it has no effect); earlier versions require it.
         */
        private final boolean mathOptional;

        Builder(org.sbml.jsbml.Model m, String file, String prefix, int level) {
            this.m = m;
            this.file = file;
            this.conv = new MathConverter(m, file, prefix);
            this.level = level;
            this.px = prefix;
            this.mathOptional = m == null || level > 3 || level == 3 && m.getVersion() >= 2;
        }

        /** Refuses an element without math where the file's SBML version requires it. */
        private void requireMath(Object math, String element, String what) {
            if (math == null && !mathOptional) {
                throw new UserInputException(SourceLocation.ofElement(file, element), what + " has no math, which "
                        + "SBML Level " + level + " Version " + m.getVersion() + " requires; add the <math> "
                        + "element");
            }
        }

        /**
         * Refuses a rule or event assignment to a quantity declared constant (SBML validity rules 10304 and 10307
         * for rules and 10406 for event assignments, from memory: a constant's value never changes).
         */
        private void requireNotConstant(String variable, String what) {
            if (level < 2 || variable == null) {
                return; // Level 1 has no constant attribute on these
            }
            org.sbml.jsbml.Parameter p = m.getParameter(variable);
            org.sbml.jsbml.Species s = m.getSpecies(variable);
            org.sbml.jsbml.Compartment c = m.getCompartment(variable);
            String kind = p != null && p.getConstant() ? "parameter" : s != null && s.getConstant() ? "species"
                    : c != null && c.getConstant() ? "compartment" : null;
            if (kind != null) {
                throw new UserInputException(SourceLocation.ofElement(file, px + variable), what + " changes the "
                        + kind + " '" + variable + "', which is declared constant=\"true\"; set constant=\"false\" "
                        + "or remove the " + (what.startsWith("event") ? "assignment" : "rule"));
            }
        }

        Model build(boolean check) {
            List<Compartment> comps = new ArrayList<>();
            for (org.sbml.jsbml.Compartment c : m.getListOfCompartments()) {
                double size = c.isSetSize() ? c.getSize() : Double.NaN;
                if ((level < 3 || c.isSetSpatialDimensions() && c.getSpatialDimensions() == 0) && !c.isSetSize()
                        && m.getInitialAssignment(c.getId()) == null && m.getRule(c.getId()) == null) {
                    size = 1.0; // L1/L2 default size
                }
                double dims = c.isSetSpatialDimensions() ? c.getSpatialDimensions() : level < 3 ? 3 : Double.NaN;
                comps.add(new Compartment(px + c.getId(), size, dims, level < 2 || c.getConstant()));
            }
            List<Species> species = new ArrayList<>();
            for (org.sbml.jsbml.Species s : m.getListOfSpecies()) {
                double amt = s.isSetInitialAmount() ? s.getInitialAmount() : Double.NaN;
                double conc = s.isSetInitialConcentration() ? s.getInitialConcentration() : Double.NaN;
                String cf = s.isSetConversionFactor() ? px + s.getConversionFactor() : null;
                boolean constant = level >= 2 && s.getConstant();
                org.sbml.jsbml.Compartment sc = m.getCompartment(s.getCompartment());
                // a species in a 0-dimensional compartment has no concentration: its symbol is its amount
                boolean zeroDim = sc != null && sc.isSetSpatialDimensions() && sc.getSpatialDimensions() == 0;
                species.add(new Species(px + s.getId(), px + s.getCompartment(), amt, conc,
                        s.getHasOnlySubstanceUnits() || zeroDim,
                        s.getBoundaryCondition(), constant, cf));
            }
            List<Parameter> params = new ArrayList<>();
            for (org.sbml.jsbml.Parameter p : m.getListOfParameters()) {
                params.add(new Parameter(px + p.getId(), p.isSetValue() ? p.getValue() : Double.NaN,
                        level >= 2 && p.getConstant()));
            }
            List<Reaction> reactions = new ArrayList<>();
            for (org.sbml.jsbml.Reaction r : m.getListOfReactions()) {
                reactions.add(reaction(r));
            }
            List<Rule> rules = new ArrayList<>();
            for (org.sbml.jsbml.Rule r : m.getListOfRules()) {
                String rid = r.isSetMetaId() ? px + r.getMetaId() : null;
                String var = r instanceof AssignmentRule ? ((AssignmentRule) r).getVariable()
                        : r instanceof RateRule ? ((RateRule) r).getVariable() : null;
                requireMath(r.getMath(), var != null ? px + var : rid != null ? rid : "algebraic rule",
                        var != null ? "the rule for '" + var + "'" : "an algebraic rule");
                if (r.getMath() == null) {
                    continue; // SBML L3V2 allows math to be absent: the rule then has no effect
                }
                requireNotConstant(var, r instanceof RateRule ? "a rate rule" : "an assignment rule");
                if (r instanceof AlgebraicRule) {
                    rules.add(new Rule(Rule.Kind.ALGEBRAIC, null, conv.convert(r.getMath(), Map.of(),
                            rid == null ? "algebraic rule" : rid), rid));
                } else if (r instanceof AssignmentRule) {
                    AssignmentRule a = (AssignmentRule) r;
                    rules.add(new Rule(Rule.Kind.ASSIGNMENT, px + a.getVariable(), conv.convert(a.getMath(), Map.of(),
                            a.getVariable()), rid));
                } else if (r instanceof RateRule) {
                    RateRule a = (RateRule) r;
                    rules.add(new Rule(Rule.Kind.RATE, px + a.getVariable(), conv.convert(a.getMath(), Map.of(),
                            a.getVariable()), rid));
                }
            }
            List<InitialAssignment> ias = new ArrayList<>();
            for (org.sbml.jsbml.InitialAssignment ia : m.getListOfInitialAssignments()) {
                requireMath(ia.getMath(), px + ia.getVariable(), "the initial assignment of '" + ia.getVariable()
                        + "'");
                if (ia.getMath() == null) {
                    continue;
                }
                ias.add(new InitialAssignment(px + ia.getVariable(), conv.convert(ia.getMath(), Map.of(),
                        ia.getVariable())));
            }
            List<Event> events = new ArrayList<>();
            int en = 0;
            for (org.sbml.jsbml.Event e : m.getListOfEvents()) {
                String eid = px + (e.isSetId() ? e.getId() : "event" + (en + 1));
                requireMath(e.getTrigger() == null ? null : e.getTrigger().getMath(), eid, "the trigger of event '"
                        + eid + "'");
                if (e.getTrigger() == null || e.getTrigger().getMath() == null) {
                    en++;
                    continue; // SBML L3V2: an event without trigger math never fires
                }
                events.add(event(e, en++));
            }
            String cf = m.isSetConversionFactor() ? px + m.getConversionFactor() : null;
            Model model = new Model(m.getId(), file, comps, species, params, reactions, rules, ias, events, cf);
            if (check) {
                checkSymbols(model);
            }
            return model;
        }

        private Reaction reaction(org.sbml.jsbml.Reaction r) {
            String rid = px + r.getId();
            Map<String, String> rename = new HashMap<>();
            List<Parameter> locals = new ArrayList<>();
            KineticLaw kl = r.getKineticLaw();
            if (kl != null) {
                for (LocalParameter lp : kl.getListOfLocalParameters()) {
                    String nid = rid + "." + lp.getId();
                    rename.put(lp.getId(), nid);
                    locals.add(new Parameter(nid, lp.isSetValue() ? lp.getValue() : Double.NaN, true));
                }
            }
            Expr law = kl == null || kl.getMath() == null ? null : conv.convert(kl.getMath(), rename, rid);
            List<SpeciesRef> reactants = new ArrayList<>();
            for (org.sbml.jsbml.SpeciesReference s : r.getListOfReactants()) {
                reactants.add(ref(s, rid));
            }
            List<SpeciesRef> products = new ArrayList<>();
            for (org.sbml.jsbml.SpeciesReference s : r.getListOfProducts()) {
                products.add(ref(s, rid));
            }
            boolean fast;
            try {
                fast = r.isSetFast() && r.getFast();
            } catch (org.sbml.jsbml.PropertyNotAvailableException e) {
                // SBML Level 3 Version 2 removed the attribute; JSBML keeps it set but refuses to read it
                throw new UserInputException(SourceLocation.ofElement(file, rid), "has the attribute 'fast', which "
                        + "SBML Level " + r.getLevel() + " Version " + r.getVersion() + " does not define; remove it "
                        + "or declare the file as Level 3 Version 1");
            }
            return new Reaction(rid, reactants, products, law, locals, r.getReversible(), fast);
        }

        private SpeciesRef ref(org.sbml.jsbml.SpeciesReference s, String rid) {
            Expr sm = null;
            if (s.isSetStoichiometryMath() && s.getStoichiometryMath().getMath() != null) {
                sm = conv.convert(s.getStoichiometryMath().getMath(), Map.of(), rid);
            }
            double st = s.isSetStoichiometry() ? s.getStoichiometry() : level < 3 ? 1.0 : Double.NaN;
            if (level == 1 && s.isSetDenominator()) {
                st = st / s.getDenominator();
            }
            String id = s.isSetId() && !((SimpleSpeciesReference) s).getId().isEmpty() ? s.getId() : null;
            boolean constant = level < 3 ? sm == null : s.getConstant();
            return new SpeciesRef(px + s.getSpecies(), id == null ? null : px + id, st, sm, constant);
        }

        private Event event(org.sbml.jsbml.Event e, int index) {
            String eid = px + (e.isSetId() ? e.getId() : "event" + (index + 1));
            if (e.getTrigger() == null || e.getTrigger().getMath() == null) {
                throw new UserInputException(SourceLocation.ofElement(file, eid), "event has no trigger; add one");
            }
            Expr trig = conv.convert(e.getTrigger().getMath(), Map.of(), eid);
            boolean init = level < 3 || !e.getTrigger().isSetInitialValue() || e.getTrigger().getInitialValue();
            boolean persistent = level < 3 || !e.getTrigger().isSetPersistent() || e.getTrigger().getPersistent();
            Expr delay = e.getDelay() != null && e.getDelay().getMath() != null
                    ? conv.convert(e.getDelay().getMath(), Map.of(), eid) : null;
            Expr prio = e.getPriority() != null && e.getPriority().getMath() != null
                    ? conv.convert(e.getPriority().getMath(), Map.of(), eid) : null;
            boolean uvftt = !e.isSetUseValuesFromTriggerTime() || e.getUseValuesFromTriggerTime();
            List<Event.Assignment> as = new ArrayList<>();
            for (org.sbml.jsbml.EventAssignment a : e.getListOfEventAssignments()) {
                requireMath(a.getMath(), eid, "the assignment to '" + a.getVariable() + "' in event '" + eid + "'");
                if (a.getMath() == null) {
                    continue;
                }
                requireNotConstant(a.getVariable(), "event '" + eid + "'");
                as.add(new Event.Assignment(px + a.getVariable(), conv.convert(a.getMath(), Map.of(), eid)));
            }
            return new Event(eid, trig, init, persistent, delay, prio, uvftt, as);
        }

        /** Every symbol used in mathematics must name a quantity or reaction. */
        static void checkSymbols(Model model) {
            new Builder(null, model.source(), "", 3).check(model);
        }

        private void check(Model model) {
            Set<String> known = new HashSet<>();
            model.compartments().forEach(c -> known.add(c.id()));
            model.species().forEach(s -> known.add(s.id()));
            model.parameters().forEach(p -> known.add(p.id()));
            for (Reaction r : model.reactions()) {
                known.add(r.id());
                r.localParameters().forEach(p -> known.add(p.id()));
                r.reactants().forEach(s -> {
                    if (s.id() != null) {
                        known.add(s.id());
                    }
                });
                r.products().forEach(s -> {
                    if (s.id() != null) {
                        known.add(s.id());
                    }
                });
            }
            for (Reaction r : model.reactions()) {
                if (r.kineticLaw() != null) {
                    check(r.kineticLaw(), known, "the kinetic law of reaction '" + r.id() + "'", r.id());
                }
            }
            for (Rule r : model.rules()) {
                String where = r.variable() == null ? "an algebraic rule" : "the rule for '" + r.variable() + "'";
                check(r.math(), known, where, r.variable() == null ? r.elementId() : r.variable());
            }
            for (InitialAssignment ia : model.initialAssignments()) {
                check(ia.math(), known, "the initial assignment of '" + ia.symbol() + "'", ia.symbol());
            }
            for (Event e : model.events()) {
                check(e.trigger(), known, "the trigger of event '" + e.id() + "'", e.id());
                for (Event.Assignment a : e.assignments()) {
                    check(a.math(), known, "event '" + e.id() + "'", e.id());
                }
            }
        }

        private void check(Expr e, Set<String> known, String where, String element) {
            e.forEach(x -> {
                if (x.op() == Op.SYMBOL && !known.contains(x.name())) {
                    throw new UserInputException(SourceLocation.ofElement(file, element), where + " uses '"
                            + x.name() + "', which is not defined in the model; define it or correct the id");
                }
            });
        }
    }


    /** A StAX factory without DTDs or external entities, for the text checks on the file. */
    private static javax.xml.stream.XMLInputFactory safeXmlFactory() {
        javax.xml.stream.XMLInputFactory f = javax.xml.stream.XMLInputFactory.newFactory();
        f.setProperty(javax.xml.stream.XMLInputFactory.SUPPORT_DTD, false);
        f.setProperty(javax.xml.stream.XMLInputFactory.IS_SUPPORTING_EXTERNAL_ENTITIES, false);
        return f;
    }
}
