package org.switchfit.data;

import java.io.IOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.NoSuchFileException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashMap;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Set;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Reader for PEtab v1 problems (https://petab.readthedocs.io, format_version 1; Schmiester et al. 2021,
 * doi:10.1371/journal.pcbi.1008646): the YAML file and the tab-separated condition, measurement, observable and
 * parameter tables, plus simulated-data tables.
 *
 * <p>Tables may carry extra columns (PEtab v1 allows them); they are ignored. Within the problem, measurement
 * rows must refer to declared observables and conditions, and ids must be unique per table. Errors are
 * {@link UserInputException}s with file, line and column. Stateless and thread-safe.
 */
public final class PetabReader {

    static final List<String> TOP_KEYS = List.of("format_version", "parameter_file", "problems", "extensions");
    static final List<String> PROBLEM_KEYS = List.of("sbml_files", "condition_files", "measurement_files",
            "observable_files", "visualization_files", "mapping_files");

    /** Standard columns of the tables (PEtab v1 specification, from memory). */
    static final List<String> PARAMETER_COLUMNS = List.of("parameterId", "parameterName", "parameterScale",
            "lowerBound", "upperBound", "nominalValue", "estimate", "initializationPriorType",
            "initializationPriorParameters", "objectivePriorType", "objectivePriorParameters");
    static final List<String> CONDITION_COLUMNS = List.of("conditionId", "conditionName");
    static final List<String> MEASUREMENT_COLUMNS = List.of("observableId", "preequilibrationConditionId",
            "simulationConditionId", "measurement", "time", "observableParameters", "noiseParameters", "datasetId",
            "replicateId");
    static final List<String> OBSERVABLE_COLUMNS = List.of("observableId", "observableName", "observableFormula",
            "observableTransformation", "noiseFormula", "noiseDistribution");

    private PetabReader() {
    }

    /**
     * Adds a note for each column that is not a standard column of its table but close to one (equal ignoring case,
     * or within an edit distance of 2): PEtab allows extra columns, so such a column is read as an extra one and
     * the standard column it was meant to be is missing; likely a typo.
     */
    static void noteNearColumns(TextTable t, List<String> standard, List<String> notes) {
        for (String c : t.columns()) {
            if (standard.contains(c)) {
                continue;
            }
            for (String s : standard) {
                if (Spelling.distance(c.toLowerCase(java.util.Locale.ROOT), s.toLowerCase(java.util.Locale.ROOT))
                        <= 2) {
                    notes.add(String.format(java.util.Locale.ROOT, "%s: column '%s' is not a PEtab column and is "
                            + "ignored as an extra column; did you mean '%s'? (rename it if so)",
                            t.headerLocation(), Messages.shown(c), s));
                    break;
                }
            }
        }
    }

