package org.switchfit.cli;

import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.Multistart;
import picocli.CommandLine.Option;

/**
 * Integration and optimizer options shared by {@code fit} and {@code bench-fits}: the tolerances of
 * {@link ToleranceOptions} and {@code --max-iterations}. The cost tolerance is not among them: the two commands stop at different relative
 * cost changes, so each passes its own to {@link #multistart} (see {@link FitCommand#costTolerance} and
 * {@link BenchFitsCommand#COST_TOLERANCE}). Not thread-safe (picocli fills the fields).
 */
final class FitSolverOptions extends ToleranceOptions {

    @Option(names = "--max-iterations", defaultValue = "1000",
            description = "iterations per start (default: ${DEFAULT-VALUE})")
    int maxIterations;

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
