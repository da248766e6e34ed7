package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;
import org.switchfit.util.UserInputException;

/**
 * The switchfit problem format gives the same objective as the equivalent PEtab problem (an independent join of the
 * same data), and its noise models follow their documented densities.
 */
class SwitchfitFormatTest {
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);

    @TempDir
    Path dir;

    private Path ours(String noise, String extraParams) throws IOException {
        Files.writeString(dir.resolve("model.xml"), DecaySbml.MODEL);
        Files.writeString(dir.resolve("tc.csv"), "experiment,observable,time,value,sigma\n"
                + "e1,obs,0,2.1,\ne1,obs,1,1.45,\ne1,obs,2,1.12,\ne2,obs,1,0.9,\n");
        Path yaml = dir.resolve("problem.yaml");
        Files.writeString(yaml, "switchfit_format: 1\nmodel: model.xml\nparameters:\n"
                + "  - {id: k, lower: 1e-3, upper: 10, scale: log10, start: 0.4}\n"
                + "  - {id: x0, lower: 1e-2, upper: 100, scale: log, start: 1.8}\n" + extraParams
                + "experiments:\n  - id: e1\n  - id: e2\n    parameters: {k: 0.5}\n"
                + "observables:\n  - {id: obs, formula: X, noise: " + noise + "}\n"
                + "data:\n  timecourses:\n    - file: tc.csv\n");
        return yaml;
    }

    private Path petab(String noiseFormula, String transformation, String extraParams) {
        return PetabFiles.write(dir.resolve("petab"), DecaySbml.MODEL,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "k | log10 | 1e-3 | 10 | 0.4 | 1\nx0 | log | 1e-2 | 100 | 1.8 | 1\n" + extraParams,
                "conditionId | k\ne1 | k\ne2 | 0.5",
                "observableId | observableFormula | noiseFormula | observableTransformation\nobs | X | "
                        + noiseFormula + " | " + transformation,
                "observableId | simulationConditionId | measurement | time\nobs | e1 | 2.1 | 0\nobs | e1 | 1.45 | 1\n"
                        + "obs | e1 | 1.12 | 2\nobs | e2 | 0.9 | 1");
    }

    private static double nll(Path problem) {
        EstimationProblem p = ProblemLoader.load(problem);
        return LikelihoodObjective.of(p, TIGHT).evaluateDetailed(p.nominalTheta()).nll();
    }

    /** Tolerance: both formats run the same integration (rtol 1e-10); 1e-9 relative covers reordering. */
    @Test
    void gaussianWithEstimatedSigmaEqualsPetab() throws IOException {
        double a = nll(ours("{type: gaussian, sigma: sd}", "  - {id: sd, lower: 1e-3, upper: 10, start: 0.2}\n"));
        double b = nll(petab("sd", "lin", "sd | lin | 1e-3 | 10 | 0.2 | 1"));
        assertEquals(b, a, 1e-9 * Math.abs(b));
    }

    @Test
    void logNormalEqualsPetabLogTransformation() throws IOException {
        double a = nll(ours("{type: lognormal, sigma: 0.1}", ""));
        double b = nll(petab("0.1", "log", ""));
        assertEquals(b, a, 1e-9 * Math.abs(b));
    }

    /** Proportional noise sigma = a + b |y| (documented in data.NoiseModel): PEtab formula 0.05 + 0.1 * abs(X). */
    @Test
    void proportionalEqualsPetabFormula() throws IOException {
        double a = nll(ours("{type: proportional, absolute: 0.05, relative: 0.1}", ""));
        double b = nll(petab("0.05 + 0.1 * abs(X)", "lin", ""));
        assertEquals(b, a, 1e-9 * Math.abs(b));
        Path yaml = ours("{type: proportional, absolute: 0.05, relative: 0.1}", "");
        EstimationProblem p = ProblemLoader.load(yaml);
        GradientCheck.assertJacobian(LikelihoodObjective.of(p, TIGHT), new double[] {-0.3, 0.4}, 1e-5);
    }

    /**
     * A table's {@code sigma} replaces the observable's spread in the terms of its noise model (as documented in
     * docs/problem-format.md). One point v = 1.3 at t = 1 with sigma s = 0.2, prediction y = 2 e^{-0.3} (k = 0.3,
     * x0 = 2). Closed forms, by hand from the densities: Laplace with scale s: log(2 s) + |v - y| / s; log-normal
     * with s the SD of ln x: 0.5 log(2 pi) + log s + (ln v - ln y)^2 / (2 s^2) + ln v (the log-data Jacobian, as
     * PEtab v1 defines it, from memory); proportional with s the SD of x: 0.5 log(2 pi) + log s + (v - y)^2 / (2 s^2).
     */
    @Test
    void tableSigmaIsTheSpreadOfTheNoiseModel() throws IOException {
        double v = 1.3;
        double s = 0.2;
        double y = 2 * Math.exp(-0.3);
        double[] expected = {Math.log(2 * s) + Math.abs(v - y) / s,
            0.5 * Math.log(2 * Math.PI) + Math.log(s) + Math.pow(Math.log(v) - Math.log(y), 2) / (2 * s * s)
                    + Math.log(v),
            0.5 * Math.log(2 * Math.PI) + Math.log(s) + Math.pow(v - y, 2) / (2 * s * s)};
        String[] noise = {"{type: laplace, scale: 5}", "{type: lognormal, sigma: 5}",
            "{type: proportional, absolute: 5, relative: 5}"};
        for (int i = 0; i < noise.length; i++) {
            Path yaml = ours(noise[i], "");
            Files.writeString(dir.resolve("tc.csv"), "experiment,observable,time,value,sigma\ne1,obs,1," + v + ","
                    + s + "\n");
            EstimationProblem p = ProblemLoader.load(yaml);
            double[] theta = {Math.log10(0.3), Math.log(2.0)};
            double nll = LikelihoodObjective.of(p, TIGHT).evaluateDetailed(theta).nll();
            // tolerance: integration at rtol 1e-10 moves y by about 1e-10 relative
            assertEquals(expected[i], nll, 1e-8, noise[i]);
        }
    }

    @Test
    void doseToAnUnknownTargetIsReportedOnOneLine() throws IOException {
        Path yaml = ours("{type: gaussian, sigma: 0.1}", "");
        String text = Files.readString(yaml).replace("  - id: e2\n", "  - id: e2\n    doses:\n"
                + "      - {at: 1, target: Y, add: 0.5}\n");
        Files.writeString(yaml, text);
        UserInputException e = assertThrows(UserInputException.class, () -> ProblemLoader.load(yaml));
        assertFalse(e.getMessage().contains("\n"));
        assertTrue(e.getMessage().contains("dose target 'Y'"), e.getMessage());
        assertTrue(e.getMessage().contains("problem.yaml, line"), e.getMessage());
        // the same dose to the species X loads (doses are simulated; see DoseTest)
        Files.writeString(yaml, text.replace("target: Y", "target: X"));
        assertEquals(1, ProblemLoader.load(yaml).experiments().get(1).doses().size());
    }
}
