package org.switchfit.problem;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.switchfit.data.Dose;
import org.switchfit.data.EstimatedParameter;
import org.switchfit.data.Experiment;
import org.switchfit.data.NoiseModel;
import org.switchfit.data.Observable;
import org.switchfit.data.ParameterScale;
import org.switchfit.data.SwitchfitProblem;
import org.switchfit.data.TimecoursePoint;
import org.switchfit.data.ValueRef;
import org.switchfit.expr.Expr;
import org.switchfit.expr.Op;
import org.switchfit.model.Model;
import org.switchfit.model.OdeForm;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.ModelCompiler;
import org.switchfit.sbml.Formulas;
import org.switchfit.sbml.SbmlReader;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/** Joins a switchfit problem file to its model (see {@link ProblemLoader#fromSwitchfit}). */
final class SwitchfitJoin {
    private SwitchfitJoin() {
    }

    static EstimationProblem join(SwitchfitProblem sp) {
        Model original = SbmlReader.read(sp.modelFile());
        EstimatedUse.check(sp, original);
        List<FreeParameter> free = new ArrayList<>();
        Map<String, ValueSource> sources = new HashMap<>();
        for (EstimatedParameter p : sp.parameters()) {
            ProblemLoader.checkBounds(p.id(), p.scale(), p.lower(), p.upper(), p.location());
            sources.put(p.id(), ValueSource.ofTheta(free.size()));
            free.add(new FreeParameter(p.id(), p.scale(), p.lower(), p.upper(), p.start(), p.prior(),
                    p.location()));
        }
        Set<String> speciesInit = new LinkedHashSet<>();
        for (Experiment e : sp.experiments()) {
            for (String id : e.initialValues().keySet()) {
                if (original.species(id) != null) {
                    speciesInit.add(id);
                }
            }
        }
        Model model = ProblemLoader.withConditionTargets(original, speciesInit);
        CompiledModel cm = ModelCompiler.compile(model);
        String modelFile = sp.modelFile().toString();
        // every dose is resolved (and checked, even in experiments without data) against the model as read
        Map<String, List<DoseStep>> doses = new HashMap<>();
        boolean anyDose = false;
        for (Experiment ex : sp.experiments()) {
            List<DoseStep> list = new ArrayList<>();
            for (Dose d : ex.doses()) {
                list.add(dose(d, ex.id(), model, cm, sources, modelFile));
            }
            doses.put(ex.id(), list);
            anyDose |= !list.isEmpty();
        }
        Map<String, Map<String, ValueSource>> doseSources = new HashMap<>();
        boolean doseEvents = anyDose && (!cm.form().events().isEmpty() || !cm.form().delaySlots().isEmpty());
        if (doseEvents) {
            model = withDoseEvents(model, sp, sources, cm, doseSources);
            cm = ModelCompiler.compile(model);
        }
        OdeForm form = cm.form();
        int m = cm.parameterCount();
        Map<Integer, ValueSource> baseSources = new LinkedHashMap<>();
        for (EstimatedParameter p : sp.parameters()) {
            int k = cm.parameterIndex(p.id());
            if (k >= 0) {
                baseSources.put(k, sources.get(p.id()));
            }
        }
        double[] base = cm.parameterValues();
        Map<String, Integer> condIndex = new HashMap<>();
        List<Condition> conditions = new ArrayList<>();
        for (Experiment e : sp.experiments()) {
            Map<Integer, ValueSource> src = new LinkedHashMap<>(baseSources);
            List<Integer> reinit = new ArrayList<>();
            for (Map.Entry<String, ValueRef> v : e.parameterValues().entrySet()) {
                int k = cm.parameterIndex(v.getKey());
                requireNotRuleSet(model, v.getKey(), e, modelFile);
                if (k < 0 || model.species(v.getKey()) != null) {
                    throw UserInputException.of(e.location().withElement(v.getKey()), "experiment '%s' sets '%s', "
                            + "which is not a parameter of model %s; use a parameter id (species go under "
                            + "'initial')", e.id(), v.getKey(), modelFile);
                }
                src.put(k, value(v.getValue(), sources, cm, e.location(), e.id()));
            }
            for (Map.Entry<String, ValueRef> v : e.initialValues().entrySet()) {
                String id = v.getKey();
                boolean species = model.species(id) != null;
                int k = cm.parameterIndex(species ? ProblemLoader.INIT_PREFIX + id : id);
                requireNotRuleSet(model, id, e, modelFile);
                if (k < 0 || (!species && model.compartment(id) == null)) {
                    throw UserInputException.of(e.location().withElement(id), "experiment '%s' sets the initial "
                            + "value of '%s', which is not a species or compartment of model %s; correct the id",
                            e.id(), id, modelFile);
                }
                src.put(k, value(v.getValue(), sources, cm, e.location(), e.id()));
                int flag = species ? ProblemLoader.conditionFlag(cm, id) : -1;
                if (flag >= 0) {
                    // the species has an initial assignment in the model: the experiment's value replaces it
                    src.put(flag, ValueSource.ofConstant(1.0));
                }
                if (species && form.stateIndex(id) >= 0) {
                    reinit.add(form.stateIndex(id));
                }
            }
            for (Map.Entry<String, ValueSource> d : doseSources.getOrDefault(e.id(), Map.of()).entrySet()) {
                src.put(cm.parameterIndex(d.getKey()), d.getValue());
            }
            conditions.add(ProblemLoader.condition(e.id(), base, src, reinit));
            condIndex.put(e.id(), conditions.size() - 1);
        }
        List<String> globalIds = new ArrayList<>();
        List<ValueSource> globalSources = new ArrayList<>();
        ProblemLoader.SymbolResolver resolver = new ProblemLoader.SymbolResolver(form, m, globalIds, globalSources,
                sources, 0, 0);
        List<ObservableDef> observables = new ArrayList<>();
        Map<String, Integer> obsIndex = new HashMap<>();
        for (Observable o : sp.observables()) {
            SourceLocation loc = o.location() == null ? SourceLocation.ofElement(sp.problemFile().toString(), o.id())
                    : o.location().withElement(o.id());
            Expr h = resolver.bind(Formulas.parse(o.formula(), loc), o.id(), loc, "formula");
            if (o.scaleParameter() != null) {
                h = Expr.mul(resolver.bind(Expr.symbol(o.scaleParameter()), o.id(), loc, "scale"), h);
            }
            if (o.offsetParameter() != null) {
                h = Expr.add(h, resolver.bind(Expr.symbol(o.offsetParameter()), o.id(), loc, "offset"));
            }
            Expr sigma;
            ParameterScale tr = ParameterScale.LIN;
            ObservableDef.Noise noise = ObservableDef.Noise.NORMAL;
            NoiseModel nm = o.noise();
            if (nm instanceof NoiseModel.Gaussian g) {
                sigma = ref(g.sigma(), resolver, o.id(), loc);
            } else if (nm instanceof NoiseModel.Proportional pr) {
                sigma = Expr.add(ref(pr.absolute(), resolver, o.id(), loc),
                        Expr.mul(ref(pr.relative(), resolver, o.id(), loc), Expr.call(Op.ABS, h)));
            } else if (nm instanceof NoiseModel.Laplace lp) {
                sigma = ref(lp.scale(), resolver, o.id(), loc);
                noise = ObservableDef.Noise.LAPLACE;
            } else {
                sigma = ref(((NoiseModel.LogNormal) nm).sigma(), resolver, o.id(), loc);
                tr = ParameterScale.LOG;
            }
            observables.add(new ObservableDef(o.id(), h, sigma, tr, noise, 0, 0, loc));
            obsIndex.put(o.id(), observables.size() - 1);
        }
        observables = ProblemLoader.finalSlots(observables, m, globalIds.size(), 0);
        Map<String, Integer> expIndex = new LinkedHashMap<>();
        List<int[]> expKeys = new ArrayList<>();
        List<Measurement> meas = new ArrayList<>();
        for (TimecoursePoint tp : sp.timecourses()) {
            Integer o = obsIndex.get(tp.observable());
            Integer c = condIndex.get(tp.experiment());
            if (o == null || c == null) {
                throw UserInputException.of(tp.location(), "refers to %s '%s', which the problem file does not "
                        + "declare; declare it or correct the id", o == null ? "observable" : "experiment",
                        o == null ? tp.observable() : tp.experiment());
            }
            Experiment ex = sp.experiment(tp.experiment()).orElseThrow();
            int pre = ex.settleIn() == null ? -1 : condIndex.getOrDefault(ex.settleIn(), -1);
            if (ex.settleIn() != null && pre < 0) {
                throw UserInputException.of(ex.location(), "experiment '%s' settles in '%s', which is not declared;"
                        + " declare that experiment or correct settle_in", ex.id(), ex.settleIn());
            }
            String key = tp.experiment();
            Integer e = expIndex.get(key);
            if (e == null) {
                e = expIndex.size();
                expIndex.put(key, e);
                expKeys.add(new int[] {c, pre});
            }
            if (observables.get(o).transformation() != ParameterScale.LIN && !(tp.value() > 0)) {
                throw UserInputException.of(tp.location(), "value %s is not positive but observable '%s' has "
                        + "log-normal noise; remove the point or use gaussian noise", tp.value(), tp.observable());
            }
            meas.add(new Measurement(o, e, tp.time(), tp.value(), List.of(), List.of(), tp.sigma(),
                    tp.location()));
        }
        List<Object> extra = new ArrayList<>();
        extra.addAll(sp.doseResponses());
        extra.addAll(sp.thresholds());
        List<java.nio.file.Path> inputs = new ArrayList<>();
        inputs.add(sp.problemFile());
        inputs.add(sp.modelFile());
        for (SwitchfitProblem.DataFile df : sp.dataFiles()) {
            inputs.add(df.file());
        }
        List<SimulationExperiment> experiments = new ArrayList<>();
        for (SimulationExperiment se : ProblemLoader.experiments(expIndex, expKeys, meas)) {
            experiments.add(se.withDoses(doseEvents ? List.of() : doses.get(se.id())));
        }
        return new EstimationProblem(sp.problemFile(), inputs, sp.modelFile(), model, cm, free, conditions,
                experiments, observables, meas, globalIds, globalSources, 0, 0, extra);
    }

