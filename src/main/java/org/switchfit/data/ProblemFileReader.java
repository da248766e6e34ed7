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
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Reads and validates a switchfit problem file (YAML, format described in {@code docs/problem-format.md}) and the
 * data tables it references.
 *
 * <p>Every user error is a one-line {@link UserInputException} naming file and line (and column for table
 * fields) and saying what to do. Checks: unknown keys (with a suggestion), missing files, bounds and start values,
 * positive bounds on log scales, numbers in data tables, duplicate ids, and references from data to undeclared
 * experiments or observables. Ids of model quantities are not checked here; that needs the model.
 *
 * <p>Stateless and thread-safe.
 */
public final class ProblemFileReader {

    /** The format version this reader understands. */
    public static final int FORMAT_VERSION = 1;

    static final List<String> TOP_KEYS = List.of("switchfit_format", "description", "model", "parameters",
            "experiments", "observables", "data");
    static final List<String> PARAMETER_KEYS = List.of("id", "lower", "upper", "scale", "start", "prior");
    static final List<String> EXPERIMENT_KEYS = List.of("id", "parameters", "initial", "settle_in", "doses");
    static final List<String> DOSE_KEYS = List.of("at", "target", "set", "add");
    static final List<String> OBSERVABLE_KEYS = List.of("id", "formula", "scale", "offset", "noise");
    static final List<String> DATA_KEYS = List.of("timecourses", "dose_responses", "thresholds");
    static final List<String> THRESHOLD_KEYS = List.of("experiment", "control", "direction", "value", "sigma");

    private ProblemFileReader() {
    }

    /** Reads, validates and returns the problem in {@code yamlFile}. */
    public static SwitchfitProblem read(Path yamlFile) {
        String content;
        if (Files.isDirectory(yamlFile)) {
            throw new UserInputException(SourceLocation.ofFile(yamlFile.toString()),
                    "is a folder, not a problem file; pass the problem YAML file");
        }
        try {
            content = Files.readString(yamlFile, StandardCharsets.UTF_8);
        } catch (NoSuchFileException e) {
            throw new UserInputException(SourceLocation.ofFile(yamlFile.toString()),
                    "problem file not found; check the path", e);
        } catch (java.nio.charset.CharacterCodingException e) {
            throw new UserInputException(SourceLocation.ofFile(yamlFile.toString()),
                    "the problem file is not UTF-8 text; pass the problem YAML file, saved as UTF-8", e);
        } catch (IOException e) {
            throw new UserInputException(SourceLocation.ofFile(yamlFile.toString()),
                    "cannot read problem file (" + e.getMessage() + "); check that it is readable", e);
        }
        return parse(content, yamlFile);
    }

