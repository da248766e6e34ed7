package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;

/**
 * Exact residual Jacobians of a PEtab problem whose model has a state-triggered event (sensitivities with jumps at
 * the event), against a closed form derived by hand and against central differences.
 */
class EventGradientTest {
    /** Integration at rtol 1e-10 (see {@link GradientCheck} for the central-difference tolerance). */
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    /**
     * Relative tolerance against the closed form: BDF global error of states and sensitivities about 1e-9 to 1e-8
     * at rtol 1e-10 (common practice), event time located to 1e-12 relative; 1e-6 leaves a margin of 100.
     */
    private static final double REL = 1e-6;

    @TempDir
    Path dir;

    /** X' = -k X, X(0) = x0; event "reset": when X &lt; cth, X = xr. */
    private static final String RESET_MODEL = DecaySbml.RESET;

    private static final double[] T = {3.0, 5.0, 6.5, 8.0};
    private static final double[] M = {0.8, 0.9, 0.6, 0.75};
    private static final double SIGMA = 0.1;

    private Path problem() {
        StringBuilder meas = new StringBuilder("observableId | simulationConditionId | measurement | time");
        for (int i = 0; i < T.length; i++) {
            meas.append("\nobs | c0 | ").append(M[i]).append(" | ").append(T[i]);
        }
        return PetabFiles.write(dir, RESET_MODEL,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "k | log10 | 1e-3 | 10 | 0.3 | 1\n"
                        + "x0 | lin | 0.6 | 10 | 2 | 1\n"
                        + "cth | lin | 0.01 | 0.55 | 0.5 | 1\n"
                        + "xr | log10 | 0.6 | 10 | 1 | 1",
                "conditionId\nc0",
                "observableId | observableFormula | noiseFormula\nobs | X | " + SIGMA,
                meas.toString());
    }

    @Test
    void jacobianMatchesClosedFormAcrossResets() {
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(problem()), TIGHT);
        double[] th = obj.problem().nominalTheta();
        int nr = obj.residualCount();
        int np = obj.parameterCount();
        double[] r = new double[nr];
        double[] jac = new double[nr * np];
        obj.evaluate(th, r, jac);
        // Derived by hand (as in the ode package's EventSensitivityTest): first reset at t1 = ln(x0/c)/k, then
        // X = xr e^{-k(t-t1)}; second at t2 = t1 + ln(xr/c)/k. dX/dk = -X t throughout; between t1 and t2
        // dX/dx0 = X/x0, dX/dc = -X/c, dX/dxr = X/xr; after t2 dX/dc = -2X/c, dX/dxr = 2X/xr; before t1
        // dX/dx0 = X/x0 only. Residual (m - X)/σ, so dr/dθ = -dX/dθ · dlin/dθ / σ, dlin/dθ = lin ln 10 on log10.
        double k = 0.3;
        double x0 = 2;
        double c = 0.5;
        double xr = 1;
        double ln10 = Math.log(10);
        double t1 = Math.log(x0 / c) / k;
        double t2 = t1 + Math.log(xr / c) / k;
        for (int i = 0; i < T.length; i++) {
            double t = T[i];
            double x;
            double[] dx;
            if (t < t1) {
                x = x0 * Math.exp(-k * t);
                dx = new double[] {-x * t, x / x0, 0, 0};
            } else if (t < t2) {
                x = xr * Math.exp(-k * (t - t1));
                dx = new double[] {-x * t, x / x0, -x / c, x / xr};
            } else {
                x = xr * Math.exp(-k * (t - t2));
                dx = new double[] {-x * t, x / x0, -2 * x / c, 2 * x / xr};
            }
            assertEquals((M[i] - x) / SIGMA, r[i], REL * Math.abs(x) / SIGMA, "residual at t = " + t);
            double[] chain = {k * ln10, 1, 1, xr * ln10};
            for (int j = 0; j < np; j++) {
                double expected = -dx[j] * chain[j] / SIGMA;
                assertEquals(expected, jac[i * np + j], REL * Math.max(Math.abs(expected), x / SIGMA),
                        "dr/dθ at t = " + t + ", parameter " + j);
            }
        }
    }

    @Test
    void jacobianMatchesCentralDifferencesAwayFromNominal() {
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(problem()), TIGHT);
        double[] th = obj.problem().nominalTheta();
        th[0] += 0.05;
        th[1] -= 0.2;
        th[2] -= 0.05;
        th[3] += 0.03;
        GradientCheck.assertJacobian(obj, th, 1e-5);
    }
}
