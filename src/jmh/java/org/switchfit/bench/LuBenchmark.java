package org.switchfit.bench;

import java.util.Random;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;
import org.switchfit.linalg.DenseLu;
import org.switchfit.linalg.LuSolver;
import org.switchfit.linalg.SparseLu;

/**
 * Factor I - c J and solve one right-hand side, dense vs sparse LU, for a seeded sparse J of two structures
 * (see {@link #structure}). Sizes 30 and 300.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MICROSECONDS)
@Warmup(iterations = 5, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(2)
public class LuBenchmark {

    @Param({"30", "300"})
    public int n;

    @Param({"dense", "sparse"})
    public String kind;

    /** "random": ~4 random off-diagonal entries per row (worst case for fill); "banded": tridiagonal plus one
     * random long-range entry per row, closer to a reaction cascade with feedback. */
    @Param({"random", "banded"})
    public String structure;

    private LuSolver lu;
    private double[] jac;
    private double[] b;
    private double[] x;

    @Setup
    public void setUp() {
        Random rnd = new Random(12345L);
        int[][] pattern = new int[n][];
        jac = new double[n * n];
        for (int i = 0; i < n; i++) {
            java.util.TreeSet<Integer> cols = new java.util.TreeSet<>();
            cols.add(i);
            if (structure.equals("random")) {
                for (int k = 0; k < 4; k++) {
                    cols.add(rnd.nextInt(n));
                }
            } else {
                cols.add(Math.max(0, i - 1));
                cols.add(Math.min(n - 1, i + 1));
                cols.add(rnd.nextInt(n));
            }
            pattern[i] = cols.stream().mapToInt(Integer::intValue).toArray();
            for (int j : pattern[i]) {
                jac[i * n + j] = rnd.nextGaussian();
            }
        }
        lu = kind.equals("dense") ? new DenseLu(n) : new SparseLu(n, pattern);
        b = new double[n];
        for (int i = 0; i < n; i++) {
            b[i] = rnd.nextGaussian();
        }
        x = new double[n];
    }

    @Benchmark
    public double[] factorAndSolve() {
        if (!lu.factorIdentityMinus(0.1, jac)) {
            throw new IllegalStateException("singular");
        }
        System.arraycopy(b, 0, x, 0, n);
        lu.solve(x);
        return x;
    }

    @Benchmark
    public double[] solveOnly() {
        if (lu.isSingular()) {
            lu.factorIdentityMinus(0.1, jac);
        }
        System.arraycopy(b, 0, x, 0, n);
        lu.solve(x);
        return x;
    }
}