    /** Parses problem text as if read from {@code yamlFile} (relative paths resolve against its folder). */
    public static SwitchfitProblem parse(String content, Path yamlFile) {
        String src = yamlFile.toString();
        YamlNode root = YamlNode.parse(content, src);
        if (root.kind() == YamlNode.Kind.NULL) {
            throw Messages.error(SourceLocation.ofFile(src),
                    "the problem file is empty; start it with 'switchfit_format: 1' and 'model: <file.xml>'");
        }
        root.requireMap("switchfit_format: 1");
        root.checkKeys(TOP_KEYS);
        YamlNode versionNode = root.require("switchfit_format", "1");
        double version = versionNode.number("1");
        if (version != FORMAT_VERSION) {
            throw Messages.error(versionNode.location(),
                    "switchfit_format %s is not supported; this version reads format %d", versionNode.scalar("1"),
                    FORMAT_VERSION);
        }
        Path base = yamlFile.toAbsolutePath().getParent();
        YamlNode modelNode = root.require("model", "models/switch.xml");
        Path model = existingFile(base, modelNode, "the SBML model");

        List<EstimatedParameter> parameters = readParameters(root);
        List<Experiment> experiments = readExperiments(root);
        List<Observable> observables = readObservables(root);
        Set<String> experimentIds = new HashSet<>();
        experiments.forEach(e -> experimentIds.add(e.id()));
        Set<String> observableIds = new HashSet<>();
        observables.forEach(o -> observableIds.add(o.id()));

        List<TimecoursePoint> tc = new ArrayList<>();
        List<DoseResponsePoint> dr = new ArrayList<>();
        List<SwitchingThreshold> th = new ArrayList<>();
        List<SwitchfitProblem.DataFile> files = new ArrayList<>();
        if (root.has("data")) {
            YamlNode data = root.get("data").requireMap("{timecourses: [{file: data/tc.csv}]}");
            data.checkKeys(DATA_KEYS);
            DataTableReader tables = new DataTableReader(experimentIds, observableIds);
            for (YamlNode entry : optList(data, "timecourses", "[{file: data/timecourses.csv}]")) {
                entry.requireMap("{file: data/timecourses.csv}").checkKeys(List.of("file"));
                Path f = existingFile(base, entry.require("file", "data/timecourses.csv"), "the timecourse table");
                tc.addAll(tables.timecourses(DelimitedReader.read(f)));
                files.add(new SwitchfitProblem.DataFile(SwitchfitProblem.DataFile.Kind.TIMECOURSE, f, null));
            }
            for (YamlNode entry : optList(data, "dose_responses", "[{file: data/dose.csv, control: stimulus}]")) {
                entry.requireMap("{file: data/dose.csv, control: stimulus}").checkKeys(List.of("file", "control"));
                Path f = existingFile(base, entry.require("file", "data/dose.csv"), "the dose-response table");
                String control = entry.id("control", "stimulus");
                dr.addAll(tables.doseResponses(DelimitedReader.read(f), control));
                files.add(new SwitchfitProblem.DataFile(SwitchfitProblem.DataFile.Kind.DOSE_RESPONSE, f, control));
            }
            for (YamlNode entry : optList(data, "thresholds", "[{file: data/thresholds.csv}]")) {
                entry.requireMap("{file: data/thresholds.csv}");
                if (entry.has("file")) {
                    entry.checkKeys(List.of("file"));
                    Path f = existingFile(base, entry.require("file", "data/thresholds.csv"),
                            "the threshold table");
                    th.addAll(tables.thresholds(DelimitedReader.read(f)));
                    files.add(new SwitchfitProblem.DataFile(SwitchfitProblem.DataFile.Kind.THRESHOLD, f, null));
                } else {
                    entry.checkKeys(THRESHOLD_KEYS);
                    th.add(inlineThreshold(entry, experimentIds));
                }
            }
        }
        return new SwitchfitProblem(yamlFile, FORMAT_VERSION, model, parameters, experiments, observables, tc, dr,
                th, files);
    }

    private static List<YamlNode> optList(YamlNode parent, String key, String example) {
        return parent.has(key) ? parent.get(key).requireList(example) : List.of();
    }

    private static Path existingFile(Path base, YamlNode node, String what) {
        String name = node.scalar("path/to/file");
        Path p = base.resolve(name).normalize();
        if (Files.isDirectory(p)) {
            throw Messages.error(node.location(), "%s '%s' is a folder (%s), not a file; name the file itself,"
                    + " relative to the problem file's folder", what, name, p);
        }
        if (!Files.isRegularFile(p)) {
            throw Messages.error(node.location(), "%s '%s' does not exist (looked for %s); correct the path,"
                    + " which is relative to the problem file's folder", what, name, p);
        }
        return p;
    }

    private static List<EstimatedParameter> readParameters(YamlNode root) {
        List<EstimatedParameter> out = new ArrayList<>();
        Map<String, Integer> seen = new HashMap<>();
        for (YamlNode n : optList(root, "parameters", "[{id: k1, lower: 0.01, upper: 100, start: 1}]")) {
            n.requireMap("{id: k1, lower: 0.01, upper: 100, scale: log10, start: 1}").checkKeys(PARAMETER_KEYS);
            String id = n.id("id", "k_act");
            checkUnique(seen, id, n, "parameter");
            ParameterScale scale = ParameterScale.LOG10;
            if (n.has("scale")) {
                String s = n.get("scale").scalar("log10");
                scale = ParameterScale.fromToken(s);
                if (scale == null) {
                    throw Messages.error(n.get("scale").location(),
                            "parameter '%s': unknown scale '%s'%s; use lin, log or log10", id, s,
                            Spelling.didYouMean(s, List.of("lin", "log", "log10")));
                }
            }
            double lower = n.number("lower", "1e-3");
            double upper = n.number("upper", "1e3");
            double start = n.number("start", "1.0");
            SourceLocation loc = n.location();
            checkBounds(id, lower, upper, start, scale, loc);
            Prior prior = n.has("prior") ? readPrior(n.get("prior"), id) : null;
            out.add(new EstimatedParameter(id, lower, upper, scale, start, prior, loc));
        }
        return out;
    }