    /**
     * The model with each dose of a model that has SBML events (or {@code delay()}) written as an SBML event, so
     * the simulator applies it with its event semantics, sensitivities and ordering: per dose a flag parameter
     * {@code switchfit_doseK_on} (0 in the model, 1 in the dose's experiment, so other experiments never see it)
     * and the event {@code time >= at && flag > 0.5 -> target := amount} (or {@code target + amount}), trigger
     * initially false (a dose at 0 fires at the start). An amount given by an estimated parameter reaches the event
     * through a parameter {@code switchfit_doseK_amount} that the experiment sets to θ. Parameters a dose assigns
     * become non-constant (event targets). {@code out} receives, per experiment, the values its condition sets.
     */
    private static Model withDoseEvents(Model m, SwitchfitProblem sp, Map<String, ValueSource> sources,
                                        CompiledModel cm, Map<String, Map<String, ValueSource>> out) {
        java.util.Set<String> used = new java.util.HashSet<>(cm.form().quantityIds());
        m.events().forEach(e -> used.add(e.id()));
        java.util.Set<String> targets = new java.util.HashSet<>();
        sp.experiments().forEach(e -> e.doses().forEach(d -> targets.add(d.target())));
        List<org.switchfit.model.Parameter> params = new ArrayList<>();
        for (org.switchfit.model.Parameter p : m.parameters()) {
            params.add(targets.contains(p.id()) ? new org.switchfit.model.Parameter(p.id(), p.value(), false) : p);
        }
        List<org.switchfit.model.Compartment> comps = new ArrayList<>();
        for (org.switchfit.model.Compartment c : m.compartments()) {
            comps.add(targets.contains(c.id()) ? new org.switchfit.model.Compartment(c.id(), c.size(),
                    c.spatialDimensions(), false) : c);
        }
        List<org.switchfit.model.Event> events = new ArrayList<>(m.events());
        int k = 0;
        for (Experiment ex : sp.experiments()) {
            Map<String, ValueSource> src = new LinkedHashMap<>();
            for (Dose d : ex.doses()) {
                String base = "switchfit_dose" + (++k);
                while (used.contains(base) || used.contains(base + "_on") || used.contains(base + "_amount")) {
                    base = base + "_";
                }
                String flag = base + "_on";
                params.add(new org.switchfit.model.Parameter(flag, 0.0, true));
                src.put(flag, ValueSource.ofConstant(1.0));
                ValueSource a = ProblemLoader.lookup(d.amount(), sources, cm);
                Expr amount;
                if (a.isTheta()) {
                    String amt = base + "_amount";
                    params.add(new org.switchfit.model.Parameter(amt, 0.0, true));
                    src.put(amt, a);
                    amount = Expr.symbol(amt);
                } else {
                    amount = Expr.constant(a.constant());
                }
                Expr value = d.action() == Dose.Action.ADD ? Expr.add(Expr.symbol(d.target()), amount) : amount;
                Expr trigger = Expr.call(Op.AND, Expr.call(Op.GE, Expr.TIME, Expr.constant(d.time())),
                        Expr.call(Op.GT, Expr.symbol(flag), Expr.constant(0.5)));
                events.add(new org.switchfit.model.Event(base, trigger, false, true, null, null, true,
                        List.of(new org.switchfit.model.Event.Assignment(d.target(), value))));
            }
            out.put(ex.id(), src);
        }
        return new Model(m.id(), m.source(), comps, m.species(), params, m.reactions(), m.rules(),
                m.initialAssignments(), events, m.conversionFactor());
    }

