package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.FitResult;
import org.switchfit.fit.LocalTaskExecutor;
import org.switchfit.fit.Multistart;
import org.switchfit.objective.LikelihoodObjective;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.profile.ConfidenceInterval;
import org.switchfit.profile.Profile;
import org.switchfit.profile.ProfileLikelihood;
import org.switchfit.report.BranchesFile;
import org.switchfit.testsystems.PetabFiles;

/**
 * The library example of README.md ("Using switchfit as a library") runs as written: the README block must contain
 * the body of {@link #example} line for line, and the body runs here on small inputs (the decay problem of
 * {@link PetabFiles#writeDecay} instead of the demo problem, so the test stays fast; the bundled demo model for the
 * branches).
 *
 * <p>Expected values: the decay fit's interval for k must contain the least-squares estimate of the log-linear
 * regression (closed form, see {@link ProfileCommandTest}); the demo model's folds are at stimulus 0.825486 and
 * 2.067553 (README, independent sympy computation in datasets/stress_switch_check.py), to 1e-5 relative (the
 * continuation refines folds to 1e-11 relative; 1e-5 allows for the six printed digits of the reference).
 */
class LibraryExampleTest {

    @TempDir
    Path dir;

    record Out(FitResult fit, ConfidenceInterval ci, BranchesFile br) {
    }

    static Out example(Path problemFile, String profiled, Path modelFile, String control) {
        // README example begins
        EstimationProblem problem = ProblemLoader.load(problemFile);
        LikelihoodObjective nll = LikelihoodObjective.of(problem, SolverSettings.defaults());
        FitProblem fp = FitCommand.fitProblem(problem, nll);    // bounds and scales from the problem file
        FitResult fit = Multistart.defaults().withStarts(20).withSeed(1)
                .run(fp, null, LocalTaskExecutor.ofThreads(2));
        Profile profile = ProfileLikelihood.defaults().profileParameter(fp, fit.bestTheta(), fp.indexOf(profiled));
        ConfidenceInterval ci = profile.pointwise();           // ci.lowerLinear(), ci.upperLinear(), ci.closed()
        BranchesFile br = BranchesCommand.trace(modelFile, control, 0, 4, Map.of());
        // br.folds(): each fold's control value and state; br.branches(): the points with their stability
        // README example ends
        return new Out(fit, ci, br);
    }

    @Test
    void readmeShowsTheCodeThatRunsHere() throws IOException {
        String src = Files.readString(Path.of("src/test/java/org/switchfit/cli/LibraryExampleTest.java"));
        String body = src.substring(src.indexOf("// README example begins") + "// README example begins".length(),
                src.indexOf("        // README example ends"));
        String readme = Files.readString(Path.of("README.md"));
        for (String line : body.strip().lines().map(String::strip).toList()) {
            assertTrue(readme.lines().map(String::strip).anyMatch(line::equals), "README lacks: " + line);
        }
    }

    @Test
    void exampleRuns() {
        double[] t = {0, 1, 2, 3, 4, 6};
        double[] m = {2.1, 1.45, 1.12, 0.78, 0.6, 0.33};
        Path yaml = PetabFiles.writeDecay(dir.resolve("decay"), m, t, 0.1);
        Out o = example(yaml, "k", Path.of("models/stress_switch.xml"), "stimulus");
        // Closed form: ln m = a - k t + e with known σ, so k̂ = -slope of the least-squares line of ln m on t.
        double mt = 0;
        double ml = 0;
        for (int i = 0; i < t.length; i++) {
            mt += t[i] / t.length;
            ml += Math.log(m[i]) / t.length;
        }
        double sxy = 0;
        double sxx = 0;
        for (int i = 0; i < t.length; i++) {
            sxy += (t[i] - mt) * (Math.log(m[i]) - ml);
            sxx += (t[i] - mt) * (t[i] - mt);
        }
        double kHat = -sxy / sxx;
        assertTrue(o.ci().closed() && o.ci().lowerLinear() < kHat && kHat < o.ci().upperLinear(), o.ci().toString());
        assertEquals(2, o.br().folds().size());
        double[] folds = o.br().folds().stream().mapToDouble(BranchesFile.Special::value).sorted().toArray();
        assertEquals(0.825486, folds[0], 1e-5 * 0.825486);
        assertEquals(2.067553, folds[1], 1e-5 * 2.067553);
    }
}