    /** Reads the problem described by a PEtab v1 YAML file and all tables it lists. */
    public static PetabProblem read(Path yamlFile) {
        String src = yamlFile.toString();
        String content;
        try {
            content = Files.readString(yamlFile, StandardCharsets.UTF_8);
        } catch (NoSuchFileException e) {
            throw new UserInputException(SourceLocation.ofFile(src), "PEtab problem file not found; check the path",
                    e);
        } catch (IOException e) {
            throw new UserInputException(SourceLocation.ofFile(src),
                    "cannot read PEtab problem file (" + e.getMessage() + "); check that it is readable UTF-8", e);
        }
        YamlNode root = YamlNode.parse(content, src);
        root.requireMap("format_version: 1");
        List<String> notes = new ArrayList<>();
        noteUnknownKeys(root, TOP_KEYS, notes);
        refuseIfGiven(root, "extensions", "this reader implements PEtab v1 without extensions; remove the key and"
                + " what depends on it, or use a tool that supports the extension");
        YamlNode version = root.require("format_version", "1");
        String v = version.scalar("1").strip();
        if (!(v.equals("1") || v.startsWith("1.") || v.equals("1.0"))) {
            throw Messages.error(version.location(), "format_version '%s' is not supported; this reader"
                    + " reads PEtab format_version 1", v);
        }
        Path base = yamlFile.toAbsolutePath().getParent();
        List<PetabParameter> parameters = new ArrayList<>();
        for (Path p : files(base, root, "parameter_file", true)) {
            parameters.addAll(readParameters(p, notes));
        }
        checkUniqueIds(parameters, PetabParameter::id, PetabParameter::location, "parameter");
        List<Path> sbml = new ArrayList<>();
        List<PetabCondition> conditions = new ArrayList<>();
        List<PetabMeasurement> measurements = new ArrayList<>();
        List<PetabObservable> observables = new ArrayList<>();
        List<Path> visualization = new ArrayList<>();
        for (YamlNode item : root.require("problems", "[{sbml_files: [model.xml], ...}]")
                .requireList("[{sbml_files: [model.xml], condition_files: [conditions.tsv]}]")) {
            item.requireMap("{sbml_files: [model.xml], condition_files: [conditions.tsv]}");
            noteUnknownKeys(item, PROBLEM_KEYS, notes);
            sbml.addAll(files(base, item, "sbml_files", true));
            for (Path p : files(base, item, "condition_files", true)) {
                conditions.addAll(readConditions(p, notes));
            }
            for (Path p : files(base, item, "measurement_files", true)) {
                measurements.addAll(readMeasurements(p, notes));
            }
            for (Path p : files(base, item, "observable_files", true)) {
                observables.addAll(readObservables(p, notes));
            }
            visualization.addAll(files(base, item, "visualization_files", false));
            refuseIfGiven(item, "mapping_files", "mapping tables are not applied by this reader; remove the key and"
                    + " write the model's ids in the tables");
        }
        checkUniqueIds(conditions, PetabCondition::id, PetabCondition::location, "condition");
        checkUniqueIds(observables, PetabObservable::id, PetabObservable::location, "observable");
        checkReferences(measurements, conditions, observables);
        checkOverrideIds(measurements, parameters);
        return new PetabProblem(yamlFile, 1, parameters, sbml, conditions, measurements, observables, visualization,
                notes);
    }

    /**
     * Refuses a key whose content this reader would otherwise ignore silently (an empty value is allowed: it asks
     * for nothing).
     */
    private static void refuseIfGiven(YamlNode map, String key, String hint) {
        if (!map.has(key)) {
            return;
        }
        YamlNode n = map.get(key);
        boolean empty = switch (n.kind()) {
            case NULL -> true;
            case LIST -> n.requireList("[]").isEmpty();
            case MAP -> n.entries().isEmpty();
            case SCALAR -> n.scalar("").isBlank();
        };
        if (!empty) {
            throw Messages.error(n.location(), "key '%s' is not supported: " + hint, key);
        }
    }

    private static void noteUnknownKeys(YamlNode map, List<String> allowed, List<String> notes) {
        for (String k : map.entries().keySet()) {
            if (!allowed.contains(k)) {
                notes.add(map.location() + ": key '" + k + "' is not a PEtab v1 key and was ignored"
                        + Spelling.didYouMean(k, allowed));
            }
        }
    }

    private static List<Path> files(Path base, YamlNode parent, String key, boolean mustExist) {
        List<Path> out = new ArrayList<>();
        if (!parent.has(key)) {
            return out;
        }
        YamlNode n = parent.get(key);
        List<YamlNode> items = n.kind() == YamlNode.Kind.LIST ? n.requireList("[file.tsv]") : List.of(n);
        for (YamlNode item : items) {
            String name = item.scalar("file.tsv");
            Path p = base.resolve(name).normalize();
            if (mustExist && !Files.isRegularFile(p)) {
                throw Messages.error(item.location(), "%s entry '%s' does not exist (looked for %s); correct"
                        + " the path, which is relative to the YAML file's folder", key, name, p);
            }
            out.add(p);
        }
        return out;
    }

    /** Reads a PEtab v1 parameter table. */
    public static List<PetabParameter> readParameters(Path file) {
        return readParameters(file, new ArrayList<>());
    }

