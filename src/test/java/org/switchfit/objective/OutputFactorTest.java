package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.LocalFit;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;

/**
 * Which estimated parameters {@link LikelihoodObjective#outputFactors()} reports as pure output factors, and a fit
 * of relative data with one, checked against the closed-form conditional optimum of the factor.
 *
 * <p>Model: the decay X' = -k X, X(0) = x0 of {@link DecaySbml#MODEL} (x0 fixed at 2), observable {@code scale * X}
 * with known σ = 0.05: X(t) = x0 e^{-k t} in closed form.
 */
class OutputFactorTest {
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    private static final double[] T = {0, 1, 2, 3, 4, 6};
    /** Synthetic relative data (made up): about 25 e^{-0.35 t}. */
    private static final double[] M = {50.3, 35.1, 24.9, 17.6, 12.2, 6.1};

    @TempDir
    Path dir;

    private LikelihoodObjective objective(String formula, String noise, String transform, String priorColumns,
                                          String scalePrior) {
        StringBuilder meas = new StringBuilder("observableId | simulationConditionId | measurement | time\n");
        for (int i = 0; i < T.length; i++) {
            meas.append("obs | c0 | ").append(M[i]).append(" | ").append(T[i]).append('\n');
        }
        String head = "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate" + priorColumns;
        String empty = priorColumns.isEmpty() ? "" : " | | ";
        Path yaml = PetabFiles.write(dir, DecaySbml.MODEL,
                head + "\n"
                        + "k | lin | 0.01 | 2 | 0.2 | 1" + empty + "\n"
                        + "x0 | lin | 0.1 | 10 | 2 | 0" + empty + "\n"
                        + "scale | log10 | 1e-6 | 1e6 | 1 | 1" + scalePrior + "\n"
                        + "sd | log10 | 1e-3 | 1e3 | 0.05 | 1" + empty,
                "conditionId\nc0",
                "observableId | observableFormula | noiseFormula | observableTransformation | noiseDistribution\n"
                        + "obs | " + formula + " | " + noise + " | " + transform + " | normal",
                meas.toString());
        return LikelihoodObjective.of(ProblemLoader.load(yaml), TIGHT);
    }

    private static int index(LikelihoodObjective obj, String id) {
        EstimationProblem p = obj.problem();
        for (int j = 0; j < p.parameterCount(); j++) {
            if (p.parameters().get(j).id().equals(id)) {
                return j;
            }
        }
        throw new AssertionError(id);
    }

    @Test
    void scaleTimesStateWithKnownNoiseIsAFactor() {
        LikelihoodObjective obj = objective("scale * X", "0.05", "lin", "", "");
        List<OutputFactor> f = obj.outputFactors();
        assertEquals(1, f.size());
        assertEquals(index(obj, "scale"), f.get(0).parameter());
        assertEquals(OutputFactor.Scale.LOG10, f.get(0).scale());
        assertArrayEquals(new int[] {0, 1, 2, 3, 4, 5}, f.get(0).residuals());
    }

    @Test
    void nestedProductsAndDivisionByAConstantStillCount() {
        assertEquals(1, objective("2 * (X * scale) / 3", "0.05", "lin", "", "").outputFactors().size());
    }

    /** Each of these breaks r = (s g - m) / σ with constant σ (or puts another term on s), so none is reported. */
    @Test
    void otherUsesAreNotFactors() {
        assertTrue(objective("scale * X + 0.1", "0.05", "lin", "", "").outputFactors().isEmpty(), "offset");
        assertTrue(objective("X / scale", "0.05", "lin", "", "").outputFactors().isEmpty(), "divisor");
        assertTrue(objective("scale * X", "sd", "lin", "", "").outputFactors().isEmpty(), "estimated noise");
        assertTrue(objective("scale * X", "0.05 * scale", "lin", "", "").outputFactors().isEmpty(), "noise reads s");
        assertTrue(objective("scale * X", "0.05", "log", "", "").outputFactors().isEmpty(), "log data");
        assertTrue(objective("scale * X", "0.05", "lin", " | objectivePriorType | objectivePriorParameters",
                " | normal | 0;1").outputFactors().isEmpty(), "normal prior");
    }

    /**
     * The fit from a start with the factor five decades off ends at a point where (1) the factor equals its
     * closed-form conditional optimum s*(k) = Σ g_i m_i / Σ g_i², g_i = x0 e^{-k t_i}, and (2) k is stationary for
     * the closed-form profiled sum of squares RSS(k) = Σ m² - (Σ g m)² / Σ g² (central difference of that formula,
     * step 1e-6, compared with its scale Σ m²). Tolerances: the integration at rtol 1e-10 puts the simulated X within
     * about 1e-9 relative of the closed form, so s* agrees to 1e-7; the stationarity test allows 1e-6 of Σ m².
     */
    @Test
    void fitEndsAtTheConditionalOptimumOfTheFactor() {
        LikelihoodObjective obj = objective("scale * X", "0.05", "lin", "", "");
        double[] start = obj.problem().nominalTheta();
        int ks = index(obj, "scale");
        int kk = index(obj, "k");
        start[ks] = -5;
        start[kk] = 1.2;
        FitProblem fp = Fits.problem(obj).withFixed(index(obj, "sd"), true);
        LocalFit fit = LevenbergMarquardt.defaults().minimize(fp, start);
        double k = fit.theta()[kk];
        double sStar = sumGm(k) / sumGg(k);
        assertEquals(Math.log10(sStar), fit.theta()[ks], 1e-7);
        double h = 1e-6;
        double slope = (profiled(k + h) - profiled(k - h)) / (2 * h);
        double scale = 0;
        for (double m : M) {
            scale += m * m;
        }
        assertEquals(0.0, slope / scale, 1e-6);
    }

    private static double sumGm(double k) {
        double s = 0;
        for (int i = 0; i < T.length; i++) {
            s += 2.0 * Math.exp(-k * T[i]) * M[i];
        }
        return s;
    }

    private static double sumGg(double k) {
        double s = 0;
        for (int i = 0; i < T.length; i++) {
            double g = 2.0 * Math.exp(-k * T[i]);
            s += g * g;
        }
        return s;
    }

    private static double profiled(double k) {
        double mm = 0;
        for (double m : M) {
            mm += m * m;
        }
        double gm = sumGm(k);
        return mm - gm * gm / sumGg(k);
    }
}
