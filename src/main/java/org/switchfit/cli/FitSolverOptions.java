package org.switchfit.cli;

import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.Multistart;
import org.switchfit.ode.SolverSettings;
import picocli.CommandLine.Option;

/**
 * Integration and optimizer options shared by {@code fit} and {@code bench-fits} ({@code --rtol}, {@code --atol},
 * {@code --max-iterations}). The cost tolerance is not among them: the two commands stop at different relative
 * cost changes, so each passes its own to {@link #multistart} (see {@link FitCommand#costTolerance} and
 * {@link BenchFitsCommand#COST_TOLERANCE}). Not thread-safe (picocli fills the fields).
 */
final class FitSolverOptions {

    @Option(names = "--rtol", defaultValue = "1e-8", description = "relative tolerance (default: ${DEFAULT-VALUE})")
    double rtol;

    @Option(names = "--atol", defaultValue = "1e-12", description = "absolute tolerance (default: ${DEFAULT-VALUE})")
    double atol;

    @Option(names = "--max-iterations", defaultValue = "1000",
            description = "iterations per start (default: ${DEFAULT-VALUE})")
    int maxIterations;

    /** BDF integration at {@code --rtol} and {@code --atol}. */
    SolverSettings settings() {
        return SimulateCommand.settings("bdf", rtol, atol);
    }

    /**
     * The multistart of the run: Levenberg-Marquardt with {@code --max-iterations} and the given cost tolerance.
     *
     * @param costTolerance stop when an accepted step changes the cost by less than this fraction
     */
    Multistart multistart(int starts, long seed, double costTolerance) {
        return Multistart.defaults().withStarts(starts).withSeed(seed)
                .withOptimizer(LevenbergMarquardt.defaults().withMaxIterations(maxIterations)
                        .withCostTolerance(costTolerance));
    }
}
