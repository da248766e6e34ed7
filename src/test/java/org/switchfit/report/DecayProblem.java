package org.switchfit.report;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.switchfit.testsystems.DecaySbml;

/**
 * A small PEtab problem for tests: first-order decay X' = -k X, X(0) = x0 (solution x0 exp(-k t)), observables
 * linObs = 2 X (linear, sigma 0.1) and logObs = X (log-normal, sigma 0.2), conditions c0 (k estimated) and fast
 * (k = 0.9). Data: noise-free closed-form values, linObs shifted by 0.01.
 */
public final class DecayProblem {
    private DecayProblem() {
    }

    /** The SBML model. */
    public static final String MODEL = DecaySbml.MODEL;

    /** Writes the problem files into {@code dir}; returns the YAML path. */
    public static Path write(Path dir) throws IOException {
        Files.createDirectories(dir);
        Files.writeString(dir.resolve("model.xml"), MODEL);
        Files.writeString(dir.resolve("parameters.tsv"), "parameterId\tparameterScale\tlowerBound\tupperBound\t"
                + "nominalValue\testimate\nk\tlog10\t1e-3\t10\t0.2\t1\nx0\tlog10\t1e-2\t100\t1.0\t1\n");
        Files.writeString(dir.resolve("conditions.tsv"), "conditionId\tk\nc0\tk\nfast\t0.9\n");
        Files.writeString(dir.resolve("observables.tsv"), "observableId\tobservableFormula\tnoiseFormula\t"
                + "observableTransformation\tnoiseDistribution\nlinObs\t2 * X\t0.1\tlin\tnormal\n"
                + "logObs\tX\t0.2\tlog\tnormal\n");
        StringBuilder m = new StringBuilder("observableId\tsimulationConditionId\tmeasurement\ttime\n");
        double[] t = {0, 1, 2, 4, 8};
        for (double ti : t) {
            m.append("linObs\tc0\t").append(4 * Math.exp(-0.3 * ti) + 0.01).append('\t').append(ti).append('\n');
            m.append("logObs\tc0\t").append(2 * Math.exp(-0.3 * ti)).append('\t').append(ti).append('\n');
        }
        m.append("linObs\tfast\t1.5\t3\n");
        Files.writeString(dir.resolve("measurements.tsv"), m.toString());
        Path yaml = dir.resolve("problem.yaml");
        Files.writeString(yaml, "format_version: 1\nparameter_file: parameters.tsv\nproblems:\n"
                + "  - sbml_files: [model.xml]\n    condition_files: [conditions.tsv]\n"
                + "    measurement_files: [measurements.tsv]\n    observable_files: [observables.tsv]\n");
        return yaml;
    }
}
