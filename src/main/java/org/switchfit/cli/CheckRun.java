package org.switchfit.cli;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.ArrayDeque;
import java.util.Deque;
import java.util.HashMap;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.stream.Stream;
import org.switchfit.data.DelimitedReader;
import org.switchfit.data.PetabMeasurement;
import org.switchfit.data.PetabReader;
import org.switchfit.data.TextTable;
import org.switchfit.objective.LikelihoodObjective;
import org.switchfit.objective.UnusablePredictionException;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.Measurement;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Shared logic of {@code check} and {@code bench-petab}: load, evaluate at the nominal parameters, compare the
 * simulated observables with a reference simulation table. Tolerance: a value matches when
 * {@code |sim - ref| <= REL_TOL |ref| + ABS_TOL_FRACTION * range}, range = max - min of the observable's reference
 * values (its largest |ref| when the range is 0). The reported maximal relative deviation is taken over the nonzero
 * reference values (NaN, null in JSON, when there are none).
 */
final class CheckRun {
    /** Relative tolerance of the comparison with reference simulations. */
    static final double REL_TOL = 1e-3;
    /** Absolute tolerance as a fraction of the observable's range. */
    static final double ABS_TOL_FRACTION = 1e-3;

    final EstimationProblem problem;
    final LikelihoodObjective objective;
    final LikelihoodObjective.Evaluation evaluation;
    final double seconds;
    final Path reference;
    final double[] referenceValues;
    final boolean[] matches;
    final Map<String, Object> json = new LinkedHashMap<>();

    CheckRun(Path problemFile, Path referenceFile, SolverSettings settings) {
        this(problemFile, referenceFile, settings, null);
    }