    /** Reads a parameter table, adding a note for each column that looks like a misspelt standard column. */
    static List<PetabParameter> readParameters(Path file, List<String> notes) {
        TextTable t = DelimitedReader.read(file, '\t');
        noteNearColumns(t, PARAMETER_COLUMNS, notes);
        t.requireColumns("PEtab parameter table", "parameterId", "parameterScale", "lowerBound", "upperBound",
                "nominalValue", "estimate");
        List<PetabParameter> out = new ArrayList<>();
        for (TextTable.Row r : t.rows()) {
            String id = r.requireText("parameterId");
            String scaleText = r.requireText("parameterScale");
            ParameterScale scale = ParameterScale.fromToken(scaleText);
            if (scale == null) {
                throw Messages.error(r.location("parameterScale"), "parameter '%s': parameterScale '%s' is"
                        + " unknown; use lin, log or log10", id, scaleText);
            }
            String est = r.requireText("estimate");
            // numeric comparison: tables written by dataframe tools contain 1.0 and 0.0
            double estValue = DataNumbers.isNumber(est) ? DataNumbers.parse(est) : Double.NaN;
            if (estValue != 0 && estValue != 1) {
                throw Messages.error(r.location("estimate"), "parameter '%s': estimate '%s' must be 0 (fixed)"
                        + " or 1 (estimated)", id, est);
            }
            boolean estimate = estValue == 1;
            double lower = r.number("lowerBound", Double.NaN);
            double upper = r.number("upperBound", Double.NaN);
            double nominal = r.number("nominalValue", Double.NaN);
            if (estimate) {
                if (Double.isNaN(lower) || Double.isNaN(upper) || !(lower <= upper)) {
                    throw Messages.error(r.location(), "parameter '%s' is estimated but its bounds [%s, %s]"
                            + " do not form an interval; give lowerBound <= upperBound", id,
                            r.text("lowerBound"), r.text("upperBound"));
                }
                if (scale.needsPositive() && !(lower > 0 || (lower == 0 && scale != ParameterScale.LIN))) {
                    throw Messages.error(r.location("lowerBound"), "parameter '%s': lowerBound %s is"
                            + " negative, impossible on %s scale; use a positive bound or scale lin", id,
                            r.text("lowerBound"), scale.token());
                }
            } else if (Double.isNaN(nominal)) {
                throw Messages.error(r.location("nominalValue"), "parameter '%s' is not estimated but has no"
                        + " nominalValue; give the fixed value", id);
            }
            Prior init = prior(r, "initializationPriorType", "initializationPriorParameters", id);
            Prior obj = prior(r, "objectivePriorType", "objectivePriorParameters", id);
            if (estimate && obj != null && (obj.type() == Prior.Type.LOG_NORMAL
                    || obj.type() == Prior.Type.LOG_LAPLACE) && !(lower > 0)) {
                throw Messages.error(r.location("lowerBound"), "parameter '%s': a %s prior is defined for positive"
                        + " values only, but lowerBound %s lets the parameter be 0 or negative; give a positive"
                        + " lowerBound or another objectivePriorType", id, obj.type().petabName(),
                        r.text("lowerBound"));
            }
            out.add(new PetabParameter(id, r.text("parameterName"), scale, lower, upper, nominal, estimate, init,
                    obj, r.location()));
        }
        return out;
    }

    private static Prior prior(TextTable.Row r, String typeColumn, String paramsColumn, String id) {
        String typeText = r.text(typeColumn);
        if (typeText.isEmpty()) {
            return null;
        }
        Prior.Type type = Prior.Type.fromPetabName(typeText);
        if (type == null) {
            List<String> names = new ArrayList<>();
            for (Prior.Type ty : Prior.Type.values()) {
                names.add(ty.petabName());
            }
            throw Messages.error(r.location(typeColumn), "parameter '%s': prior type '%s' is unknown%s; use"
                    + " one of %s", id, typeText, Spelling.didYouMean(typeText, names), String.join(", ", names));
        }
        String p = r.text(paramsColumn);
        List<Double> values = new ArrayList<>();
        if (!p.isEmpty()) {
            for (String part : p.split(";", -1)) {
                try {
                    values.add(DataNumbers.parse(part));
                } catch (NumberFormatException e) {
                    throw Messages.error(r.location(paramsColumn), e, "parameter '%s': prior parameter '%s' is not"
                            + " a number; write numbers separated by ';', e.g. 0;1", id, part);
                }
            }
        }
        if (values.size() != type.arity() && !(values.isEmpty() && type.parametersOptional())) {
            throw Messages.error(r.location(paramsColumn), "parameter '%s': prior %s needs %d parameters"
                    + " separated by ';', got '%s'", id, type.petabName(), type.arity(), p);
        }
        if (!values.isEmpty()) {
            double a = values.get(0);
            double b = values.get(1);
            boolean uniform = type == Prior.Type.UNIFORM || type == Prior.Type.PARAMETER_SCALE_UNIFORM;
            if (uniform && !(Double.isFinite(a) && Double.isFinite(b) && a < b)) {
                throw Messages.error(r.location(paramsColumn), "parameter '%s': prior %s needs finite limits"
                        + " lower;upper with lower < upper, got '%s'; correct %s", id, type.petabName(), p,
                        paramsColumn);
            }
            if (!uniform && !(Double.isFinite(a) && b > 0 && b < Double.POSITIVE_INFINITY)) {
                throw Messages.error(r.location(paramsColumn), "parameter '%s': prior %s needs a finite %s and a"
                        + " positive finite %s, got '%s'; correct %s", id, type.petabName(),
                        type == Prior.Type.LOG_NORMAL || type == Prior.Type.LOG_LAPLACE ? "mu" : "location",
                        type == Prior.Type.NORMAL || type == Prior.Type.PARAMETER_SCALE_NORMAL
                                || type == Prior.Type.LOG_NORMAL ? "standard deviation" : "scale", p, paramsColumn);
            }
        }
        return new Prior(type, values);
    }

