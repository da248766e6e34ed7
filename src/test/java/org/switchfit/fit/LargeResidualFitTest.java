package org.switchfit.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresBuilder;
import org.apache.commons.math3.fitting.leastsquares.LeastSquaresOptimizer;
import org.apache.commons.math3.fitting.leastsquares.LevenbergMarquardtOptimizer;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.util.Pair;
import org.junit.jupiter.api.Test;
import org.switchfit.objective.Objective;

/**
 * Levenberg-Marquardt with and without the secant model on a problem whose residuals stay large at the optimum: an
 * exponential decay with an estimated noise spread, posed as the objective package poses it (r_i = d_i / σ and
 * sqrt(2 ln σ + C) per point, θ = (A, k, log10 σ)).
 *
 * <p>Oracle: for fixed σ the NLL in (A, k) is the ordinary least-squares cost divided by σ², so (A, k) at the optimum
 * is the ordinary least-squares fit, computed here with Apache Commons Math 3.6.1
 * {@code LevenbergMarquardtOptimizer} (default settings, its relative tolerances 1e-10); σ then follows in closed
 * form (derived by hand from d NLL / dσ = 0): σ² = SSR / N.
 */
class LargeResidualFitTest {

    private static final long SEED = 7L;
    private static final int N = 12;
    /** C of sqrt(2 ln σ + C): real for σ above 1e-3, the lower bound below. */
    private static final double SHIFT = 1 - 2 * Math.log(1e-3);
    /**
     * Relative agreement with the oracle: both optimizers stop at relative tolerances near 1e-10 on a problem
     * with condition number of J about 1e2, so parameters agree to about 1e-8; 1e-6 leaves margin.
     */
    private static final double REL_TOL = 1e-6;

    private static double[] xs() {
        double[] x = new double[N];
        for (int i = 0; i < N; i++) {
            x[i] = 0.5 * i;
        }
        return x;
    }

    private static double[] ys() {
        // 5 exp(-0.4 x) plus seeded uniform noise of amplitude 0.3 (seed SEED).
        SplittableRandom rnd = new SplittableRandom(SEED);
        double[] x = xs();
        double[] y = new double[N];
        for (int i = 0; i < N; i++) {
            y[i] = 5 * Math.exp(-0.4 * x[i]) + 0.3 * rnd.nextDouble(-1, 1);
        }
        return y;
    }

    private static final class NoiseObjective implements Objective {
        final double[] x = xs();
        final double[] y = ys();

        @Override
        public int parameterCount() {
            return 3;
        }

        @Override
        public int residualCount() {
            return 2 * N;
        }

        @Override
        public double evaluate(double[] th, double[] r, double[] jac) {
            double sigma = Math.pow(10, th[2]);
            double ln10 = Math.log(10);
            double s = 0;
            for (int i = 0; i < N; i++) {
                double e = Math.exp(-th[1] * x[i]);
                double d = y[i] - th[0] * e;
                double ri = d / sigma;
                double li = Math.sqrt(2 * Math.log(sigma) + SHIFT);
                r[2 * i] = ri;
                r[2 * i + 1] = li;
                s += ri * ri + li * li;
                if (jac != null) {
                    jac[6 * i] = -e / sigma;
                    jac[6 * i + 1] = th[0] * x[i] * e / sigma;
                    jac[6 * i + 2] = -ri * ln10;
                    jac[6 * i + 3] = 0;
                    jac[6 * i + 4] = 0;
                    jac[6 * i + 5] = ln10 / li;
                }
            }
            return 0.5 * s;
        }
    }

    @Test
    void optimumMatchesOrdinaryLeastSquaresAndClosedFormSigma() {
        double[] x = xs();
        double[] y = ys();
        LeastSquaresBuilder b = new LeastSquaresBuilder().start(new double[] {1, 1}).target(y)
                .maxEvaluations(10000).maxIterations(10000)
                .model(p -> {
                    double[] v = new double[N];
                    double[][] j = new double[N][2];
                    for (int i = 0; i < N; i++) {
                        double e = Math.exp(-p.getEntry(1) * x[i]);
                        v[i] = p.getEntry(0) * e;
                        j[i][0] = e;
                        j[i][1] = -p.getEntry(0) * x[i] * e;
                    }
                    return new Pair<>(new ArrayRealVector(v), new Array2DRowRealMatrix(j));
                });
        LeastSquaresOptimizer.Optimum opt = new LevenbergMarquardtOptimizer().optimize(b.build());
        double a = opt.getPoint().getEntry(0);
        double k = opt.getPoint().getEntry(1);
        double ssr = opt.getCost() * opt.getCost();
        double log10Sigma = Math.log10(Math.sqrt(ssr / N));

        FitProblem p = FitProblem.of(new NoiseObjective(), new String[] {"A", "k", "log10_sigma"},
                new double[] {0, 0, -3}, new double[] {100, 10, 3});
        for (boolean secant : new boolean[] {true, false}) {
            LevenbergMarquardt lm = LevenbergMarquardt.defaults().withSecantModel(secant).withCostTolerance(1e-15)
                    .withGradientTolerance(1e-12);
            for (double[] start : new double[][] {{1, 1, 1}, {20, 0.05, -2.5}}) {
                LocalFit f = lm.minimize(p, start);
                String ctx = "secant " + secant + ", start " + java.util.Arrays.toString(start);
                assertTrue(f.termination().converged(), ctx + ": " + f.termination());
                assertEquals(a, f.theta()[0], REL_TOL * Math.abs(a), ctx);
                assertEquals(k, f.theta()[1], REL_TOL * Math.abs(k), ctx);
                assertEquals(log10Sigma, f.theta()[2], REL_TOL * Math.abs(log10Sigma), ctx);
            }
        }
    }
}
