package org.switchfit.bench;

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
import org.switchfit.continuation.Branch;
import org.switchfit.continuation.ContinuationSettings;
import org.switchfit.continuation.PseudoArclength;
import org.switchfit.ode.OdeSystem;

/**
 * One-parameter continuation with fold refinement on a chain of n states (x_0' = -x_0^3 + x_0 + p drives
 * x_i' = x_{i-1} - x_i - 0.1 x_i^3), 25 points from p = -0.8 upwards, no eigenvalues. {@code sparse} declares the
 * bidiagonal Jacobian pattern, so the linear solves go through the sparse LU; otherwise dense. Returns the branch.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MILLISECONDS)
@Warmup(iterations = 3, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(2)
public class ContinuationBenchmark {

    @Param({"3", "30", "300"})
    public int n;

    @Param({"false", "true"})
    public boolean sparse;

    private OdeSystem sys;
    private double[] y0;
    private PseudoArclength pal;

    @Setup
    public void setUp() {
        sys = chain(n, sparse);
        y0 = new double[n];
        java.util.Arrays.fill(y0, -1.0);
        pal = new PseudoArclength(ContinuationSettings.of(-1, 1).withMaxPoints(25).withEigenvalueLimit(0)
                .withSteps(0.5, 1e-6, 4.0));
    }

    @Benchmark
    public Branch trace() {
        return pal.trace(sys, y0, new double[] {-0.8}, 0, +1);
    }

    static OdeSystem chain(int n, boolean withPattern) {
        return new OdeSystem() {
            @Override
            public int stateCount() {
                return n;
            }

            @Override
            public int parameterCount() {
                return 1;
            }

            @Override
            public void rhs(double t, double[] y, double[] p, double[] d) {
                d[0] = -y[0] * y[0] * y[0] + y[0] + p[0];
                for (int i = 1; i < n; i++) {
                    d[i] = y[i - 1] - y[i] - 0.1 * y[i] * y[i] * y[i];
                }
            }

            @Override
            public void jacobianY(double t, double[] y, double[] p, double[] j) {
                java.util.Arrays.fill(j, 0, n * n, 0);
                j[0] = -3 * y[0] * y[0] + 1;
                for (int i = 1; i < n; i++) {
                    j[i * n + i] = -1 - 0.3 * y[i] * y[i];
                    j[i * n + i - 1] = 1;
                }
            }

            @Override
            public void jacobianP(double t, double[] y, double[] p, double[] j) {
                java.util.Arrays.fill(j, 0, n, 0);
                j[0] = 1;
            }

            @Override
            public int[][] jacobianPattern() {
                if (!withPattern) {
                    return OdeSystem.super.jacobianPattern();
                }
                int[][] pat = new int[n][];
                pat[0] = new int[] {0};
                for (int i = 1; i < n; i++) {
                    pat[i] = new int[] {i - 1, i};
                }
                return pat;
            }
        };
    }
}