    static void checkBounds(String id, double lower, double upper, double start, ParameterScale scale,
            SourceLocation loc) {
        if (!(Double.isFinite(lower) && Double.isFinite(upper) && Double.isFinite(start))) {
            throw Messages.error(loc, "parameter '%s': bounds and start must be finite numbers"
                    + " (lower %s, upper %s, start %s); give finite values", id, DataNumbers.format(lower),
                    DataNumbers.format(upper), DataNumbers.format(start));
        }
        if (!(lower < upper)) {
            throw Messages.error(loc, "parameter '%s': lower bound %s is not below upper bound %s;"
                    + " swap them or widen the range", id, fmt(lower), fmt(upper));
        }
        if (scale.needsPositive() && !(lower > 0)) {
            throw Messages.error(loc, "parameter '%s': lower bound %s is impossible on %s scale; use a"
                    + " positive bound such as 1e-8, or scale lin", id, fmt(lower), scale.token());
        }
        if (!(start >= lower && start <= upper)) {
            throw Messages.error(loc, "parameter '%s': start %s lies outside the bounds [%s, %s]; move the"
                    + " start inside or widen the bounds", id, fmt(start), fmt(lower), fmt(upper));
        }
    }

    /**
     * An enumerated keyword value (noise and prior types; scales, directions and histories are read the same way)
     * in the form it is compared in: keyword values are case-insensitive, keys and ids are not.
     */
    static String keyword(String value) {
        return value.strip().toLowerCase(Locale.ROOT);
    }

    static String fmt(double v) {
        return String.format(Locale.ROOT, "%.6g", v).replaceFirst("\\.?0+(e|$)", "$1");
    }

    private static Prior readPrior(YamlNode n, String id) {
        n.requireMap("{type: normal, mean: 1.0, sd: 0.5}");
        String type = n.string("type", "normal");
        String kind = keyword(type);
        double a;
        double b;
        switch (kind) {
            case "normal":
                n.checkKeys(List.of("type", "mean", "sd"));
                a = n.number("mean", "1.0");
                b = n.number("sd", "0.5");
                break;
            case "lognormal":
                n.checkKeys(List.of("type", "mu", "sigma"));
                a = n.number("mu", "0.0");
                b = n.number("sigma", "1.0");
                break;
            default:
                throw Messages.error(n.get("type").location(), "parameter '%s': unknown prior type '%s'%s;"
                        + " use normal (mean, sd) or lognormal (mu, sigma)", id, type,
                        Spelling.didYouMean(type, List.of("normal", "lognormal")));
        }
        if (!Double.isFinite(a) || !(b > 0) || Double.isInfinite(b)) {
            throw Messages.error(n.location(), "parameter '%s': prior %s needs a finite centre and a positive"
                    + " finite spread (got %s, %s); correct the values", id, type, fmt(a), fmt(b));
        }
        return "normal".equals(kind) ? Prior.normal(a, b) : Prior.logNormal(a, b);
    }

