package org.switchfit.data;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.switchfit.util.AtomicFiles;

/**
 * Writes a {@link SwitchfitProblem} as a switchfit problem file plus CSV data tables that
 * {@link ProblemFileReader} reads back to the same values (source locations aside). Each file is written
 * atomically. Stateless and thread-safe.
 *
 * <p>Layout: {@code <stem>.yaml}; timecourses in {@code <stem>-timecourses.csv}; dose-responses in
 * {@code <stem>-dose-<control>.csv} per control parameter; thresholds inline in the YAML file. The model path is
 * written relative to the YAML file's folder.
 */
public final class ProblemFileWriter {

    private ProblemFileWriter() {
    }

    /**
     * Writes the problem.
     *
     * @param problem  the problem
     * @param yamlFile target YAML file; data files go beside it
     * @return the files written, YAML first
     */
    public static List<Path> write(SwitchfitProblem problem, Path yamlFile) {
        Path dir = yamlFile.toAbsolutePath().getParent();
        String stem = yamlFile.getFileName().toString().replaceFirst("\\.ya?ml$", "");
        List<Path> written = new ArrayList<>();
        StringBuilder y = new StringBuilder();
        y.append("switchfit_format: ").append(ProblemFileReader.FORMAT_VERSION)
                .append('\n');
        y.append("model: ").append(q(dir.relativize(problem.modelFile().toAbsolutePath()).toString()
                .replace('\\', '/'))).append('\n');
        writeParameters(problem, y);
        writeExperiments(problem, y);
        writeObservables(problem, y);
        List<String> dataLines = new ArrayList<>();
        if (!problem.timecourses().isEmpty()) {
            Path f = dir.resolve(stem + "-timecourses.csv");
            List<List<?>> rows = new ArrayList<>();
            for (TimecoursePoint p : problem.timecourses()) {
                rows.add(Arrays.asList(p.experiment(), p.observable(), p.time(), p.value(), sigmaField(p.sigma())));
            }
            AtomicFiles.writeString(f, DelimitedWriter.format(DataTableReader.TIMECOURSE_COLUMNS, rows, ','));
            written.add(f);
            dataLines.add("  timecourses:\n    - file: " + q(f.getFileName().toString()) + "\n");
        }
        Map<String, List<List<?>>> byControl = new LinkedHashMap<>();
        for (DoseResponsePoint p : problem.doseResponses()) {
            byControl.computeIfAbsent(p.control(), k -> new ArrayList<>()).add(Arrays.asList(p.experiment(),
                    p.observable(), p.dose(), p.value(), sigmaField(p.sigma()),
                    p.history() == DoseResponsePoint.History.LOW ? "low" : "high"));
        }
        if (!byControl.isEmpty()) {
            StringBuilder d = new StringBuilder("  dose_responses:\n");
            for (Map.Entry<String, List<List<?>>> e : byControl.entrySet()) {
                Path f = dir.resolve(stem + "-dose-" + e.getKey() + ".csv");
                AtomicFiles.writeString(f, DelimitedWriter.format(DataTableReader.DOSE_COLUMNS, e.getValue(), ','));
                written.add(f);
                d.append("    - file: ").append(q(f.getFileName().toString())).append('\n');
                d.append("      control: ").append(e.getKey()).append('\n');
            }
            dataLines.add(d.toString());
        }
        if (!problem.thresholds().isEmpty()) {
            StringBuilder d = new StringBuilder("  thresholds:\n");
            for (SwitchingThreshold t : problem.thresholds()) {
                d.append("    - {experiment: ").append(t.experiment()).append(", control: ").append(t.control())
                        .append(", direction: ").append(t.direction() == SwitchingThreshold.Direction.UP ? "up" : "down")
                        .append(", value: ").append(DataNumbers.format(t.value())).append(", sigma: ")
                        .append(DataNumbers.format(t.sigma())).append("}\n");
            }
            dataLines.add(d.toString());
        }
        if (!dataLines.isEmpty()) {
            y.append("data:\n");
            dataLines.forEach(y::append);
        }
        AtomicFiles.writeString(yamlFile, y.toString());
        written.add(0, yamlFile);
        return written;
    }

    private static Object sigmaField(double sigma) {
        return Double.isNaN(sigma) ? null : sigma;
    }