    /** @param warnings receives the problem's notes before the evaluation, or null */
    CheckRun(Path problemFile, Path referenceFile, SolverSettings settings, java.io.PrintWriter warnings) {
        long t0 = System.nanoTime();
        problem = ProblemLoader.load(problemFile);
        if (warnings != null) {
            FitCommand.printNotes(warnings, problem);
        }
        objective = LikelihoodObjective.of(problem, settings);
        try {
            evaluation = objective.evaluateDetailed(problem.nominalTheta());
        } catch (UnusablePredictionException e) {
            // the nominal values are the user's choice: a row they make unusable is an input error
            throw new UserInputException(e.location(), "at the nominal parameter values, " + e.detail(), e);
        } catch (org.switchfit.objective.ObjectiveException e) {
            // no steady state, a failed integration or relaxation at the values the problem file gives: a property
            // of the model and those values, which the user chose (not a fault of the program)
            throw new UserInputException(org.switchfit.util.SourceLocation.ofFile(problemFile.toString()), "the problem cannot be "
                    + "evaluated at its nominal parameter values: " + e.getMessage() + "; check the model and these "
                    + "values", e);
        }
        seconds = (System.nanoTime() - t0) * 1e-9;
        reference = referenceFile != null ? referenceFile : findReference(problemFile);
        int nm = problem.measurements().size();
        json.put("problem", problemFile.toString());
        json.put("measurements", nm);
        json.put("parameters", problem.parameterCount());
        json.put("warnings", problem.notes());
        json.put("nllAtNominal", evaluation.nll());
        json.put("priorPartAtNominal", evaluation.priorPart());
        if (evaluation.outsidePrior() != null) {
            json.put("outsidePriorSupport", evaluation.outsidePrior());
        }
        if (!evaluation.switching().isEmpty()) {
            java.util.List<Map<String, Object>> sw = new java.util.ArrayList<>();
            for (org.switchfit.objective.SwitchingFit f : evaluation.switching()) {
                Map<String, Object> row = new LinkedHashMap<>();
                java.util.List<Object> v = f.values();
                for (int c = 0; c < v.size(); c++) {
                    row.put(org.switchfit.objective.SwitchingFit.COLUMNS.get(c), v.get(c));
                }
                sw.add(row);
            }
            json.put("switchingAtNominal", sw);
        }
        json.put("seconds", seconds);
        if (reference == null) {
            referenceValues = null;
            matches = null;
            json.put("reference", null);
            return;
        }
        json.put("reference", reference.toString());
        referenceValues = align(PetabReader.readSimulatedData(reference));
        matches = new boolean[nm];
        int no = problem.observables().size();
        double[] lo = new double[no];
        double[] hi = new double[no];
        double[] big = new double[no];
        java.util.Arrays.fill(lo, Double.POSITIVE_INFINITY);
        java.util.Arrays.fill(hi, Double.NEGATIVE_INFINITY);
        for (int i = 0; i < nm; i++) {
            int o = problem.measurements().get(i).observable();
            double v = referenceValues[i];
            if (Double.isFinite(v)) {
                lo[o] = Math.min(lo[o], v);
                hi[o] = Math.max(hi[o], v);
                big[o] = Math.max(big[o], Math.abs(v));
            }
        }
        double maxAbs = 0.0;
        // relative deviations over the nonzero references only (NaN, written null / n/a, when there is none)
        double maxRel = Double.NaN;
        int matched = 0;
        List<Map<String, Object>> perObs = new ArrayList<>();
        double[] oAbs = new double[no];
        double[] oRel = new double[no];
        java.util.Arrays.fill(oRel, Double.NaN);
        int[] oCount = new int[no];
        int[] oBad = new int[no];
        int firstBad = -1;
        for (int i = 0; i < nm; i++) {
            int o = problem.measurements().get(i).observable();
            double ref = referenceValues[i];
            double sim = evaluation.simulated()[i];
            double range = hi[o] - lo[o] > 0 ? hi[o] - lo[o] : big[o];
            double d = Math.abs(sim - ref);
            double rel = ref != 0 ? d / Math.abs(ref) : Double.NaN;
            boolean ok = Double.isFinite(sim) && d <= REL_TOL * Math.abs(ref) + ABS_TOL_FRACTION * range;
            matches[i] = ok;
            if (ok) {
                matched++;
            } else if (firstBad < 0) {
                firstBad = i;
            }
            if (Double.isFinite(d)) {
                maxAbs = Math.max(maxAbs, d);
                oAbs[o] = Math.max(oAbs[o], d);
            } else {
                maxAbs = Double.POSITIVE_INFINITY;
                oAbs[o] = Double.POSITIVE_INFINITY;
            }
            if (ref != 0) {
                // a NaN deviation (simulation not finite) counts as infinitely far
                double relOrInf = Double.isNaN(rel) ? Double.POSITIVE_INFINITY : rel;
                maxRel = Double.isNaN(maxRel) ? relOrInf : Math.max(maxRel, relOrInf);
                oRel[o] = Double.isNaN(oRel[o]) ? relOrInf : Math.max(oRel[o], relOrInf);
            }
            oCount[o]++;
            oBad[o] += ok ? 0 : 1;
        }
        for (int o = 0; o < no; o++) {
            Map<String, Object> e = new LinkedHashMap<>();
            e.put("id", problem.observables().get(o).id());
            e.put("measurements", oCount[o]);
            e.put("mismatches", oBad[o]);
            e.put("maxAbsDeviation", oAbs[o]);
            e.put("maxRelDeviation", oRel[o]);
            e.put("referenceRange", hi[o] - lo[o]);
            perObs.add(e);
        }
        json.put("maxAbsDeviation", maxAbs);
        json.put("maxRelDeviation", maxRel);
        json.put("matched", matched);
        json.put("allMatch", matched == nm);
        if (firstBad >= 0) {
            Measurement me = problem.measurements().get(firstBad);
            json.put("firstMismatch", String.format(Locale.ROOT, "%s: observable %s t=%s simulated %.9g reference "
                    + "%.9g", me.location(), problem.observables().get(me.observable()).id(), me.time(),
                    evaluation.simulated()[firstBad], referenceValues[firstBad]));
        }
        json.put("observables", perObs);
    }

    boolean allMatch() {
        return matches == null || (Boolean) json.get("allMatch");
    }

    /** The simulatedData*.tsv beside a PEtab YAML file, or null. */
    static Path findReference(Path problemFile) {
        Path dir = problemFile.toAbsolutePath().getParent();
        try (Stream<Path> s = Files.list(dir)) {
            return s.filter(p -> p.getFileName().toString().startsWith("simulatedData")
                    && p.getFileName().toString().endsWith(".tsv")).sorted().findFirst().orElse(null);
        } catch (IOException e) {
            return null;
        }
    }

