package org.switchfit.objective;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.switchfit.testsystems.DecaySbml;

/** Writes small PEtab problems for tests. */
final class PetabFiles {
    private PetabFiles() {
    }

    /** The tiny PEtab problem of the data package's test resources. */
    static Path tinyProblem() {
        try {
            return Path.of(PetabFiles.class.getResource("/org/switchfit/data/petab-tiny/problem.yaml").toURI());
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    /** Decay model X' = -k X with X(0) = x0 through an initial assignment (species in a unit compartment). */
    static final String DECAY_MODEL = DecaySbml.MODEL;

    /**
     * Writes a PEtab problem with the given tables into {@code dir} and returns the YAML path. Tables are given
     * with '|' as column separator for readability.
     */
    static Path write(Path dir, String model, String parameters, String conditions, String observables,
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
