package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.FitResult;
import org.switchfit.fit.StartResult;
import org.switchfit.objective.LikelihoodObjective;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.PetabFiles;
import org.switchfit.util.UserInputException;
import picocli.CommandLine;

/**
 * The options {@code fit} and {@code bench-fits} share ({@link FitSolverOptions}) and their run into a folder of
 * finished starts ({@link StartStore}); the defaults checked are regression values of the settings, not
 * independent numbers.
 */
class FitSolverOptionsTest {

    @TempDir
    Path dir;

    @Test
    void bothCommandsParseTheSharedOptionsWithTheSameDefaults() {
        FitCommand fit = new FitCommand();
        new CommandLine(fit).parseArgs("p.yaml", "--out", "o");
        BenchFitsCommand bench = new BenchFitsCommand();
        new CommandLine(bench).parseArgs("d", "--out", "o");
        for (FitSolverOptions s : List.of(fit.solver, bench.solver)) {
            assertEquals(1e-8, s.rtol);
            assertEquals(1e-12, s.atol);
            assertEquals(1000, s.maxIterations);
            assertEquals(1e-10, s.costTolerance);
        }
        FitCommand set = new FitCommand();
        new CommandLine(set).parseArgs("p.yaml", "--out", "o", "--rtol", "1e-6", "--atol", "1e-9",
                "--max-iterations", "7");
        assertEquals(1e-6, set.solver.rtol);
        assertEquals(1e-9, set.solver.atol);
        assertEquals(7, set.solver.maxIterations);
        assertEquals(1e-6, set.solver.settings().rtol());
        assertEquals(1e-9, set.solver.settings().atol());
    }

    @Test
    void startStoreRefusesWithoutResumeAndContinuesWithIt() {
        // X' = -k X decay (PetabFiles.writeDecay): a 3-start run, then a resumed 3-start run over the same folder must
        // reuse all three stored starts and give the same best NLL (reproducible from the seed).
        EstimationProblem p = ProblemLoader.load(PetabFiles.writeDecay(dir.resolve("problem"),
                new double[] {2.0, 1.5, 1.1}, new double[] {0, 1, 2}, 0.1));
        FitSolverOptions solver = new FitSolverOptions();
        solver.rtol = 1e-8;
        solver.atol = 1e-12;
        solver.maxIterations = 200;
        solver.costTolerance = 1e-10;
        FitProblem fp = FitCommand.fitProblem(p, LikelihoodObjective.of(p, solver.settings()));
        Path starts = dir.resolve("starts");
        StartStore first = new StartStore(starts, false, () -> new UserInputException(null, "unused"));
        assertTrue(first.finished().isEmpty());
        FitResult a = first.run(solver.multistart(3, 5), fp, null, 1, null);
        UserInputException e = assertThrows(UserInputException.class,
                () -> new StartStore(starts, false, () -> new UserInputException(null, "holds starts; add --resume")));
        assertTrue(e.getMessage().contains("add --resume"), e.getMessage());
        StartStore again = new StartStore(starts, true, () -> new UserInputException(null, "unused"));
        assertEquals(3, again.finished().size());
        int[] newlyRun = {0};
        FitResult b = again.run(solver.multistart(3, 5), fp, null, 1, r -> newlyRun[0]++);
        assertEquals(0, newlyRun[0], "all starts were reused");
        assertEquals(a.bestNll(), b.bestNll(), 0.0);
        for (StartResult r : b.starts()) {
            assertTrue(r.index() >= 0 && r.index() < 3);
        }
    }
}