    private static void writeParameters(SwitchfitProblem problem, StringBuilder y) {
        if (problem.parameters().isEmpty()) {
            return;
        }
        y.append("parameters:\n");
        for (EstimatedParameter p : problem.parameters()) {
            y.append("  - id: ").append(p.id()).append('\n');
            y.append("    lower: ").append(DataNumbers.format(p.lower())).append('\n');
            y.append("    upper: ").append(DataNumbers.format(p.upper())).append('\n');
            y.append("    scale: ").append(p.scale().token()).append('\n');
            y.append("    start: ").append(DataNumbers.format(p.start())).append('\n');
            if (p.prior() != null) {
                if (p.prior().type() == Prior.Type.NORMAL) {
                    y.append("    prior: {type: normal, mean: ").append(DataNumbers.format(p.prior().parameter(0)))
                            .append(", sd: ").append(DataNumbers.format(p.prior().parameter(1))).append("}\n");
                } else if (p.prior().type() == Prior.Type.LOG_NORMAL) {
                    y.append("    prior: {type: lognormal, mu: ").append(DataNumbers.format(p.prior().parameter(0)))
                            .append(", sigma: ").append(DataNumbers.format(p.prior().parameter(1))).append("}\n");
                } else {
                    throw new IllegalArgumentException("parameter '" + p.id() + "': prior "
                            + p.prior().type().petabName() + " has no spelling in the switchfit format");
                }
            }
        }
    }

    private static void writeExperiments(SwitchfitProblem problem, StringBuilder y) {
        if (problem.experiments().isEmpty()) {
            return;
        }
        y.append("experiments:\n");
        for (Experiment e : problem.experiments()) {
            y.append("  - id: ").append(e.id()).append('\n');
            if (!e.parameterValues().isEmpty()) {
                y.append("    parameters: ").append(inlineMap(e.parameterValues())).append('\n');
            }
            if (!e.initialValues().isEmpty()) {
                y.append("    initial: ").append(inlineMap(e.initialValues())).append('\n');
            }
            if (e.settleIn() != null) {
                y.append("    settle_in: ").append(e.settleIn()).append('\n');
            }
            if (!e.doses().isEmpty()) {
                y.append("    doses:\n");
                for (Dose d : e.doses()) {
                    y.append("      - {at: ").append(DataNumbers.format(d.time())).append(", target: ")
                            .append(d.target()).append(d.action() == Dose.Action.SET ? ", set: " : ", add: ")
                            .append(d.amount()).append("}\n");
                }
            }
        }
    }

    private static String inlineMap(Map<String, ValueRef> m) {
        List<String> parts = new ArrayList<>();
        m.forEach((k, v) -> parts.add(k + ": " + v));
        return "{" + String.join(", ", parts) + "}";
    }

    private static void writeObservables(SwitchfitProblem problem, StringBuilder y) {
        if (problem.observables().isEmpty()) {
            return;
        }
        y.append("observables:\n");
        for (Observable o : problem.observables()) {
            y.append("  - id: ").append(o.id()).append('\n');
            y.append("    formula: ").append(q(o.formula())).append('\n');
            if (o.scaleParameter() != null) {
                y.append("    scale: ").append(o.scaleParameter()).append('\n');
            }
            if (o.offsetParameter() != null) {
                y.append("    offset: ").append(o.offsetParameter()).append('\n');
            }
            y.append("    noise: {type: ").append(o.noise().typeName());
            NoiseModel n = o.noise();
            if (n instanceof NoiseModel.Gaussian g) {
                y.append(", sigma: ").append(g.sigma());
            } else if (n instanceof NoiseModel.Proportional p) {
                y.append(", absolute: ").append(p.absolute()).append(", relative: ").append(p.relative());
            } else if (n instanceof NoiseModel.Laplace l) {
                y.append(", scale: ").append(l.scale());
            } else if (n instanceof NoiseModel.LogNormal l) {
                y.append(", sigma: ").append(l.sigma());
            }
            y.append("}\n");
        }
    }

    /** A YAML double-quoted scalar. */
    private static String q(String s) {
        return '"' + s.replace("\\", "\\\\").replace("\"", "\\\"") + '"';
    }
}
