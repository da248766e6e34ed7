package org.switchfit.profile;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import java.util.concurrent.Callable;
import org.switchfit.fit.CurveObjective;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LocalTaskExecutor;
import org.switchfit.fit.Multistart;
import org.switchfit.fit.RandomStreams;

/**
 * Coverage benchmark (not a unit test): simulates N data sets of y = A exp(-k t) + N(0, σ²) from known (A, k),
 * fits each by multistart LM, profiles both parameters and reports the fraction of 95 % pointwise profile
 * intervals that contain the true value, with its binomial standard error. For a well-behaved model the
 * fraction should be near 0.95 (asymptotic likelihood-ratio theory, Wilks 1938).
 *
 * <p>Run: {@code mvn -B -o test-compile exec:java} is not configured; use
 * {@code java -cp target/classes:target/test-classes:$(cat cp.txt) org.switchfit.profile.CoverageBenchmark
 * [N] [threads] [seed]} with cp.txt from {@code mvn dependency:build-classpath -Dmdep.outputFile=cp.txt}.
 */
public final class CoverageBenchmark {

    private static final double A_TRUE = 2.0;
    private static final double K_TRUE = 0.8;
    private static final double SIGMA = 0.1;

    private CoverageBenchmark() {
    }

    public static void main(String[] args) {
        int n = args.length > 0 ? Integer.parseInt(args[0]) : 200;
        int threads = args.length > 1 ? Integer.parseInt(args[1]) : 2;
        long seed = args.length > 2 ? Long.parseLong(args[2]) : 12345L;
        List<Callable<boolean[]>> tasks = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            final int idx = i;
            tasks.add(() -> one(seed, idx));
        }
        long t0 = System.nanoTime();
        List<boolean[]> res = LocalTaskExecutor.ofThreads(threads).runAll(tasks, null);
        int[] hits = new int[2];
        for (boolean[] r : res) {
            for (int k = 0; k < 2; k++) {
                hits[k] += r[k] ? 1 : 0;
            }
        }
        String[] names = {"A", "k"};
        System.out.printf(Locale.ROOT, "coverage of 95%% pointwise profile intervals, %d data sets, seed %d%n", n,
                seed);
        for (int k = 0; k < 2; k++) {
            double f = hits[k] / (double) n;
            double se = Math.sqrt(0.95 * 0.05 / n);
            System.out.printf(Locale.ROOT, "  %s: %.4f  (expected 0.95 +- %.4f, 1 binomial SE)%n", names[k], f, se);
        }
        System.out.printf(Locale.ROOT, "  wall time %.1f s on %d threads%n", (System.nanoTime() - t0) / 1e9,
                threads);
    }

    private static boolean[] one(long seed, int index) {
        SplittableRandom rnd = RandomStreams.stream(seed, index);
        int m = 15;
        double[] t = new double[m];
        double[] y = new double[m];
        for (int i = 0; i < m; i++) {
            t[i] = 0.3 * i;
            y[i] = A_TRUE * Math.exp(-K_TRUE * t[i]) + SIGMA * LinearGaussianProfileTest.gaussian(rnd);
        }
        CurveObjective obj = new CurveObjective(t, y, SIGMA, 2, (x, b, g) -> {
            double e = Math.exp(-b[1] * x);
            g[0] = e;
            g[1] = -b[0] * x * e;
            return b[0] * e;
        });
        FitProblem p = FitProblem.of(obj, new String[] {"A", "k"}, new double[] {0.1, 0.01},
                new double[] {10, 5});
        double[] best = Multistart.defaults().withStarts(5).withSeed(seed + index)
                .run(p, null, LocalTaskExecutor.sequential()).bestTheta();
        ProfileLikelihood pl = ProfileLikelihood.defaults();
        double[] truth = {A_TRUE, K_TRUE};
        boolean[] cover = new boolean[2];
        for (int k = 0; k < 2; k++) {
            ConfidenceInterval ci = pl.profileParameter(p, best, k).pointwise();
            cover[k] = ci.lower() <= truth[k] && truth[k] <= ci.upper();
        }
        return cover;
    }
}
