package org.switchfit.problem;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.switchfit.data.ParameterScale;
import org.switchfit.data.PetabCondition;
import org.switchfit.data.PetabMeasurement;
import org.switchfit.data.PetabObservable;
import org.switchfit.data.PetabParameter;
import org.switchfit.data.PetabProblem;
import org.switchfit.data.PetabReader;
import org.switchfit.data.ProblemFileReader;
import org.switchfit.data.SwitchfitProblem;
import org.switchfit.data.ValueRef;
import org.switchfit.expr.Expr;
import org.switchfit.expr.Op;
import org.switchfit.model.InitialAssignment;
import org.switchfit.model.Model;
import org.switchfit.model.OdeForm;
import org.switchfit.model.Parameter;
import org.switchfit.model.Species;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.ModelCompiler;
import org.switchfit.sbml.Formulas;
import org.switchfit.sbml.SbmlReader;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Builds an {@link EstimationProblem} from a PEtab v1 problem (Schmiester et al. 2021, PLoS Comput Biol
 * 17(1):e1008646, doi:10.1371/journal.pcbi.1008646) or from a switchfit problem file.
 *
 * <p>PEtab semantics implemented: parameter-table values (θ for estimate = 1, the nominal value otherwise) for
 * model parameters in every condition; condition-table columns override parameters and compartment sizes
 * directly, and species initial values through an added parameter {@code petab_init__S} with an initial
 * assignment {@code S = petab_init__S} (so the value is in the species' own units); a condition's value replaces
 * the model's initial assignment of its target, NaN keeps the model value, initial assignment included
 * ({@link #withConditionTargets}; after pre-equilibration NaN keeps the pre-equilibrated state);
 * observable and noise formulas over model entities, parameter-table ids and the row-wise placeholders
 * {@code observableParameter{i}_{obs}} / {@code noiseParameter{i}_{obs}}. Stateless.
 */
public final class ProblemLoader {
    /** Prefix of parameters added for condition-table species columns and columns with initial assignments. */
    public static final String INIT_PREFIX = "petab_init__";
    /** Prefix of the flags that choose a condition's value over the model's initial assignment. */
    public static final String SET_PREFIX = "petab_set__";

    private static final Pattern PLACEHOLDER = Pattern.compile("(observable|noise)Parameter(\\d+)_([A-Za-z_][A-Za-z0-9_]*)");

    private ProblemLoader() {
    }

    /**
     * Loads a problem file of either format: a PEtab YAML file (has {@code format_version}) or a switchfit problem
     * file (has {@code switchfit_format}).
     *
     * @throws UserInputException for every invalid input, naming file, row or element and what to do
     */
    public static EstimationProblem load(Path file) {
        String text;
        if (Files.isDirectory(file)) {
            throw new UserInputException(SourceLocation.ofFile(file.toString()), "is a folder, not a problem file; "
                    + "pass the problem YAML file");
        }
        try {
            text = Files.readString(file, StandardCharsets.UTF_8);
        } catch (java.nio.charset.CharacterCodingException e) {
            throw new UserInputException(SourceLocation.ofFile(file.toString()), "the problem file is not UTF-8 "
                    + "text; pass the problem YAML file, saved as UTF-8", e);
        } catch (IOException e) {
            throw new UserInputException(SourceLocation.ofFile(file.toString()), "cannot read the problem file ("
                    + e.getMessage() + "); check the path", e);
        }
        if (text.contains("switchfit_format")) {
            return fromSwitchfit(ProblemFileReader.read(file));
        }
        if (text.contains("format_version")) {
            return fromPetab(PetabReader.read(file));
        }
        throw new UserInputException(SourceLocation.ofFile(file.toString()), "is neither a PEtab problem (no "
                + "format_version) nor a switchfit problem file (no switchfit_format); pass the problem YAML file");
    }

    // ------------------------------------------------------------------------------------------------ PEtab

    /** Joins a PEtab problem to its model. */
    public static EstimationProblem fromPetab(PetabProblem pp) {
        String yaml = pp.yamlFile().toString();
        if (pp.sbmlFiles().size() != 1) {
            throw UserInputException.of(SourceLocation.ofFile(yaml), "lists %d SBML files; give exactly one "
                    + "sbml_files entry", pp.sbmlFiles().size());
        }
        Path sbml = pp.sbmlFiles().get(0);
        Model original = SbmlReader.read(sbml);

        Map<String, PetabParameter> table = new LinkedHashMap<>();
        List<FreeParameter> free = new ArrayList<>();
        Map<String, ValueSource> sources = new HashMap<>();
        for (PetabParameter p : pp.parameters()) {
            table.put(p.id(), p);
            if (original.species(p.id()) != null) {
                // the row would otherwise have no effect at all
                throw UserInputException.of(p.location(), "parameter table row '%s' names a species of the model; "
                        + "PEtab v1 sets species values in the condition table: remove the row and add a column '%s' "
                        + "to the condition table (its value may be a parameter-table id to estimate it)", p.id(),
                        p.id());
            }
            if (p.estimate()) {
                checkBounds(p.id(), p.scale(), p.lower(), p.upper(), p.location());
                double nominal = Double.isFinite(p.nominal()) ? p.nominal()
                        : p.scale().toLinear(0.5 * (p.scale().toScale(p.lower()) + p.scale().toScale(p.upper())));
                FreeParameter fp = new FreeParameter(p.id(), p.scale(), p.lower(), p.upper(), nominal,
                        p.objectivePrior(), p.location());
                if (!(fp.thetaFeasibleLower() < fp.thetaFeasibleUpper())) {
                    throw UserInputException.of(p.location(), "parameter '%s': the support [%s, %s] of its %s prior "
                            + "does not overlap its bounds [%s, %s], so the prior density is 0 everywhere; correct "
                            + "objectivePriorParameters or the bounds", p.id(), p.objectivePrior().parameter(0),
                            p.objectivePrior().parameter(1), p.objectivePrior().type().petabName(), p.lower(),
                            p.upper());
                }
                sources.put(p.id(), ValueSource.ofTheta(free.size()));
                free.add(fp);
            } else {
                if (!Double.isFinite(p.nominal())) {
                    throw UserInputException.of(p.location(), "parameter '%s' is not estimated but has no finite "
                            + "nominalValue; give its value in column nominalValue", p.id());
                }
                sources.put(p.id(), ValueSource.ofConstant(p.nominal()));
            }
        }

        // Condition columns: species and targets of initial assignments get added parameters.
        Set<String> columns = new LinkedHashSet<>();
        for (PetabCondition c : pp.conditions()) {
            columns.addAll(c.values().keySet());
        }
        Model model = withConditionTargets(original, columns);
        CompiledModel cm = ModelCompiler.compile(model);
        OdeForm form = cm.form();
        int m = cm.parameterCount();

        double[] base = cm.parameterValues();
        Map<Integer, ValueSource> baseSources = new LinkedHashMap<>();
        for (PetabParameter p : pp.parameters()) {
            int k = cm.parameterIndex(p.id());
            if (k >= 0) {
                baseSources.put(k, sources.get(p.id()));
            }
        }
        Map<String, Integer> condIndex = new HashMap<>();
        List<Condition> conditions = new ArrayList<>();
        for (PetabCondition c : pp.conditions()) {
            if (condIndex.containsKey(c.id())) {
                throw UserInputException.of(c.location(), "condition '%s' is defined twice; keep one row per "
                        + "conditionId", c.id());
            }
            Map<Integer, ValueSource> src = new LinkedHashMap<>(baseSources);
            List<Integer> reinit = new ArrayList<>();
            for (Map.Entry<String, ValueRef> e : c.values().entrySet()) {
                String col = e.getKey();
                ValueRef v = e.getValue();
                boolean species = model.species(col) != null;
                int k = cm.parameterIndex(conditionTarget(cm, col));
                if (k < 0) {
                    // the column is the problem, so the location is the header line
                    SourceLocation header = SourceLocation.ofLine(c.location().file(), 1).withElement(col);
                    throw UserInputException.of(header, "condition table column '%s' is not "
                            + "a parameter, species or compartment of the model that a condition can set; remove "
                            + "the column or correct the id", col);
                }
                if (v.isNumber() && Double.isNaN(v.number())) {
                    continue;
                }
                src.put(k, resolve(v, sources, cm, c.location().withElement(col), "condition '" + c.id() + "'"));
                int flag = conditionFlag(cm, col);
                if (flag >= 0) {
                    src.put(flag, ValueSource.ofConstant(1.0));
                }
                if (species && form.stateIndex(col) >= 0) {
                    reinit.add(form.stateIndex(col));
                }
            }
            conditions.add(condition(c.id(), base, src, reinit));
            condIndex.put(c.id(), conditions.size() - 1);
        }

        // Observables.
        Map<String, Integer> obsIndex = new HashMap<>();
        List<ObservableDef> observables = new ArrayList<>();
        int maxObs = 0;
        int maxNoise = 0;
        for (PetabObservable o : pp.observables()) {
            maxObs = Math.max(maxObs, placeholderCount(o.formula(), "observable", o.id(), sources.keySet()));
            maxNoise = Math.max(maxNoise, placeholderCount(o.noiseFormula(), "noise", o.id(), sources.keySet()));
        }
        List<String> globalIds = new ArrayList<>();
        List<ValueSource> globalSources = new ArrayList<>();
        SymbolResolver resolver = new SymbolResolver(form, m, globalIds, globalSources, sources, maxObs, maxNoise);
        for (PetabObservable o : pp.observables()) {
            if (obsIndex.containsKey(o.id())) {
                throw UserInputException.of(o.location(), "observable '%s' is defined twice; keep one row per "
                        + "observableId", o.id());
            }
            SourceLocation loc = o.location().withElement(o.id());
            Expr h = resolver.bind(Formulas.parse(o.formula(), loc), o.id(), loc, "observableFormula");
            Expr s = resolver.bind(Formulas.parse(o.noiseFormula(), loc), o.id(), loc, "noiseFormula");
            ObservableDef.Noise noise = o.noiseDistribution() == PetabObservable.NoiseDistribution.LAPLACE
                    ? ObservableDef.Noise.LAPLACE : ObservableDef.Noise.NORMAL;
            observables.add(new ObservableDef(o.id(), h, s, o.transformation(), noise,
                    placeholderCount(o.formula(), "observable", o.id(), sources.keySet()),
                    placeholderCount(o.noiseFormula(), "noise", o.id(), sources.keySet()), o.location()));
            obsIndex.put(o.id(), observables.size() - 1);
        }
        observables = finalSlots(observables, m, globalIds.size(), maxObs);

        // Measurements and experiments.
        Map<String, Integer> expIndex = new LinkedHashMap<>();
        List<int[]> expKeys = new ArrayList<>();
        List<Measurement> meas = new ArrayList<>();
        for (PetabMeasurement r : pp.measurements()) {
            Integer o = obsIndex.get(r.observableId());
            if (o == null) {
                throw UserInputException.of(r.location(), "observableId '%s' is not in the observable table; add "
                        + "it there or correct the id", r.observableId());
            }
            Integer sc = condIndex.get(r.simulationConditionId());
            if (sc == null) {
                throw UserInputException.of(r.location(), "simulationConditionId '%s' is not in the condition "
                        + "table; add the condition or correct the id", r.simulationConditionId());
            }
            int pre = -1;
            if (r.preequilibrationConditionId() != null) {
                Integer pc = condIndex.get(r.preequilibrationConditionId());
                if (pc == null) {
                    throw UserInputException.of(r.location(), "preequilibrationConditionId '%s' is not in the "
                            + "condition table; add the condition or correct the id",
                            r.preequilibrationConditionId());
                }
                pre = pc;
            }
            String key = (pre >= 0 ? conditions.get(pre).id() + ":" : "") + conditions.get(sc).id();
            Integer e = expIndex.get(key);
            if (e == null) {
                e = expIndex.size();
                expIndex.put(key, e);
                expKeys.add(new int[] {sc, pre});
            }
            ObservableDef od = observables.get(o);
            List<ValueSource> op = overrides(r.observableParameters(), od.obsPlaceholders(), sources, cm,
                    r.location(), "observableParameters", od.id());
            List<ValueSource> np = overrides(r.noiseParameters(), od.noisePlaceholders(), sources, cm,
                    r.location(), "noiseParameters", od.id());
            if (od.transformation() != ParameterScale.LIN && !(r.value() > 0)) {
                throw UserInputException.of(r.location(), "measurement %s of observable '%s' is not positive but "
                        + "the observable is %s-transformed; remove the row or use observableTransformation lin",
                        r.value(), od.id(), od.transformation().token());
            }
            if (!Double.isFinite(r.value())) {
                throw UserInputException.of(r.location(), "measurement '%s' is not a finite number; remove the row "
                        + "or give a value", r.value());
            }
            meas.add(new Measurement(o, e, r.time(), r.value(), op, np, Double.NaN, r.location()));
        }
        List<SimulationExperiment> experiments = experiments(expIndex, expKeys, meas);
        List<Path> inputs = new ArrayList<>();
        inputs.add(pp.yamlFile());
        inputs.add(sbml);
        inputs.addAll(tableFiles(pp));
        List<String> notes = new ArrayList<>(pp.notes());
        notes.addAll(missingNominalNotes(pp, free));
        notes.addAll(unusedParameterNotes(free, conditions, globalSources, meas));
        return new EstimationProblem(pp.yamlFile(), inputs, sbml, model, cm, free, conditions, experiments,
                observables, meas, globalIds, globalSources, maxObs, maxNoise, List.of(), notes);
    }

    /** One note per estimated parameter without a nominal value: what check and --nominal-start use instead. */
    private static List<String> missingNominalNotes(PetabProblem pp, List<FreeParameter> free) {
        List<String> out = new ArrayList<>();
        int j = 0;
        for (PetabParameter p : pp.parameters()) {
            if (!p.estimate()) {
                continue;
            }
            if (!Double.isFinite(p.nominal())) {
                out.add(String.format(java.util.Locale.ROOT, "%s: estimated parameter '%s' has no nominalValue; "
                        + "check evaluates at (and fit --nominal-start starts from) the midpoint of its bounds on its "
                        + "%s scale, %.6g", p.location(), p.id(), p.scale().token(), free.get(j).nominal()));
            }
            j++;
        }
        return out;
    }

    /**
     * One note per estimated parameter that nothing reads: no condition passes it to the model (parameter-table ids
     * of model parameters, condition-table values), no observable or noise formula names it, no measurement row
     * overrides a placeholder with it. The data cannot determine such a parameter.
     */
    private static List<String> unusedParameterNotes(List<FreeParameter> free, List<Condition> conditions,
                                                     List<ValueSource> globalSources, List<Measurement> meas) {
        boolean[] used = new boolean[free.size()];
        for (Condition c : conditions) {
            for (int i = 0; i < c.targetCount(); i++) {
                used[c.targetTheta(i)] = true;
            }
        }
        List<ValueSource> reads = new ArrayList<>(globalSources);
        for (Measurement me : meas) {
            reads.addAll(me.obsParameters());
            reads.addAll(me.noiseParameters());
        }
        for (ValueSource v : reads) {
            if (v.isTheta()) {
                used[v.thetaIndex()] = true;
            }
        }
        List<String> out = new ArrayList<>();
        for (int j = 0; j < used.length; j++) {
            if (!used[j]) {
                out.add(String.format(java.util.Locale.ROOT, "%s: estimated parameter '%s' is used by no model "
                        + "element, observable or noise formula, condition or measurement row, so the data cannot "
                        + "determine it; correct its id, or remove the row", free.get(j).location(), free.get(j).id()));
            }
        }
        return out;
    }

    private static List<Path> tableFiles(PetabProblem pp) {
        List<Path> out = new ArrayList<>();
        try {
            Path base = pp.yamlFile().toAbsolutePath().getParent();
            String yaml = Files.readString(pp.yamlFile(), StandardCharsets.UTF_8);
            Matcher mt = Pattern.compile("([A-Za-z0-9_./-]+\\.(tsv|TSV))").matcher(yaml);
            Set<String> seen = new LinkedHashSet<>();
            while (mt.find()) {
                if (seen.add(mt.group(1))) {
                    Path p = base.resolve(mt.group(1));
                    if (Files.isRegularFile(p)) {
                        out.add(p);
                    }
                }
            }
        } catch (IOException e) {
            throw new UserInputException(SourceLocation.ofFile(pp.yamlFile().toString()), "cannot read again ("
                    + e.getMessage() + ")", e);
        }
        return out;
    }

    static List<SimulationExperiment> experiments(Map<String, Integer> expIndex, List<int[]> keys,
                                                  List<Measurement> meas) {
        List<List<Integer>> rows = new ArrayList<>();
        for (int i = 0; i < keys.size(); i++) {
            rows.add(new ArrayList<>());
        }
        for (int i = 0; i < meas.size(); i++) {
            rows.get(meas.get(i).experiment()).add(i);
        }
        List<SimulationExperiment> out = new ArrayList<>();
        List<String> names = new ArrayList<>(expIndex.keySet());
        for (int e = 0; e < keys.size(); e++) {
            List<Integer> r = rows.get(e);
            r.sort((a, b) -> Double.compare(meas.get(a).time(), meas.get(b).time()));
            out.add(new SimulationExperiment(names.get(e), keys.get(e)[0], keys.get(e)[1], Condition.ints(r)));
        }
        return out;
    }

    static void checkBounds(String id, ParameterScale scale, double lo, double hi, SourceLocation loc) {
        if (!Double.isFinite(lo) || !Double.isFinite(hi) || !(lo < hi)) {
            throw UserInputException.of(loc, "estimated parameter '%s' needs finite bounds with lowerBound < "
                    + "upperBound (got %s, %s); correct lowerBound/upperBound", id, lo, hi);
        }
        if (scale.needsPositive() && !(lo > 0)) {
            throw UserInputException.of(loc, "estimated parameter '%s': lower bound %s is impossible on %s scale; "
                    + "use a positive bound such as 1e-8, or scale lin", id, lo, scale.token());
        }
    }

    static Condition condition(String id, double[] base, Map<Integer, ValueSource> src, List<Integer> reinit) {
        double[] b = base.clone();
        List<Integer> targets = new ArrayList<>();
        List<Integer> thetas = new ArrayList<>();
        for (Map.Entry<Integer, ValueSource> e : src.entrySet()) {
            if (e.getValue().isTheta()) {
                targets.add(e.getKey());
                thetas.add(e.getValue().thetaIndex());
            } else {
                b[e.getKey()] = e.getValue().constant();
            }
        }
        return new Condition(id, b, Condition.ints(targets), Condition.ints(thetas), Condition.ints(reinit));
    }

    /**
     * The value a number or parameter id stands for: the number, the parameter's source (estimated or fixed in the
     * problem), else the model parameter's own value; null when the id is none of these.
     */
    static ValueSource lookup(ValueRef v, Map<String, ValueSource> sources, CompiledModel cm) {
        if (v.isNumber()) {
            return ValueSource.ofConstant(v.number());
        }
        ValueSource s = sources.get(v.parameterId());
        if (s != null) {
            return s;
        }
        int k = cm.parameterIndex(v.parameterId());
        return k >= 0 ? ValueSource.ofConstant(cm.parameterValues()[k]) : null;
    }

    private static ValueSource resolve(ValueRef v, Map<String, ValueSource> sources, CompiledModel cm,
                                       SourceLocation loc, String where) {
        ValueSource s = lookup(v, sources, cm);
        if (s != null) {
            return s;
        }
        throw UserInputException.of(loc, "%s refers to '%s', which is neither in the parameter table nor a "
                + "model parameter; add it to the parameter table or write a number", where, v.parameterId());
    }

    private static List<ValueSource> overrides(List<ValueRef> values, int expected, Map<String, ValueSource> sources,
                                               CompiledModel cm, SourceLocation loc, String column, String obs) {
        if (values.size() != expected && !(expected == 0 && values.size() == 1 && values.get(0).isNumber()
                && Double.isNaN(values.get(0).number()))) {
            throw UserInputException.of(loc, "column '%s' gives %d values but observable '%s' has %d placeholders; "
                    + "give exactly %d values separated by ';'", column, values.size(), obs, expected, expected);
        }
        List<ValueSource> out = new ArrayList<>();
        for (int i = 0; i < expected; i++) {
            out.add(resolve(values.get(i), sources, cm, loc, "column '" + column + "'"));
        }
        return out;
    }

    private static int placeholderCount(String formula, String kind, String obsId, Set<String> tableIds) {
        int max = 0;
        Matcher mt = PLACEHOLDER.matcher(formula == null ? "" : formula);
        while (mt.find()) {
            if (mt.group(1).equals(kind) && mt.group(3).equals(obsId) && !tableIds.contains(mt.group())) {
                max = Math.max(max, Integer.parseInt(mt.group(2)));
            }
        }
        return max;
    }

    /**
     * Prepares a model for values set per condition (PEtab condition-table columns, initial values of switchfit
     * experiments). A species column gets a parameter {@code petab_init__S} holding its declared initial value (in
     * the species' own units, NaN when it declares none) and the initial assignment {@code S = petab_init__S}.
     * When the model sets the column's target (species, parameter or compartment) by an initial assignment, the
     * target gets {@code petab_init__X} and a flag {@code petab_set__X} (declared 0) instead, and its assignment
     * becomes {@code piecewise(petab_init__X, petab_set__X > 0.5, original)}: a condition that gives a value
     * writes it to {@code petab_init__X} and sets the flag to 1; one that gives NaN leaves the flag at 0, so the
     * model's initial assignment applies (PEtab v1: NaN keeps the model's value; SBML: an initial assignment
     * overrides the declared value). Both are declared parameters, the flag a constant per condition, so initial
     * sensitivities through the initial block stay exact on either branch. Other columns are set directly.
     * Where a condition's value goes: {@link #conditionTarget}; its flag: {@link #conditionFlag}.
     */
    static Model withConditionTargets(Model m, Set<String> columns) {
        List<Parameter> params = new ArrayList<>(m.parameters());
        Map<String, InitialAssignment> modelIas = new HashMap<>();
        for (InitialAssignment ia : m.initialAssignments()) {
            modelIas.put(ia.symbol(), ia);
        }
        Map<String, InitialAssignment> replaced = new HashMap<>();
        List<InitialAssignment> added = new ArrayList<>();
        for (String col : columns) {
            Species s = m.species(col);
            InitialAssignment original = modelIas.get(col);
            if (s == null && original == null) {
                continue;
            }
            params.add(new Parameter(INIT_PREFIX + col, declaredValue(m, col), true));
            Expr value = Expr.symbol(INIT_PREFIX + col);
            if (original == null) {
                added.add(new InitialAssignment(col, value));
                continue;
            }
            params.add(new Parameter(SET_PREFIX + col, 0.0, true));
            replaced.put(col, new InitialAssignment(col, Expr.call(Op.PIECEWISE, value,
                    Expr.call(Op.GT, Expr.symbol(SET_PREFIX + col), Expr.constant(0.5)), original.math())));
        }
        if (replaced.isEmpty() && added.isEmpty()) {
            return m;
        }
        List<InitialAssignment> ias = new ArrayList<>(added);
        for (InitialAssignment ia : m.initialAssignments()) {
            ias.add(replaced.getOrDefault(ia.symbol(), ia));
        }
        return new Model(m.id(), m.source(), m.compartments(), m.species(), params, m.reactions(), m.rules(), ias,
                m.events(), m.conversionFactor());
    }

    /** The declared value of a species (its own units), parameter or compartment; NaN when none is declared. */
    private static double declaredValue(Model m, String id) {
        Species s = m.species(id);
        if (s == null) {
            for (Parameter p : m.parameters()) {
                if (p.id().equals(id)) {
                    return p.value();
                }
            }
            return m.compartment(id) != null ? m.compartment(id).size() : Double.NaN;
        }
        double size = m.compartment(s.compartment()) != null ? m.compartment(s.compartment()).size() : Double.NaN;
        if (s.hasOnlySubstanceUnits()) {
            return !Double.isNaN(s.initialAmount()) ? s.initialAmount() : s.initialConcentration() * size;
        }
        return !Double.isNaN(s.initialConcentration()) ? s.initialConcentration() : s.initialAmount() / size;
    }

    /** The parameter a condition's value of {@code column} is written to (see {@link #withConditionTargets}). */
    static String conditionTarget(CompiledModel cm, String column) {
        return cm.parameterIndex(INIT_PREFIX + column) >= 0 ? INIT_PREFIX + column : column;
    }

    /**
     * Index of the flag a condition that gives a value of {@code column} sets to 1 (see
     * {@link #withConditionTargets}), or -1 when the column has none.
     */
    static int conditionFlag(CompiledModel cm, String column) {
        return cm.parameterIndex(SET_PREFIX + column);
    }

    // ------------------------------------------------------------------------------------------------ switchfit

    /** Joins a switchfit problem to its model. */
    public static EstimationProblem fromSwitchfit(SwitchfitProblem sp) {
        return SwitchfitJoin.join(sp);
    }

    /** Binds symbols of observable and noise formulas to runtime leaves. */
    static final class SymbolResolver {
        private final OdeForm form;
        private final int m;
        private final List<String> globalIds;
        private final List<ValueSource> globalSources;
        private final Map<String, ValueSource> sources;
        private final int maxObs;

        SymbolResolver(OdeForm form, int m, List<String> globalIds, List<ValueSource> globalSources,
                       Map<String, ValueSource> sources, int maxObs, int maxNoise) {
            this.form = form;
            this.m = m;
            this.globalIds = globalIds;
            this.globalSources = globalSources;
            this.sources = sources;
            this.maxObs = maxObs;
        }

        Expr bind(Expr e, String obsId, SourceLocation loc, String column) {
            return e.mapLeaves(x -> {
                if (x.op() != Op.SYMBOL) {
                    return x;
                }
                String nm = x.name();
                Matcher mt = PLACEHOLDER.matcher(nm);
                // a parameter-table id is a parameter even when it looks like a placeholder
                if (mt.matches() && !sources.containsKey(nm)) {
                    if (!mt.group(3).equals(obsId)) {
                        throw UserInputException.of(loc, "%s uses '%s', a placeholder of another observable; use "
                                + "placeholders ending in _%s", column, nm, obsId);
                    }
                    int i = Integer.parseInt(mt.group(2)) - 1;
                    if (i < 0) {
                        throw UserInputException.of(loc, "%s uses '%s'; placeholders count from 1", column, nm);
                    }
                    return Expr.param(mt.group(1).equals("observable") ? PLACEHOLDER_MARK + i
                            : PLACEHOLDER_MARK + NOISE_MARK + i, nm);
                }
                if (form.quantityIds().contains(nm)) {
                    return form.symbolValue(nm);
                }
                ValueSource s = sources.get(nm);
                if (s != null) {
                    int g = globalIds.indexOf(nm);
                    if (g < 0) {
                        globalIds.add(nm);
                        globalSources.add(s);
                        g = globalIds.size() - 1;
                    }
                    return Expr.param(GLOBAL_MARK + g, nm);
                }
                if (nm.equals("time") || nm.equals("t")) {
                    return Expr.TIME;
                }
                throw UserInputException.of(loc, "%s uses '%s', which is neither a model entity nor a parameter-"
                        + "table id; add it to the parameter table or correct the formula", column, nm);
            });
        }

        int maxObs() {
            return maxObs;
        }
    }

    /** Replaces the temporary slot markers by final q indices (layout in {@link EstimationProblem}). */
    static List<ObservableDef> finalSlots(List<ObservableDef> defs, int m, int globals, int maxObs) {
        List<ObservableDef> out = new ArrayList<>();
        for (ObservableDef d : defs) {
            out.add(new ObservableDef(d.id(), finalSlots(d.prediction(), m, globals, maxObs),
                    finalSlots(d.sigma(), m, globals, maxObs), d.transformation(), d.noise(), d.obsPlaceholders(),
                    d.noisePlaceholders(), d.location()));
        }
        return out;
    }

    private static Expr finalSlots(Expr e, int m, int globals, int maxObs) {
        return e.mapLeaves(x -> {
            if (x.op() != Op.PARAM || x.index() < NOISE_MARK) {
                return x;
            }
            int k = x.index();
            int q;
            if (k >= PLACEHOLDER_MARK + NOISE_MARK) {
                q = m + globals + maxObs + (k - PLACEHOLDER_MARK - NOISE_MARK);
            } else if (k >= PLACEHOLDER_MARK) {
                q = m + globals + (k - PLACEHOLDER_MARK);
            } else {
                q = m + (k - GLOBAL_MARK);
            }
            return Expr.param(q, x.name());
        });
    }

    /** Temporary markers for q slots whose final index is known only after all formulas are read. */
    static final int GLOBAL_MARK = 1 << 24;
    static final int PLACEHOLDER_MARK = 1 << 25;
    static final int NOISE_MARK = 1 << 23;
}
