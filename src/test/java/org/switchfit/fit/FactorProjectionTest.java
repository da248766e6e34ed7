package org.switchfit.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.util.List;
import org.junit.jupiter.api.Test;
import org.switchfit.objective.Objective;
import org.switchfit.objective.OutputFactor;

/**
 * Levenberg-Marquardt with output factors at their closed-form conditional optimum
 * ({@link LevenbergMarquardt#withFactorProjection}), against the maximum-likelihood estimate computed independently.
 *
 * <p>Model: relative data m_i = s x0 e^{-k t_i} + e_i, e_i ~ N(0, σ²), σ known, θ = (k, log10 s). For fixed k the
 * optimal s is s*(k) = Σ g_i m_i / Σ g_i² with g_i = x0 e^{-k t_i} (linear least squares, derived by hand), and
 * the profiled residual sum of squares is RSS(k) = Σ m_i² - (Σ g_i m_i)² / Σ g_i²; its minimiser k̂ is found here
 * by golden-section search (Kiefer 1953; the textbook bracketing method), which shares no code with the optimizer.
 */
class FactorProjectionTest {
    private static final double[] T = {0, 0.5, 1, 2, 3, 5, 8};
    /** Synthetic data (made up for this test): roughly 40 e^{-0.3 t} with deviations of a few percent. */
    private static final double[] M = {41.2, 34.1, 29.9, 21.6, 16.6, 9.1, 3.7};
    private static final double X0 = 2.0;
    private static final double SIGMA = 0.8;

    /** r_i = (10^θ1 x0 e^{-θ0 t_i} - m_i) / σ with its exact Jacobian; θ1 declared an output factor on log10. */
    private static final class RelativeDecay implements Objective {
        @Override
        public int parameterCount() {
            return 2;
        }

        @Override
        public int residualCount() {
            return T.length;
        }

        @Override
        public double evaluate(double[] th, double[] r, double[] jac) {
            double s = Math.pow(10, th[1]);
            double c = 0;
            for (int i = 0; i < T.length; i++) {
                double g = X0 * Math.exp(-th[0] * T[i]);
                r[i] = (s * g - M[i]) / SIGMA;
                c += 0.5 * r[i] * r[i];
                if (jac != null) {
                    jac[2 * i] = -T[i] * s * g / SIGMA;
                    jac[2 * i + 1] = Math.log(10) * s * g / SIGMA;
                }
            }
            return c;
        }

        @Override
        public List<OutputFactor> outputFactors() {
            return List.of(new OutputFactor(1, OutputFactor.Scale.LOG10, new int[] {0, 1, 2, 3, 4, 5, 6}));
        }
    }

    private static double sumGm(double k) {
        double s = 0;
        for (int i = 0; i < T.length; i++) {
            s += X0 * Math.exp(-k * T[i]) * M[i];
        }
        return s;
    }

    private static double sumGg(double k) {
        double s = 0;
        for (int i = 0; i < T.length; i++) {
            double g = X0 * Math.exp(-k * T[i]);
            s += g * g;
        }
        return s;
    }

    /** RSS at fixed s (s > 0) or profiled over s (s NaN). */
    private static double rss(double k, double s) {
        double sc = Double.isNaN(s) ? sumGm(k) / sumGg(k) : s;
        double r = 0;
        for (int i = 0; i < T.length; i++) {
            double d = sc * X0 * Math.exp(-k * T[i]) - M[i];
            r += d * d;
        }
        return r;
    }

    /** Golden-section minimiser of RSS(k, s) over k in [a, b] to width 1e-12. */
    private static double argminK(double a, double b, double s) {
        double phi = (Math.sqrt(5) - 1) / 2;
        double c = b - phi * (b - a);
        double d = a + phi * (b - a);
        while (b - a > 1e-12) {
            if (rss(c, s) < rss(d, s)) {
                b = d;
            } else {
                a = c;
            }
            c = b - phi * (b - a);
            d = a + phi * (b - a);
        }
        return 0.5 * (a + b);
    }

    private static FitProblem problem(double sUpperLog10) {
        return FitProblem.of(new RelativeDecay(), new String[] {"k", "s"}, new double[] {0.01, -8},
                new double[] {3, sUpperLog10});
    }

    /**
     * From a start with the factor eight decades off (and k off by a factor of 5), the fit with projection reaches
     * k̂ and s*(k̂). Tolerance 1e-7 on k and on log10 s: the LM stops when the relative cost change falls below its
     * tolerance (1e-14 by default), which bounds the distance to the optimum of this well-conditioned two-parameter
     * problem far below that.
     */
    @Test
    void reachesTheProfiledOptimum() {
        double kHat = argminK(0.01, 3, Double.NaN);
        double sHat = sumGm(kHat) / sumGg(kHat);
        LocalFit fit = LevenbergMarquardt.defaults().minimize(problem(8), new double[] {1.5, -6});
        assertEquals(kHat, fit.theta()[0], 1e-7);
        assertEquals(Math.log10(sHat), fit.theta()[1], 1e-7);
        assertEquals(0.5 * rss(kHat, Double.NaN) / (SIGMA * SIGMA), fit.nll(), 1e-9);
    }

    /**
     * With the factor's upper bound below s*(k̂) the optimum holds s on that bound, and k minimises RSS(k, s_bound):
     * the clamped projection must not leave the box and must not stop k from reaching that constrained optimum.
     */
    @Test
    void clampedFactorGivesTheConstrainedOptimum() {
        double kHat = argminK(0.01, 3, Double.NaN);
        double sHat = sumGm(kHat) / sumGg(kHat);
        double bound = Math.log10(sHat) - 0.3;
        double kBound = argminK(0.01, 3, Math.pow(10, bound));
        LocalFit fit = LevenbergMarquardt.defaults().minimize(problem(bound), new double[] {1.5, -6});
        assertEquals(bound, fit.theta()[1], 0.0);
        assertEquals(kBound, fit.theta()[0], 1e-7);
    }

    /** Without projection the same start reaches the same optimum here (the projection changes the path only). */
    @Test
    void sameOptimumWithoutProjection() {
        double kHat = argminK(0.01, 3, Double.NaN);
        LocalFit fit = LevenbergMarquardt.defaults().withFactorProjection(false)
                .minimize(problem(8), new double[] {0.5, 1});
        assertEquals(kHat, fit.theta()[0], 1e-7);
    }
}
