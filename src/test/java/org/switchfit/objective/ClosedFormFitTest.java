package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.LocalFit;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;

/**
 * Maximum-likelihood estimates known in closed form, reached by Levenberg-Marquardt on the objective.
 */
class ClosedFormFitTest {
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    private static final double[] T = {0, 1, 2, 3, 4, 6};
    private static final double[] M = {2.1, 1.45, 1.12, 0.78, 0.6, 0.33};

    @TempDir
    Path dir;

    private static String measurements(String obs) {
        StringBuilder sb = new StringBuilder("observableId | simulationConditionId | measurement | time\n");
        for (int i = 0; i < T.length; i++) {
            sb.append(obs).append(" | c0 | ").append(M[i]).append(" | ").append(T[i]).append('\n');
        }
        return sb.toString();
    }

    private static LocalFit fit(LikelihoodObjective obj) {
        return LevenbergMarquardt.defaults().minimize(Fits.problem(obj), obj.problem().nominalTheta());
    }

    /**
     * Log-normal decay: ln m_i = ln x0 - k t_i + e_i, e_i ~ N(0, 0.1²). The ML estimate is ordinary least squares
     * of ln m on t (derived by hand): k = -S_ty / S_tt, ln x0 = mean(ln m) + k mean(t). The model is X' = -k X
     * with X(0) = x0 set by an initial assignment, so the gradient runs through the initial-assignment chain rule.
     */
    @Test
    void logNormalDecayEqualsLeastSquaresOnLogData() {
        Path yaml = PetabFiles.write(dir, DecaySbml.MODEL,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "k | log10 | 1e-3 | 10 | 0.2 | 1\n"
                        + "x0 | log10 | 1e-2 | 100 | 1.0 | 1",
                "conditionId\nc0",
                "observableId | observableFormula | noiseFormula | observableTransformation | noiseDistribution\n"
                        + "obs | X | 0.1 | log | normal",
                measurements("obs"));
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(yaml), TIGHT);
        LocalFit f = fit(obj);
        int n = T.length;
        double tb = 0;
        double yb = 0;
        for (int i = 0; i < n; i++) {
            tb += T[i] / n;
            yb += Math.log(M[i]) / n;
        }
        double stt = 0;
        double sty = 0;
        for (int i = 0; i < n; i++) {
            stt += (T[i] - tb) * (T[i] - tb);
            sty += (T[i] - tb) * (Math.log(M[i]) - yb);
        }
        double k = -sty / stt;
        double lnx0 = yb + k * tb;
        double nll = 0;
        for (int i = 0; i < n; i++) {
            double r = (Math.log(M[i]) - (lnx0 - k * T[i])) / 0.1;
            // PEtab v1 log-normal density: 0.5 log(2 pi sigma^2) + ln m + 0.5 r^2
            nll += 0.5 * Math.log(2 * Math.PI * 0.01) + Math.log(M[i]) + 0.5 * r * r;
        }
        // Tolerance 1e-6 on log10 values: the solver's relative error 1e-9 over 6 points, amplified by the
        // conditioning of the 2-parameter regression (about 10) and the optimizer's gradient tolerance.
        assertEquals(Math.log10(k), f.theta()[0], 1e-6, "log10 k");
        assertEquals(lnx0 / Math.log(10), f.theta()[1], 1e-6, "log10 x0");
        assertEquals(nll, f.nll(), 1e-8 * Math.abs(nll), "NLL at the optimum");
    }

    /**
     * Normal noise with known sigma, decay rate fixed: prediction x0 e^{-k t} is linear in x0, so the ML estimate is
     * x0 = Σ m_i e_i / Σ e_i², e_i = e^{-k t_i} (derived by hand).
     */
    @Test
    void linearInitialValueWithKnownSigma() {
        Path yaml = PetabFiles.write(dir, DecaySbml.MODEL,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "k | lin | 1e-3 | 10 | 0.3 | 0\n"
                        + "x0 | lin | 0 | 100 | 1.0 | 1",
                "conditionId\nc0",
                "observableId | observableFormula | noiseFormula\nobs | X | 0.05",
                measurements("obs"));
        LikelihoodObjective obj = LikelihoodObjective.of(ProblemLoader.load(yaml), TIGHT);
        LocalFit f = fit(obj);
        double num = 0;
        double den = 0;
        for (int i = 0; i < T.length; i++) {
            double e = Math.exp(-0.3 * T[i]);
            num += M[i] * e;
            den += e * e;
        }
        double x0 = num / den;
        double nll = 0;
        for (int i = 0; i < T.length; i++) {
            double r = (M[i] - x0 * Math.exp(-0.3 * T[i])) / 0.05;
            nll += 0.5 * Math.log(2 * Math.PI * 0.0025) + 0.5 * r * r;
        }
        assertEquals(x0, f.theta()[0], 1e-7 * x0, "x0");
        assertEquals(nll, f.nll(), 1e-8 * Math.abs(nll));
        assertTrue(f.termination().converged(), f.termination().name());
    }
}