    private static List<Experiment> readExperiments(YamlNode root) {
        List<Experiment> out = new ArrayList<>();
        Map<String, Integer> seen = new HashMap<>();
        Map<String, YamlNode> settleNodes = new LinkedHashMap<>();
        for (YamlNode n : optList(root, "experiments", "[{id: rise, parameters: {stimulus: 2.0}}]")) {
            n.requireMap("{id: rise, parameters: {stimulus: 2.0}}").checkKeys(EXPERIMENT_KEYS);
            String id = n.id("id", "rise");
            checkUnique(seen, id, n, "experiment");
            Map<String, ValueRef> params = valueMap(n, "parameters", "{stimulus: 2.0}");
            Map<String, ValueRef> initial = valueMap(n, "initial", "{KinP: 0.0}");
            String settle = null;
            if (n.has("settle_in")) {
                settle = n.id("settle_in", "rest");
                settleNodes.put(id, n.get("settle_in"));
            }
            List<Dose> doses = new ArrayList<>();
            double lastTime = Double.NEGATIVE_INFINITY;
            for (YamlNode d : optList(n, "doses", "[{at: 10, target: stimulus, set: 5}]")) {
                d.requireMap("{at: 10, target: stimulus, set: 5}").checkKeys(DOSE_KEYS);
                YamlNode at = d.require("at", "10");
                double t = at.number("10");
                if (!(t >= 0) || Double.isInfinite(t) || t < lastTime) {
                    throw Messages.error(at.location(), "experiment '%s': dose time %s must be finite, at or"
                            + " after 0 and not before the previous dose; list doses in time order", id, fmt(t));
                }
                lastTime = t;
                String target = d.id("target", "stimulus");
                boolean set = d.has("set");
                if (set == d.has("add")) {
                    throw Messages.error(d.location(), "experiment '%s': a dose needs exactly one of 'set'"
                            + " (new value) or 'add' (increment); write e.g. {at: 10, target: %s, set: 5}", id,
                            target);
                }
                ValueRef amount = d.get(set ? "set" : "add").valueRef("5.0");
                doses.add(new Dose(t, target, set ? Dose.Action.SET : Dose.Action.ADD, amount, d.location()));
            }
            out.add(new Experiment(id, params, initial, settle, doses, n.location()));
        }
        for (Map.Entry<String, YamlNode> e : settleNodes.entrySet()) {
            String target = e.getValue().scalar("rest");
            if (target.equals(e.getKey())) {
                throw Messages.error(e.getValue().location(), "experiment '%s' settles in itself; name"
                        + " another experiment whose settings hold before time 0, or remove settle_in", target);
            }
            if (!seen.containsKey(target)) {
                throw Messages.error(e.getValue().location(), "experiment '%s': settle_in names undeclared"
                        + " experiment '%s'%s; declare it under experiments", e.getKey(), target,
                        Spelling.didYouMean(target, seen.keySet()));
            }
            if (settleNodes.containsKey(target)) {
                // settling runs the named experiment's settings to steady state, not that experiment's own
                // history, so a settle_in of the named experiment would be ignored
                throw Messages.error(e.getValue().location(), "experiment '%s' settles in '%s', which itself has"
                        + " settle_in; settle_in is one level: name an experiment without settle_in", e.getKey(),
                        target);
            }
        }
        return out;
    }

    private static Map<String, ValueRef> valueMap(YamlNode n, String key, String example) {
        Map<String, ValueRef> out = new LinkedHashMap<>();
        if (!n.has(key)) {
            return out;
        }
        YamlNode m = n.get(key).requireMap(example);
        for (Map.Entry<String, YamlNode> e : m.entries().entrySet()) {
            if (!ValueRef.isId(e.getKey())) {
                throw Messages.error(e.getValue().location(), "'%s' is not a valid model id; use letters,"
                        + " digits and underscores, starting with a letter or underscore", e.getKey());
            }
            out.put(e.getKey(), e.getValue().valueRef("2.5 or k_est"));
        }
        return out;
    }

    private static List<Observable> readObservables(YamlNode root) {
        List<Observable> out = new ArrayList<>();
        Map<String, Integer> seen = new HashMap<>();
        for (YamlNode n : optList(root, "observables", "[{id: act, formula: KinP, noise: {type: gaussian,"
                + " sigma: 0.1}}]")) {
            n.requireMap("{id: act, formula: KinP, noise: {type: gaussian, sigma: 0.1}}").checkKeys(OBSERVABLE_KEYS);
            String id = n.id("id", "act");
            checkUnique(seen, id, n, "observable");
            String formula = n.string("formula", "KinP / (Kin + KinP)").strip();
            if (formula.isEmpty()) {
                throw Messages.error(n.get("formula").location(), "observable '%s' has an empty formula;"
                        + " write an expression in model ids such as KinP / (Kin + KinP)", id);
            }
            String scale = n.has("scale") ? n.id("scale", "s_act") : null;
            String offset = n.has("offset") ? n.id("offset", "b_act") : null;
            NoiseModel noise = readNoise(n.require("noise", "{type: gaussian, sigma: 0.1}"), id);
            out.add(new Observable(id, formula, scale, offset, noise, n.location()));
        }
        return out;
    }

