package org.switchfit.cli;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import org.switchfit.testsystems.DecaySbml;

/** Writes a tiny PEtab problem: X' = -k X, X(0) = x0 (initial assignment), log-normal noise of known σ. */
final class DecayProblemFiles {
    private DecayProblemFiles() {
    }

    static final String MODEL = DecaySbml.MODEL;

    /**
     * The same decay reparameterised by B = X(tStar): X(0) = B e^{k tStar}, so X(t) = B e^{-k (t - tStar)}.
     */
    static String reparameterisedModel(double tStar) {
        return MODEL.replace("<parameter id=\"x0\" value=\"2\" constant=\"true\"/>",
                        "<parameter id=\"B\" value=\"2\" constant=\"true\"/>")
                .replace("<ci>x0</ci>", "<apply><times/><ci>B</ci><apply><exp/><apply><times/><ci>k</ci><cn>"
                        + tStar + "</cn></apply></apply></apply>");
    }

    /** Writes the problem into {@code dir} (k linear in [0.01, 2], x0 log10 in [0.01, 100]); returns the YAML. */
    static Path write(Path dir, double[] m, double[] t, double sigma) {
        return write(dir, MODEL, "x0", m, t, sigma, "log");
    }

    /**
     * Writes a problem with the given model whose second parameter is {@code second} (log10 in [0.01, 100]) and the
     * given observable transformation (lin, log).
     */
    static Path write(Path dir, String model, String second, double[] m, double[] t, double sigma, String transform) {
        try {
            Files.createDirectories(dir);
            Files.writeString(dir.resolve("model.xml"), model);
            Files.writeString(dir.resolve("parameters.tsv"),
                    "parameterId\tparameterScale\tlowerBound\tupperBound\tnominalValue\testimate\n"
                            + "k\tlin\t0.01\t2\t0.2\t1\n"
                            + second + "\tlog10\t0.01\t100\t1.0\t1\n");
            Files.writeString(dir.resolve("conditions.tsv"), "conditionId\nc0\n");
            Files.writeString(dir.resolve("observables.tsv"),
                    "observableId\tobservableFormula\tnoiseFormula\tobservableTransformation\tnoiseDistribution\n"
                            + "obs\tX\t" + sigma + "\t" + transform + "\tnormal\n");
            StringBuilder sb = new StringBuilder("observableId\tsimulationConditionId\tmeasurement\ttime\n");
            for (int i = 0; i < t.length; i++) {
                sb.append(String.format(Locale.ROOT, "obs\tc0\t%s\t%s%n", m[i], t[i]));
            }
            Files.writeString(dir.resolve("measurements.tsv"), sb.toString());
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
}