    /** Reads a PEtab v1 condition table. */
    public static List<PetabCondition> readConditions(Path file) {
        return readConditions(file, new ArrayList<>());
    }

    /** Reads a condition table, adding a note for each column that looks like a misspelt standard column. */
    static List<PetabCondition> readConditions(Path file, List<String> notes) {
        TextTable t = DelimitedReader.read(file, '\t');
        noteNearColumns(t, CONDITION_COLUMNS, notes);
        t.requireColumns("PEtab condition table", "conditionId");
        List<PetabCondition> out = new ArrayList<>();
        for (TextTable.Row r : t.rows()) {
            String id = r.requireText("conditionId");
            Map<String, ValueRef> values = new LinkedHashMap<>();
            for (String c : t.columns()) {
                if (c.equals("conditionId") || c.equals("conditionName")) {
                    continue;
                }
                String text = r.text(c);
                ValueRef v = text.isEmpty() ? ValueRef.ofNumber(Double.NaN) : ValueRef.parse(text);
                if (v == null) {
                    throw Messages.error(r.location(c), "condition '%s', column '%s': '%s' is neither a"
                            + " number nor a parameter id; correct the value", id, c, text);
                }
                values.put(c, v);
            }
            out.add(new PetabCondition(id, r.text("conditionName"), values, r.location()));
        }
        return out;
    }

    /** Reads a PEtab v1 measurement table. */
    public static List<PetabMeasurement> readMeasurements(Path file) {
        return readMeasurements(file, new ArrayList<>());
    }

    /** Reads a measurement table, adding a note for each column that looks like a misspelt standard column. */
    static List<PetabMeasurement> readMeasurements(Path file, List<String> notes) {
        TextTable t = DelimitedReader.read(file, '\t');
        noteNearColumns(t, MEASUREMENT_COLUMNS, notes);
        return readMeasurementRows(t, "measurement", "simulationConditionId", "preequilibrationConditionId",
                "PEtab measurement table");
    }

    /**
     * Reads a simulated-data table: a measurement table with a {@code simulation} column in place of
     * {@code measurement}. The condition columns may also be named {@code simulationCondition} and
     * {@code preequilibrationCondition} (seen in published files).
     */
    public static List<PetabMeasurement> readSimulatedData(Path file) {
        TextTable t = DelimitedReader.read(file, '\t');
        String sim = t.hasColumn("simulationConditionId") || !t.hasColumn("simulationCondition")
                ? "simulationConditionId" : "simulationCondition";
        String pre = t.hasColumn("preequilibrationCondition") ? "preequilibrationCondition"
                : "preequilibrationConditionId";
        return readMeasurementRows(t, "simulation", sim, pre, "simulated-data table");
    }