    /**
     * Resolves a dose: a state (species, or a parameter or compartment that is a state), else an entry of the model
     * parameter vector. A species is dosed in its SBML units (concentration unless hasOnlySubstanceUnits), as an
     * SBML event assignment would; when its state is its amount, the amount is converted with the size of its
     * compartment, which must then be a constant compartment. A compartment keeps the amounts of its species (SBML
     * semantics), so one that holds a species whose state is its concentration is refused.
     */
    private static DoseStep dose(Dose d, String exp, Model model, CompiledModel cm, Map<String, ValueSource> sources,
                                 String modelFile) {
        OdeForm form = cm.form();
        String id = d.target();
        SourceLocation loc = d.location();
        ValueSource amount = value(d.amount(), sources, cm, loc, exp);
        boolean add = d.action() == Dose.Action.ADD;
        if (model.compartment(id) != null) {
            for (int i = 0; i < form.stateIds().size(); i++) {
                String sid = form.stateIds().get(i);
                if (form.stateKind(i) == OdeForm.StateKind.SPECIES_CONCENTRATION
                        && model.species(sid).compartment().equals(id)) {
                    throw UserInputException.of(loc, "experiment '%s': a dose to compartment '%s' is not supported "
                            + "because species '%s' in it is integrated as a concentration; dose a parameter "
                            + "instead", exp, id, sid);
                }
            }
        }
        int si = form.stateIndex(id);
        if (si >= 0) {
            int size = -1;
            if (form.stateKind(si) == OdeForm.StateKind.SPECIES_AMOUNT && !model.species(id).hasOnlySubstanceUnits()) {
                String comp = model.species(id).compartment();
                size = cm.parameterIndex(comp);
                if (size < 0 || form.stateIndex(comp) >= 0) {
                    throw UserInputException.of(loc, "experiment '%s': species '%s' is dosed as a concentration but "
                            + "the size of its compartment '%s' changes during the simulation; dose a species in a "
                            + "constant compartment", exp, id, comp);
                }
            }
            return new DoseStep(d.time(), si, -1, add, amount, size, loc);
        }
        int k = cm.parameterIndex(id);
        if (k < 0 || model.species(id) != null) {
            throw UserInputException.of(loc, "experiment '%s': dose target '%s' is not a species, parameter or "
                    + "compartment of model %s that the simulation can change (quantities defined by assignment "
                    + "rules cannot be dosed); correct the target", exp, id, modelFile);
        }
        return new DoseStep(d.time(), -1, k, add, amount, -1, loc);
    }

