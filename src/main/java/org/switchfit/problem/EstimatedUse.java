package org.switchfit.problem;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import org.switchfit.data.Dose;
import org.switchfit.data.DoseResponsePoint;
import org.switchfit.data.EstimatedParameter;
import org.switchfit.data.Experiment;
import org.switchfit.data.NoiseModel;
import org.switchfit.data.Observable;
import org.switchfit.data.Spelling;
import org.switchfit.data.SwitchfitProblem;
import org.switchfit.data.SwitchingThreshold;
import org.switchfit.data.TimecoursePoint;
import org.switchfit.data.ValueRef;
import org.switchfit.expr.Expr;
import org.switchfit.expr.Op;
import org.switchfit.model.Event;
import org.switchfit.model.InitialAssignment;
import org.switchfit.model.Model;
import org.switchfit.model.Parameter;
import org.switchfit.model.Reaction;
import org.switchfit.model.Rule;
import org.switchfit.model.Species;
import org.switchfit.model.SpeciesRef;
import org.switchfit.sbml.Formulas;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Refuses estimated parameters of a switchfit problem whose value reaches nothing, so that a misspelt or misplaced
 * id does not pass silently (the format's promise, docs/problem-format.md): an id that neither the model (its
 * mathematics, or as a species, compartment or species reference) nor the observables, noise models or
 * experiments use; a model parameter that a rule or initial assignment of the model overwrites; and a global
 * parameter that every kinetic law mentioning its name hides behind a local parameter of the same name (SBML
 * scoping: the local one wins inside its law); and the control of dose-response or threshold data whose estimated
 * value nothing else reads (the data set the control themselves). Stateless.
 */
final class EstimatedUse {
    private EstimatedUse() {
    }

    /** Throws for the first estimated parameter of {@code sp} (file order) that affects nothing. */
    static void check(SwitchfitProblem sp, Model model) {
        Set<String> modelSymbols = modelSymbols(model);
        Set<String> problemSymbols = problemSymbols(sp);
        String modelFile = sp.modelFile().toString();
        for (EstimatedParameter p : sp.parameters()) {
            String id = p.id();
            SourceLocation loc = p.location() == null ? SourceLocation.ofElement(sp.problemFile().toString(), id)
                    : p.location();
            String setBy = overwrittenBy(model, id);
            if (setBy != null) {
                throw UserInputException.of(loc, "estimated parameter '%s' is set by %s of model %s, which "
                        + "overwrites any estimated value; estimate the quantities that %s uses instead", id, setBy,
                        modelFile, setBy.startsWith("an assignment") ? "the rule" : "it");
            }
            SourceLocation controlData = controlOnly(sp, id);
            if (controlData != null) {
                throw UserInputException.of(loc, "estimated parameter '%s' is the control of the switching data "
                        + "at %s, which set its value (each dose, or the sweep to the fold), and no timecourse, other "
                        + "data, experiment value or noise model uses its estimated value; remove it from parameters",
                        id, controlData);
            }
            boolean parameter = isGlobalParameter(model, id);
            boolean otherEntity = !parameter && (model.species(id) != null || model.compartment(id) != null
                    || model.speciesRefsById().containsKey(id));
            if (otherEntity || problemSymbols.contains(id) || (parameter && modelSymbols.contains(id))) {
                continue;
            }
            List<String> shadowing = parameter ? shadowingReactions(model, id) : List.of();
            if (!shadowing.isEmpty()) {
                throw UserInputException.of(loc, "estimated parameter '%s' affects nothing: it is shadowed by local "
                        + "parameters of reaction%s %s (a kinetic law's local '%s' hides the global one), and nothing "
                        + "else uses the global '%s'; remove it from parameters, or rename the local parameters in "
                        + "the model", id, shadowing.size() == 1 ? "" : "s", String.join(", ", shadowing), id, id);
            }
            throw UserInputException.of(loc, "estimated parameter '%s' affects nothing: it is %s, and no "
                    + "observable, noise model or experiment of the problem uses it%s; correct the id or remove it",
                    id, parameter ? "a parameter of model " + modelFile + " that no mathematics of the model uses"
                            : "not an entity of model " + modelFile, Spelling.didYouMean(id, candidates(sp, model,
                            modelSymbols)));
        }
    }

    /** Model parameters the model uses and the problem does not estimate yet: what a misspelt id may have meant. */
    private static List<String> candidates(SwitchfitProblem sp, Model model, Set<String> modelSymbols) {
        Set<String> estimated = new HashSet<>();
        sp.parameters().forEach(p -> estimated.add(p.id()));
        List<String> out = new ArrayList<>();
        for (Parameter p : model.parameters()) {
            if (modelSymbols.contains(p.id()) && !estimated.contains(p.id())) {
                out.add(p.id());
            }
        }
        return out;
    }