    private static List<PetabMeasurement> readMeasurementRows(TextTable t, String valueColumn, String simColumn,
            String preColumn, String what) {
        t.requireColumns(what, "observableId", simColumn, valueColumn, "time");
        List<PetabMeasurement> out = new ArrayList<>();
        for (TextTable.Row r : t.rows()) {
            String obs = r.requireText("observableId");
            String sim = r.requireText(simColumn);
            String pre = r.text(preColumn);
            double value = r.number(valueColumn);
            double time = r.number("time");
            if (Double.isNaN(time) || time == Double.NEGATIVE_INFINITY) {
                throw Messages.error(r.location("time"), "time '%s' is not allowed; give a finite time or inf"
                        + " for a steady-state measurement", r.text("time"));
            }
            if (time < 0) {
                throw Messages.error(r.location("time"), "time %s is negative, but simulations start at t = 0;"
                        + " give times >= 0 (shift the time axis so that the experiment starts at 0)",
                        r.text("time"));
            }
            out.add(new PetabMeasurement(obs, sim, pre.isEmpty() ? null : pre, value, time,
                    overrides(r, "observableParameters"), overrides(r, "noiseParameters"), r.text("datasetId"),
                    r.text("replicateId"), r.location()));
        }
        return out;
    }

    /**
     * The values of an observableParameters / noiseParameters field; an empty field or a lone NaN (written by
     * dataframe tools for "none") gives none, a NaN among several values is an error.
     */
    private static List<ValueRef> overrides(TextTable.Row r, String column) {
        String text = r.text(column);
        if (text.isEmpty()) {
            return List.of();
        }
        String[] parts = text.split(";", -1);
        List<ValueRef> out = new ArrayList<>();
        for (int i = 0; i < parts.length; i++) {
            ValueRef v = ValueRef.parse(parts[i]);
            if (v == null) {
                throw Messages.error(r.location(column), "column '%s': '%s' is neither a number nor a"
                        + " parameter id; write values separated by ';', e.g. 1.5;scale_a", column, parts[i].strip());
            }
            if (v.isNumber() && Double.isNaN(v.number())) {
                if (parts.length == 1) {
                    return List.of();
                }
                throw Messages.error(r.location(column), "column '%s': value %d of '%s' is NaN; give a number or"
                        + " a parameter-table id for every placeholder", column, i + 1, text);
            }
            out.add(v);
        }
        return out;
    }

    /** Reads a PEtab v1 observable table. */
    public static List<PetabObservable> readObservables(Path file) {
        return readObservables(file, new ArrayList<>());
    }

    /** Reads an observable table, adding a note for each column that looks like a misspelt standard column. */
    static List<PetabObservable> readObservables(Path file, List<String> notes) {
        TextTable t = DelimitedReader.read(file, '\t');
        noteNearColumns(t, OBSERVABLE_COLUMNS, notes);
        t.requireColumns("PEtab observable table", "observableId", "observableFormula", "noiseFormula");
        List<PetabObservable> out = new ArrayList<>();
        for (TextTable.Row r : t.rows()) {
            String id = r.requireText("observableId");
            String formula = r.requireText("observableFormula");
            String noise = r.requireText("noiseFormula");
            String tr = r.text("observableTransformation");
            ParameterScale transformation = tr.isEmpty() ? ParameterScale.LIN : ParameterScale.fromToken(tr);
            if (transformation == null) {
                throw Messages.error(r.location("observableTransformation"), "observable '%s':"
                        + " observableTransformation '%s' is unknown; use lin, log or log10", id, tr);
            }
            String nd = r.text("noiseDistribution");
            PetabObservable.NoiseDistribution dist;
            if (nd.isEmpty() || nd.equals("normal")) {
                dist = PetabObservable.NoiseDistribution.NORMAL;
            } else if (nd.equals("laplace")) {
                dist = PetabObservable.NoiseDistribution.LAPLACE;
            } else {
                throw Messages.error(r.location("noiseDistribution"), "observable '%s': noiseDistribution"
                        + " '%s' is unknown%s; use normal or laplace", id, nd,
                        Spelling.didYouMean(nd, List.of("normal", "laplace")));
            }
            out.add(new PetabObservable(id, r.text("observableName"), formula, noise, transformation, dist,
                    r.location()));
        }
        return out;
    }