    /** Refuses an experiment value for a quantity an assignment rule defines (the rule would overwrite it). */
    private static void requireNotRuleSet(Model model, String id, Experiment e, String modelFile) {
        if ("an assignment rule".equals(EstimatedUse.overwrittenBy(model, id))) {
            throw UserInputException.of(e.location().withElement(id), "experiment '%s' sets '%s', which an "
                    + "assignment rule of model %s defines at every time, so the value would be overwritten; set "
                    + "the quantities the rule uses instead", e.id(), id, modelFile);
        }
    }

    private static Expr ref(ValueRef v, ProblemLoader.SymbolResolver r, String obs, SourceLocation loc) {
        if (v.isNumber()) {
            return Expr.constant(v.number());
        }
        return r.bind(Expr.symbol(v.parameterId()), obs, loc, "noise");
    }

    private static ValueSource value(ValueRef v, Map<String, ValueSource> sources, CompiledModel cm,
                                     SourceLocation loc, String exp) {
        ValueSource s = ProblemLoader.lookup(v, sources, cm);
        if (s != null) {
            return s;
        }
        throw UserInputException.of(loc, "experiment '%s' refers to '%s', which is neither an estimated parameter "
                + "nor a model parameter; declare it under 'parameters' or write a number", exp, v.parameterId());
    }
}