    private static NoiseModel readNoise(YamlNode n, String id) {
        n.requireMap("{type: gaussian, sigma: 0.1}");
        String type = n.string("type", "gaussian");
        switch (keyword(type)) {
            case "gaussian":
                n.checkKeys(List.of("type", "sigma"));
                return new NoiseModel.Gaussian(spread(n, "sigma", id, true));
            case "proportional":
                n.checkKeys(List.of("type", "absolute", "relative"));
                ValueRef a = spread(n, "absolute", id, false);
                ValueRef r = spread(n, "relative", id, false);
                if (a.isNumber() && r.isNumber() && a.number() == 0 && r.number() == 0) {
                    throw Messages.error(n.location(), "observable '%s': proportional noise with absolute 0 and"
                            + " relative 0 has no spread; give absolute > 0 or relative > 0 (both >= 0)", id);
                }
                return new NoiseModel.Proportional(a, r);
            case "laplace":
                n.checkKeys(List.of("type", "scale"));
                return new NoiseModel.Laplace(spread(n, "scale", id, true));
            case "lognormal":
                n.checkKeys(List.of("type", "sigma"));
                return new NoiseModel.LogNormal(spread(n, "sigma", id, true));
            default:
                throw Messages.error(n.get("type").location(), "observable '%s': unknown noise type '%s'%s;"
                        + " use gaussian, proportional, laplace or lognormal", id, type,
                        Spelling.didYouMean(type, List.of("gaussian", "proportional", "laplace", "lognormal")));
        }
    }

    /**
     * A noise value: an estimated parameter id, or a finite number that is positive ({@code positive}: the spread
     * itself) or at least 0 (a part of the proportional spread, which may vanish if the other part does not).
     */
    private static ValueRef spread(YamlNode n, String key, String id, boolean positive) {
        YamlNode v = n.require(key, "0.1 or sigma_" + id);
        ValueRef r = v.valueRef("0.1 or sigma_" + id);
        double x = r.isNumber() ? r.number() : 1.0;
        if (!(positive ? x > 0 : x >= 0) || !Double.isFinite(x)) {
            throw Messages.error(v.location(), "observable '%s': noise %s %s must be a finite number %s or an"
                    + " estimated parameter id; correct it", id, key, v.scalar("0.1"), positive ? "> 0" : ">= 0");
        }
        return r;
    }

    private static SwitchingThreshold inlineThreshold(YamlNode n, Set<String> experiments) {
        String exp = n.id("experiment", "rise");
        if (!experiments.contains(exp)) {
            throw Messages.error(n.get("experiment").location(), "threshold refers to undeclared experiment"
                    + " '%s'%s; declare it under experiments", exp, Spelling.didYouMean(exp, experiments));
        }
        String control = n.id("control", "stimulus");
        YamlNode dirNode = n.require("direction", "up");
        SwitchingThreshold.Direction dir = DataTableReader.direction(dirNode.scalar("up"));
        if (dir == null) {
            throw Messages.error(dirNode.location(), "threshold direction '%s' is unknown; use up (switch-on"
                    + " while raising %s) or down (switch-off while lowering it)", dirNode.scalar("up"), control);
        }
        double value = n.number("value", "1.5");
        double sigma = n.number("sigma", "0.1");
        DataTableReader.checkThreshold(value, sigma, n.location());
        return new SwitchingThreshold(exp, control, dir, value, sigma, n.location());
    }

    private static void checkUnique(Map<String, Integer> seen, String id, YamlNode n, String what) {
        Integer first = seen.putIfAbsent(id, n.line());
        if (first != null) {
            throw Messages.error(n.location(), "%s id '%s' is declared twice (first on line %d); rename one"
                    + " of them", what, id, first);
        }
    }
}
