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
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.OdeSystem;
import org.switchfit.ode.SolverSettings;
import org.switchfit.ode.bdf.BdfIntegrator;
import org.switchfit.testsystems.StiffSystems;

/**
 * Whole integrations with the BDF session: Robertson to t = 40 (with and without the 3 parameter sensitivities)
 * HIRES to t = 321.8122 (rtol 1e-8), and the 500-state Brusselator (N = 250, sparse LU path) to t = 10 at
 * rtol 1e-6 (with and without the sensitivity to B). Returns the final state so the work cannot be eliminated.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MICROSECONDS)
@Warmup(iterations = 5, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(2)
public class BdfBenchmark {

    @Param({"robertson", "robertson-sens", "hires", "bruss500", "bruss500-sens"})
    public String problem;

    private BdfIntegrator bdf;
    private OdeSystem sys;
    private double[] y0;
    private double[] p;
    private double tEnd;
    private int[] sensParams;
    private double[] y;
    private double[] s;

    @Setup
    public void setUp() {
        bdf = new BdfIntegrator(SolverSettings.defaults().withTolerances(1e-8, 1e-14));
        switch (problem) {
            case "hires":
                sys = StiffSystems.HIRES;
                y0 = new double[] {1, 0, 0, 0, 0, 0, 0, 0.0057};
                p = new double[0];
                tEnd = 321.8122;
                break;
            case "bruss500":
            case "bruss500-sens":
                bdf = new BdfIntegrator(SolverSettings.defaults().withTolerances(1e-6, 1e-8));
                sys = StiffSystems.brusselator(250);
                y0 = StiffSystems.brusselatorStart(250);
                p = new double[] {1.0, 3.0, 1.0 / 50};
                tEnd = 10.0;
                sensParams = problem.endsWith("sens") ? new int[] {1} : null;
                break;
            default:
                sys = StiffSystems.ROBERTSON;
                y0 = new double[] {1, 0, 0};
                p = new double[] {0.04, 3e7, 1e4};
                tEnd = 40.0;
                sensParams = problem.endsWith("sens") ? new int[] {0, 1, 2} : null;
        }
        y = new double[y0.length];
        s = sensParams == null ? null : new double[sensParams.length * y0.length];
    }

    @Benchmark
    public double[] integrate() {
        IntegrationSession session = bdf.start(sys, 0.0, y0, p, null, sensParams, null);
        session.advance(tEnd, y, s);
        return y;
    }
}
