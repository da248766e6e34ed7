package org.switchfit.report;

import java.io.IOException;
import java.nio.file.Path;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;

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
        StringBuilder m = new StringBuilder("observableId | simulationConditionId | measurement | time");
        double[] t = {0, 1, 2, 4, 8};
        for (double ti : t) {
            m.append("\nlinObs | c0 | ").append(4 * Math.exp(-0.3 * ti) + 0.01).append(" | ").append(ti);
            m.append("\nlogObs | c0 | ").append(2 * Math.exp(-0.3 * ti)).append(" | ").append(ti);
        }
        m.append("\nlinObs | fast | 1.5 | 3");
        return PetabFiles.write(dir, MODEL,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "k | log10 | 1e-3 | 10 | 0.2 | 1\nx0 | log10 | 1e-2 | 100 | 1.0 | 1",
                "conditionId | k\nc0 | k\nfast | 0.9",
                "observableId | observableFormula | noiseFormula | observableTransformation | noiseDistribution\n"
                        + "linObs | 2 * X | 0.1 | lin | normal\nlogObs | X | 0.2 | log | normal",
                m.toString());
    }
}