    /**
     * Reference values in measurement order: by row when the tables line up, else by matching keys. The tables
     * line up when they have the same number of rows and every row has the same observable (or one extended with
     * '__...') and time, and the condition ids are the same or consistently renamed (a one-to-one map between the
     * reference's ids and the condition table's, as in tables written by tools that number conditions; an id the
     * condition table defines always means that condition).
     */
    private double[] align(List<PetabMeasurement> ref) {
        List<Measurement> ms = problem.measurements();
        ref = resolveObservables(ref);
        double[] out = new double[ms.size()];
        java.util.Arrays.fill(out, Double.NaN);
        if (ref.size() == ms.size() && linesUp(ms, ref)) {
            for (int i = 0; i < ms.size(); i++) {
                out[i] = ref.get(i).value();
            }
            return out;
        }
        Map<String, List<PetabMeasurement>> byKey = new HashMap<>();
        for (PetabMeasurement r : ref) {
            byKey.computeIfAbsent(key(r.simulationConditionId(), r.time()), k -> new ArrayList<>()).add(r);
        }
        java.util.Set<PetabMeasurement> used = java.util.Collections.newSetFromMap(new java.util.IdentityHashMap<>());
        int missing = 0;
        for (int i = 0; i < ms.size(); i++) {
            Measurement me = ms.get(i);
            String sim = problem.conditions().get(problem.experiments().get(me.experiment()).condition()).id();
            List<PetabMeasurement> cands = byKey.getOrDefault(key(sim, me.time()), List.of());
            String obs = problem.observables().get(me.observable()).id();
            PetabMeasurement pick = null;
            // exact observable id first; then ids that extend it with '__' (some tables append the row's
            // parameters and conditions to the observable id)
            for (int pass = 0; pass < 2 && pick == null; pass++) {
                for (PetabMeasurement c : cands) {
                    if (used.contains(c)) {
                        continue;
                    }
                    String id = c.observableId();
                    boolean ok = pass == 0 ? id.equals(obs) : id.startsWith(obs + "__");
                    if (ok) {
                        pick = c;
                        break;
                    }
                }
            }
            if (pick == null) {
                missing++;
                continue;
            }
            used.add(pick);
            out[i] = pick.value();
        }
        if (missing == ms.size()) {
            throw new UserInputException(SourceLocation.ofFile(reference.toString()), "no row matches a measurement "
                    + "(observableId, simulationConditionId, time); pass the simulated-data table of this problem");
        }
        return out;
    }

    private boolean linesUp(List<Measurement> ms, List<PetabMeasurement> ref) {
        Map<String, String> oursToRef = new HashMap<>();
        Map<String, String> refToOurs = new HashMap<>();
        java.util.Set<String> known = new java.util.HashSet<>();
        for (var c : problem.conditions()) {
            known.add(c.id());
        }
        for (int i = 0; i < ms.size(); i++) {
            Measurement me = ms.get(i);
            PetabMeasurement r = ref.get(i);
            String sim = problem.conditions().get(problem.experiments().get(me.experiment()).condition()).id();
            String obs = problem.observables().get(me.observable()).id();
            boolean sameObs = r.observableId().equals(obs) || r.observableId().startsWith(obs + "__");
            // a condition id the problem defines names that condition: only ids foreign to the condition table
            // can be renamings (otherwise a table listing the same rows in another order would line up with
            // two conditions swapped)
            boolean foreignOrSame = r.simulationConditionId().equals(sim) || !known.contains(r.simulationConditionId());
            if (!sameObs || !foreignOrSame || me.time() != r.time()
                    || !oursToRef.computeIfAbsent(sim, k -> r.simulationConditionId()).equals(r.simulationConditionId())
                    || !refToOurs.computeIfAbsent(r.simulationConditionId(), k -> sim).equals(sim)) {
                return false;
            }
        }
        return true;
    }