    /**
     * Where the first dose-response point or threshold with control {@code id} is, when {@code id} is such a control
     * and its estimated value reaches nothing else (those data set the control to each dose, or sweep it to find
     * the fold); null otherwise. Its value is used when an experiment's value or dose reads it, or a noise model,
     * or when a timecourse experiment (or the experiment it settles in), or switching data of another control,
     * runs with the model's value of {@code id}, i.e. without setting it.
     */
    private static SourceLocation controlOnly(SwitchfitProblem sp, String id) {
        SourceLocation first = null;
        for (DoseResponsePoint d : sp.doseResponses()) {
            if (d.control().equals(id)) {
                first = first == null ? d.location() : first;
            } else if (keeps(sp, d.experiment(), id)) {
                return null;
            }
        }
        for (SwitchingThreshold t : sp.thresholds()) {
            if (t.control().equals(id)) {
                first = first == null ? t.location() : first;
            } else if (keeps(sp, t.experiment(), id)) {
                return null;
            }
        }
        if (first == null) {
            return null;
        }
        for (TimecoursePoint tp : sp.timecourses()) {
            Experiment e = sp.experiment(tp.experiment()).orElse(null);
            if (keeps(sp, tp.experiment(), id) || (e != null && e.settleIn() != null && keeps(sp, e.settleIn(), id))) {
                return null;
            }
        }
        Set<String> reads = new HashSet<>();
        for (Experiment e : sp.experiments()) {
            e.parameterValues().values().forEach(v -> add(reads, v));
            e.initialValues().values().forEach(v -> add(reads, v));
            e.doses().forEach(d -> add(reads, d.amount()));
        }
        for (Observable o : sp.observables()) {
            addNoise(reads, o.noise());
        }
        return reads.contains(id) ? null : first;
    }

    /** Whether experiment {@code exp} runs with the problem's (estimated) value of {@code id}: it does not set it. */
    private static boolean keeps(SwitchfitProblem sp, String exp, String id) {
        return sp.experiment(exp).map(e -> !e.parameterValues().containsKey(id)).orElse(false);
    }

    /**
     * "an assignment rule" or "an initial assignment" when the model defines {@code id} that way (its declared
     * value is then never used), else null.
     */
    static String overwrittenBy(Model model, String id) {
        for (Rule r : model.rules()) {
            if (r.kind() == Rule.Kind.ASSIGNMENT && id.equals(r.variable())) {
                return "an assignment rule";
            }
        }
        for (InitialAssignment ia : model.initialAssignments()) {
            if (ia.symbol().equals(id)) {
                return "an initial assignment";
            }
        }
        return null;
    }

    private static boolean isGlobalParameter(Model model, String id) {
        for (Parameter p : model.parameters()) {
            if (p.id().equals(id)) {
                return true;
            }
        }
        return false;
    }

    /** Reactions with a local parameter named {@code id} (stored as {@code reactionId.id}). */
    private static List<String> shadowingReactions(Model model, String id) {
        List<String> out = new ArrayList<>();
        for (Reaction r : model.reactions()) {
            for (Parameter lp : r.localParameters()) {
                if (lp.id().equals(r.id() + "." + id)) {
                    out.add(r.id());
                }
            }
        }
        return out;
    }

    /**
     * Every symbol the model's mathematics reads, plus the variables of rate rules and event assignments (their
     * declared value is the start of their evolution) and conversion factors.
     */
    private static Set<String> modelSymbols(Model model) {
        Set<String> s = new HashSet<>();
        for (Reaction r : model.reactions()) {
            symbols(r.kineticLaw(), s);
            for (List<SpeciesRef> refs : List.of(r.reactants(), r.products())) {
                refs.forEach(ref -> symbols(ref.stoichiometryMath(), s));
            }
        }
        for (Rule r : model.rules()) {
            symbols(r.math(), s);
            if (r.kind() == Rule.Kind.RATE && r.variable() != null) {
                s.add(r.variable());
            }
        }
        for (InitialAssignment ia : model.initialAssignments()) {
            symbols(ia.math(), s);
        }
        for (Event e : model.events()) {
            symbols(e.trigger(), s);
            symbols(e.delay(), s);
            symbols(e.priority(), s);
            for (Event.Assignment a : e.assignments()) {
                symbols(a.math(), s);
                s.add(a.variable());
            }
        }
        if (model.conversionFactor() != null) {
            s.add(model.conversionFactor());
        }
        for (Species sp : model.species()) {
            if (sp.conversionFactor() != null) {
                s.add(sp.conversionFactor());
            }
        }
        return s;
    }

    /** Ids the problem file itself reads as values: observables, noise models, experiment values and doses. */
    private static Set<String> problemSymbols(SwitchfitProblem sp) {
        Set<String> s = new HashSet<>();
        for (Observable o : sp.observables()) {
            SourceLocation loc = o.location() == null ? SourceLocation.ofElement(sp.problemFile().toString(), o.id())
                    : o.location().withElement(o.id());
            symbols(Formulas.parse(o.formula(), loc), s);
            add(s, o.scaleParameter());
            add(s, o.offsetParameter());
            addNoise(s, o.noise());
        }
        for (Experiment e : sp.experiments()) {
            e.parameterValues().values().forEach(v -> add(s, v));
            e.initialValues().values().forEach(v -> add(s, v));
            for (Dose d : e.doses()) {
                add(s, d.amount());
            }
        }
        return s;
    }

    private static void addNoise(Set<String> s, NoiseModel nm) {
        if (nm instanceof NoiseModel.Gaussian g) {
            add(s, g.sigma());
        } else if (nm instanceof NoiseModel.Proportional pr) {
            add(s, pr.absolute());
            add(s, pr.relative());
        } else if (nm instanceof NoiseModel.Laplace lp) {
            add(s, lp.scale());
        } else if (nm instanceof NoiseModel.LogNormal ln) {
            add(s, ln.sigma());
        }
    }

    private static void add(Set<String> s, ValueRef v) {
        if (v != null && !v.isNumber()) {
            s.add(v.parameterId());
        }
    }

    private static void add(Set<String> s, String id) {
        if (id != null) {
            s.add(id);
        }
    }

    private static void symbols(Expr e, Set<String> out) {
        if (e != null) {
            e.forEach(x -> {
                if (x.op() == Op.SYMBOL) {
                    out.add(x.name());
                }
            });
        }
    }
}
