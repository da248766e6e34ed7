package org.switchfit.cli;

import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.Multistart;
import picocli.CommandLine.Option;

/**
 * Integration and optimizer options shared by {@code fit} and {@code bench-fits}: the tolerances of
 * {@link ToleranceOptions}, {@code --max-iterations}, {@code --cost-tolerance} and
 * {@code --no-closed-form-factors}. Not thread-safe (picocli fills
 * the fields).
 */
final class FitSolverOptions extends ToleranceOptions {

    @Option(names = "--max-iterations", defaultValue = "1000",
            description = "iterations per start (default: ${DEFAULT-VALUE})")
    int maxIterations;

    /**
     * Relative cost change below which a start stops. Default 1e-10: at rtol 1e-8 the objective carries
     * integration noise of about 1e-10 relative (measured on Brannmark_JBC2010: accepted and rejected trial
     * costs scatter by 2e-10 around 620 where the linear model predicts 1e-11), so tighter values only spend
     * iterations on noise.
     */
    @Option(names = "--cost-tolerance", defaultValue = "1e-10",
            description = "stop when an LM step changes the cost by less than this fraction (default: "
                    + "${DEFAULT-VALUE}; objective values are only accurate to about the integration rtol)")
    double costTolerance;

    @Option(names = "--no-closed-form-factors", description = "fit scaling factors of relative data by the"
            + " optimizer's steps instead of holding them at their closed-form conditional optimum")
    boolean noClosedFormFactors;

    /** The settings that change a start's result, for {@link StartStore.RunIdentity}. */
    java.util.Map<String, String> identity(int starts, long seed, boolean nominalStart) {
        java.util.Map<String, String> m = new java.util.LinkedHashMap<>();
        m.put("starts", Integer.toString(starts));
        m.put("seed", Long.toString(seed));
        m.put("nominal start", Boolean.toString(nominalStart));
        m.put("rtol", Double.toString(rtol));
        m.put("atol", Double.toString(atol));
        m.put("max iterations", Integer.toString(maxIterations));
        m.put("cost tolerance", Double.toString(costTolerance));
        m.put("closed-form factors", Boolean.toString(!noClosedFormFactors));
        return m;
    }

    /** The multistart of the run: Levenberg-Marquardt with {@code --max-iterations} and {@code --cost-tolerance}. */
    Multistart multistart(int starts, long seed) {
        if (!(costTolerance >= 0) || maxIterations < 1) {
            throw new org.switchfit.util.UserInputException(null, "--cost-tolerance must be >= 0 and "
                    + "--max-iterations at least 1; got " + costTolerance + " and " + maxIterations);
        }
        return Multistart.defaults().withStarts(starts).withSeed(seed)
                .withOptimizer(LevenbergMarquardt.defaults().withMaxIterations(maxIterations)
                        .withCostTolerance(costTolerance).withFactorProjection(!noClosedFormFactors));
    }
}