    /**
     * The reference rows with observable ids written as the problem's where the reference shortens them: an id
     * the observable table lacks stands for the one observable whose id ends with '_' + that id (reference tables
     * written by some tools drop a prefix such as {@code observable_}); ids with no such unique observable are kept.
     */
    private List<PetabMeasurement> resolveObservables(List<PetabMeasurement> ref) {
        java.util.Set<String> ids = new java.util.HashSet<>();
        for (var o : problem.observables()) {
            ids.add(o.id());
        }
        Map<String, String> resolved = new HashMap<>();
        List<PetabMeasurement> out = new ArrayList<>(ref.size());
        for (PetabMeasurement r : ref) {
            String id = resolved.computeIfAbsent(r.observableId(), k -> {
                if (ids.contains(k)) {
                    return k;
                }
                String hit = null;
                for (String o : ids) {
                    if (o.endsWith("_" + k)) {
                        if (hit != null) {
                            return k;
                        }
                        hit = o;
                    }
                }
                return hit == null ? k : hit;
            });
            out.add(id.equals(r.observableId()) ? r : new PetabMeasurement(id, r.simulationConditionId(),
                    r.preequilibrationConditionId(), r.value(), r.time(), r.observableParameters(),
                    r.noiseParameters(), r.datasetId(), r.replicateId(), r.location()));
        }
        return out;
    }

    private static String key(String sim, double t) {
        return sim + '\u0000' + t;
    }


    /**
     * The measurement tables with a simulation column after measurement (PEtab): every row of every measurement
     * file, in file order, each with the simulation of its own measurement. Files with different columns are
     * written under the union of their columns (first-seen order), cells a file lacks left empty. Problems whose
     * measurements do not come from TSV files get a table of experiment, observable, time, measurement, simulation.
     */
    String simulationsTsv() {
        List<String> files = new ArrayList<>();
        Map<String, Integer> byRow = new HashMap<>();
        for (int i = 0; i < problem.measurements().size(); i++) {
            SourceLocation loc = problem.measurements().get(i).location();
            String f = loc == null ? null : loc.file();
            if (f == null || !f.endsWith(".tsv") || !Files.isRegularFile(Path.of(f))) {
                return simulationsPlain();
            }
            if (!files.contains(f)) {
                files.add(f);
            }
            byRow.put(f + '\u0000' + loc.line(), i);
        }
        if (files.isEmpty()) {
            return simulationsPlain();
        }
        List<TextTable> tables = new ArrayList<>();
        List<String> cols = new ArrayList<>();
        for (String f : files) {
            TextTable t = DelimitedReader.read(Path.of(f), '\t');
            tables.add(t);
            for (String c : t.columns()) {
                if (!cols.contains(c)) {
                    cols.add(c);
                }
            }
        }
        StringBuilder sb = new StringBuilder();
        List<String> header = new ArrayList<>();
        for (String c : cols) {
            header.add(c);
            if (c.equals("measurement")) {
                header.add("simulation");
            }
        }
        sb.append(String.join("\t", header)).append('\n');
        for (int k = 0; k < tables.size(); k++) {
            for (TextTable.Row r : tables.get(k).rows()) {
                Integer i = byRow.get(files.get(k) + '\u0000' + r.line());
                List<String> cells = new ArrayList<>();
                for (String c : cols) {
                    cells.add(r.text(c));
                    if (c.equals("measurement")) {
                        cells.add(i == null ? "" : fmt(evaluation.simulated()[i]));
                    }
                }
                sb.append(String.join("\t", cells)).append('\n');
            }
        }
        return sb.toString();
    }

    private String simulationsPlain() {
        StringBuilder sb = new StringBuilder();
        sb.append("experiment\tobservable\ttime\tmeasurement\tsimulation\n");
        for (int i = 0; i < problem.measurements().size(); i++) {
            Measurement me = problem.measurements().get(i);
            sb.append(problem.experiments().get(me.experiment()).id()).append('\t')
                    .append(problem.observables().get(me.observable()).id()).append('\t')
                    .append(fmt(me.time())).append('\t').append(fmt(me.value())).append('\t')
                    .append(fmt(evaluation.simulated()[i])).append('\n');
        }
        return sb.toString();
    }

    /** A relative deviation for the terminal: 3 digits, or n/a when no reference value was nonzero. */
    static String relative(Object v) {
        return v instanceof Double d && !Double.isNaN(d) ? String.format(Locale.ROOT, "%.3g", d) : "n/a";
    }

    static String fmt(double v) {
        if (v == Double.POSITIVE_INFINITY) {
            return "inf";
        }
        return Double.toString(v);
    }
}
