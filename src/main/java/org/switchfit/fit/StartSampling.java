package org.switchfit.fit;

import java.util.SplittableRandom;
import org.hipparchus.random.SobolSequenceGenerator;
import org.switchfit.util.UserInputException;

/**
 * How multistart chooses start points inside the (finite) bounds on the estimation scale.
 */
public enum StartSampling {
    /**
     * Latin hypercube (McKay, Beckman and Conover 1979, Technometrics 21(2):239-245, doi:10.2307/1268522): each
     * axis is cut into n equal strata, every stratum is used once; strata permutations come from stream
     * (seed, -1 - axis), the position inside the stratum of start i from stream (seed, i).
     */
    LATIN_HYPERCUBE,
    /**
     * Sobol sequence (Joe and Kuo 2008 direction numbers, via Hipparchus), skipping the all-zero first point, with
     * a Cranley-Patterson random shift modulo 1 drawn from stream (seed, -1) so different seeds give different
     * designs.
     */
    SOBOL,
    /**
     * Independent uniform draws: coordinate k of start i is uniform on [lower_k, upper_k] from stream (seed, i), so
     * a start does not depend on how many starts are drawn.
     */
    UNIFORM;

    /**
     * Returns {@code count} start points (rows) for the free parameters of the problem; fixed parameters keep
     * {@code base}'s values.
     *
     * @throws UserInputException when a free parameter has an infinite bound
     */
    double[][] sample(FitProblem problem, double[] base, int count, long seed) {
        int n = problem.parameterCount();
        for (int k = 0; k < n; k++) {
            if (!problem.isFixed(k)
                    && !(Double.isFinite(problem.lower(k)) && Double.isFinite(problem.upper(k)))) {
                throw UserInputException.of(null, "parameter '%s': multistart needs finite bounds, got [%.6g, %.6g];"
                        + " give finite bounds on the estimation scale", problem.id(k), problem.lower(k),
                        problem.upper(k));
            }
        }
        double[][] unit = this == SOBOL ? sobol(n, count, seed)
                : this == UNIFORM ? uniform(n, count, seed) : latin(n, count, seed);
        double[][] pts = new double[count][n];
        for (int i = 0; i < count; i++) {
            for (int k = 0; k < n; k++) {
                double lo = problem.lower(k);
                double hi = problem.upper(k);
                pts[i][k] = problem.isFixed(k) ? base[k] : lo + unit[i][k] * (hi - lo);
            }
        }
        return pts;
    }

    private static double[][] latin(int n, int count, long seed) {
        double[][] u = new double[count][n];
        for (int k = 0; k < n; k++) {
            SplittableRandom axis = RandomStreams.stream(seed, -1L - k);
            int[] perm = new int[count];
            for (int i = 0; i < count; i++) {
                perm[i] = i;
            }
            for (int i = count - 1; i > 0; i--) {
                int j = axis.nextInt(i + 1);
                int t = perm[i];
                perm[i] = perm[j];
                perm[j] = t;
            }
            for (int i = 0; i < count; i++) {
                u[i][k] = perm[i];
            }
        }
        for (int i = 0; i < count; i++) {
            SplittableRandom own = RandomStreams.stream(seed, i);
            for (int k = 0; k < n; k++) {
                u[i][k] = (u[i][k] + own.nextDouble()) / count;
            }
        }
        return u;
    }

    private static double[][] uniform(int n, int count, long seed) {
        double[][] u = new double[count][n];
        for (int i = 0; i < count; i++) {
            SplittableRandom own = RandomStreams.stream(seed, i);
            for (int k = 0; k < n; k++) {
                u[i][k] = own.nextDouble();
            }
        }
        return u;
    }

    private static double[][] sobol(int n, int count, long seed) {
        SobolSequenceGenerator gen = new SobolSequenceGenerator(n);
        gen.skipTo(1);
        SplittableRandom shiftStream = RandomStreams.stream(seed, -1L);
        double[] shift = new double[n];
        for (int k = 0; k < n; k++) {
            shift[k] = shiftStream.nextDouble();
        }
        double[][] u = new double[count][];
        for (int i = 0; i < count; i++) {
            double[] v = gen.nextVector();
            for (int k = 0; k < n; k++) {
                double s = v[k] + shift[k];
                v[k] = s >= 1 ? s - 1 : s;
            }
            u[i] = v;
        }
        return u;
    }
}
