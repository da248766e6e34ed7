package org.switchfit.cli;

import org.switchfit.ode.SolverSettings;
import picocli.CommandLine.Option;

/**
 * The integration tolerances {@code --rtol} and {@code --atol} of the commands that evaluate a problem's
 * likelihood ({@code check}, {@code bench-profiles}, and through {@link FitSolverOptions} {@code fit} and
 * {@code bench-fits}). Not thread-safe (picocli fills the fields).
 */
class ToleranceOptions {

    @Option(names = "--rtol", defaultValue = "1e-8", description = "relative tolerance (default: ${DEFAULT-VALUE})")
    double rtol;

    @Option(names = "--atol", defaultValue = "1e-12", description = "absolute tolerance (default: ${DEFAULT-VALUE})")
    double atol;

    /** BDF integration at {@code --rtol} and {@code --atol}. */
    SolverSettings settings() {
        return SimulateCommand.settings("bdf", rtol, atol);
    }
}
