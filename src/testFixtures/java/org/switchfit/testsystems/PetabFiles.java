package org.switchfit.testsystems;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;

/**
 * Writes small PEtab problems (model, parameter, condition, observable and measurement tables, problem YAML) for
 * tests, e.g. the decay of {@link DecaySbml} with its closed-form solution.
 */
public final class PetabFiles {
    private PetabFiles() {
    }

    /** The tiny PEtab problem of the data package's test resources (test runs only). */
    public static Path tinyProblem() {
        try {
            return Path.of(PetabFiles.class.getResource("/org/switchfit/data/petab-tiny/problem.yaml").toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    /**
     * Writes a PEtab problem with the given tables into {@code dir} and returns the YAML path. Tables are given
     * with '|' as column separator for readability (cells are trimmed).
     */
    public static Path write(Path dir, String model, String parameters, String conditions, String observables,
                             String measurements) {
        try {
            Files.createDirectories(dir);
            Files.writeString(dir.resolve("model.xml"), model);
            Files.writeString(dir.resolve("parameters.tsv"), tsv(parameters));
            Files.writeString(dir.resolve("conditions.tsv"), tsv(conditions));
            Files.writeString(dir.resolve("observables.tsv"), tsv(observables));
            Files.writeString(dir.resolve("measurements.tsv"), tsv(measurements));
            Path yaml = dir.resolve("problem.yaml");
            Files.writeString(yaml, """
                    format_version: 1
                    parameter_file: parameters.tsv
                    problems:
                      - sbml_files: [model.xml]
                        condition_files: [conditions.tsv]
                        measurement_files: [measurements.tsv]
                        observable_files: [observables.tsv]
                    """);
            return yaml;
        } catch (IOException e) {
            throw new UncheckedIOException(e);
        }
    }

    /**
     * Writes the decay problem of {@link DecaySbml#MODEL}: k linear in [0.01, 2], x0 log10 in [0.01, 100], one
     * condition c0, observable obs = X with log-normal noise of known σ, data m at times t; returns the YAML.
     */
    public static Path writeDecay(Path dir, double[] m, double[] t, double sigma) {
        return writeDecay(dir, DecaySbml.MODEL, "x0", m, t, sigma, "log");
    }

    /**
     * As {@link #writeDecay(Path, double[], double[], double)} with the given model whose second parameter is
     * {@code second} (log10 in [0.01, 100]) and the given observable transformation (lin, log).
     */
    public static Path writeDecay(Path dir, String model, String second, double[] m, double[] t, double sigma,
                                  String transform) {
        StringBuilder meas = new StringBuilder("observableId | simulationConditionId | measurement | time");
        for (int i = 0; i < t.length; i++) {
            meas.append(String.format(Locale.ROOT, "%nobs | c0 | %s | %s", m[i], t[i]));
        }
        return write(dir, model,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "k | lin | 0.01 | 2 | 0.2 | 1\n"
                        + second + " | log10 | 0.01 | 100 | 1.0 | 1",
                "conditionId\nc0",
                "observableId | observableFormula | noiseFormula | observableTransformation | noiseDistribution\n"
                        + "obs | X | " + sigma + " | " + transform + " | normal",
                meas.toString());
    }

    private static String tsv(String s) {
        StringBuilder sb = new StringBuilder();
        for (String line : s.strip().split("\n")) {
            String[] cells = line.split("\\|", -1);
            for (int i = 0; i < cells.length; i++) {
                sb.append(i > 0 ? "\t" : "").append(cells[i].strip());
            }
            sb.append('\n');
        }
        return sb.toString();
    }
}