    private static <T> void checkUniqueIds(List<T> rows, java.util.function.Function<T, String> id,
            java.util.function.Function<T, SourceLocation> loc, String what) {
        Map<String, SourceLocation> seen = new HashMap<>();
        for (T row : rows) {
            SourceLocation first = seen.putIfAbsent(id.apply(row), loc.apply(row));
            if (first != null) {
                throw Messages.error(loc.apply(row), "%s id '%s' is defined twice (first at %s); remove or"
                        + " rename one row", what, id.apply(row), first);
            }
        }
    }

    private static void checkReferences(List<PetabMeasurement> measurements, List<PetabCondition> conditions,
            List<PetabObservable> observables) {
        Set<String> conditionIds = new HashSet<>();
        conditions.forEach(c -> conditionIds.add(c.id()));
        Set<String> observableIds = new HashSet<>();
        observables.forEach(o -> observableIds.add(o.id()));
        Map<String, int[]> placeholders = new HashMap<>();
        for (PetabObservable o : observables) {
            placeholders.put(o.id(), new int[] {placeholderCount(o.formula(), "observableParameter", o.id()),
                placeholderCount(o.noiseFormula(), "noiseParameter", o.id())});
        }
        for (PetabMeasurement m : measurements) {
            if (!observableIds.contains(m.observableId())) {
                throw Messages.error(m.location(), "observableId '%s' is not in the observable table%s;"
                        + " add it there or correct the name", m.observableId(),
                        Spelling.didYouMean(m.observableId(), observableIds));
            }
            int[] counts = placeholders.get(m.observableId());
            checkOverrideCount(m, "observableParameters", "observableParameter", m.observableParameters().size(),
                    counts[0]);
            checkOverrideCount(m, "noiseParameters", "noiseParameter", m.noiseParameters().size(), counts[1]);
            checkCondition(m.simulationConditionId(), "simulationConditionId", m, conditionIds);
            if (m.preequilibrationConditionId() != null) {
                checkCondition(m.preequilibrationConditionId(), "preequilibrationConditionId", m, conditionIds);
            }
        }
    }

    /**
     * Ids in observableParameters / noiseParameters must be rows of the parameter table (PEtab v1 specification,
     * measurement table; from memory of the specification, and true of all 22 benchmark problems). Ids in the
     * condition table are left to the model side, since they may also name model parameters.
     */
    private static void checkOverrideIds(List<PetabMeasurement> measurements, List<PetabParameter> parameters) {
        Set<String> ids = new HashSet<>();
        parameters.forEach(p -> ids.add(p.id()));
        for (PetabMeasurement m : measurements) {
            for (List<ValueRef> list : List.of(m.observableParameters(), m.noiseParameters())) {
                for (ValueRef v : list) {
                    if (!v.isNumber() && !ids.contains(v.parameterId())) {
                        String column = list == m.observableParameters() ? "observableParameters" : "noiseParameters";
                        throw Messages.error(m.location(), "column '%s': parameter '%s' is not in the parameter"
                                + " table%s; add a row for it there or correct the name", column, v.parameterId(),
                                Spelling.didYouMean(v.parameterId(), ids));
                    }
                }
            }
        }
    }

    /** Highest N among placeholders {@code <kind>N_<observableId>} in the formula (PEtab v1 naming), or 0. */
    static int placeholderCount(String formula, String kind, String observableId) {
        Matcher mt = Pattern.compile("\\b" + kind + "(\\d+)_"
                + Pattern.quote(observableId) + "\\b").matcher(formula);
        int max = 0;
        while (mt.find()) {
            max = Math.max(max, Integer.parseInt(mt.group(1)));
        }
        return max;
    }

    private static void checkOverrideCount(PetabMeasurement m, String column, String kind, int given, int expected) {
        if (given != expected) {
            throw Messages.error(m.location(), "column '%s' gives %d value(s) but observable '%s' has %d"
                    + " placeholder(s) %s1_%s..; give exactly one value per placeholder, separated by ';'", column,
                    given, m.observableId(), expected, kind, m.observableId());
        }
    }

    private static void checkCondition(String id, String column, PetabMeasurement m, Set<String> conditionIds) {
        if (!conditionIds.contains(id)) {
            throw Messages.error(m.location(), "%s '%s' is not in the condition table%s; add the condition"
                    + " or correct the name", column, id, Spelling.didYouMean(id, conditionIds));
        }
    }
}
