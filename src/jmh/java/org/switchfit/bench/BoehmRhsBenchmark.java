package org.switchfit.bench;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.ModelCompiler;
import org.switchfit.sbml.SbmlReader;

/**
 * Compiled right-hand side of the Boehm_JProteomeRes2014 benchmark model against a hand-written Java version of the
 * same equations (states are species amounts, as in the compiled layout). The setup checks that both agree before
 * anything is timed. Needs the PEtab benchmark collection: {@code -Dswitchfit.benchmarks=../shared/benchmarks/problems}.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.NANOSECONDS)
@Warmup(iterations = 5, time = 1)
@Measurement(iterations = 5, time = 1)
@Fork(2)
public class BoehmRhsBenchmark {
    private CompiledModel model;
    private double[] y;
    private double[] p;
    private double[] dydt;
    private double t;

    @Setup
    public void setup() {
        Path dir = Path.of(System.getProperty("switchfit.benchmarks", "../shared/benchmarks/problems"),
                "Boehm_JProteomeRes2014");
        Path file = dir.resolve("model_Boehm_JProteomeRes2014.xml");
        if (!Files.exists(file)) {
            throw new IllegalStateException("benchmark model not found: " + file);
        }
        model = ModelCompiler.compile(SbmlReader.read(file));
        List<String> expected = List.of("STAT5A", "STAT5B", "pApB", "pApA", "pBpB", "nucpApA", "nucpApB", "nucpBpB");
        if (!model.form().stateIds().equals(expected)) {
            throw new IllegalStateException("unexpected state layout " + model.form().stateIds());
        }
        p = model.parameterValues();
        double[] y0 = new double[model.stateCount()];
        double[] pEff = new double[p.length];
        model.initialValues(0.0, p, y0, pEff);
        p = pEff;
        SplittableRandom rnd = new SplittableRandom(20261202L);
        y = new double[model.stateCount()];
        for (int i = 0; i < y.length; i++) {
            y[i] = 10.0 + 100.0 * rnd.nextDouble();
        }
        t = 3.7;
        dydt = new double[y.length];
        double[] a = new double[y.length];
        double[] b = new double[y.length];
        model.rhs(t, y, p, a);
        handWritten(t, y, p, b);
        for (int i = 0; i < a.length; i++) {
            if (Math.abs(a[i] - b[i]) > 1e-12 * Math.max(1.0, Math.abs(a[i]))) {
                throw new IllegalStateException("hand-written and compiled RHS differ at " + i + ": " + a[i] + " vs "
                        + b[i]);
            }
        }
    }

    /** The model's equations typed by hand; p layout as in the compiled model (compartments, species, parameters). */
    static void handWritten(double t, double[] y, double[] p, double[] dydt) {
        final double cyt = p[0];
        final double nuc = p[1];
        final double epoDeg = p[10];
        final double kExpHetero = p[11];
        final double kExpHomo = p[12];
        final double kImpHetero = p[13];
        final double kImpHomo = p[14];
        final double kPhos = p[15];
        final double a = y[0] / cyt;
        final double b = y[1] / cyt;
        final double pApB = y[2] / cyt;
        final double pApA = y[3] / cyt;
        final double pBpB = y[4] / cyt;
        final double nApA = y[5] / nuc;
        final double nApB = y[6] / nuc;
        final double nBpB = y[7] / nuc;
        final double epo = 1.25e-7 * Math.exp(-epoDeg * t);
        final double v1 = cyt * epo * a * a * kPhos;
        final double v2 = cyt * epo * a * b * kPhos;
        final double v3 = cyt * epo * b * b * kPhos;
        final double v4 = cyt * kImpHomo * pApA;
        final double v5 = cyt * kImpHetero * pApB;
        final double v6 = cyt * kImpHomo * pBpB;
        final double v7 = nuc * kExpHomo * nApA;
        final double v8 = nuc * kExpHetero * nApB;
        final double v9 = nuc * kExpHomo * nBpB;
        dydt[0] = -2 * v1 - v2 + 2 * v7 + v8;
        dydt[1] = -v2 - 2 * v3 + v8 + 2 * v9;
        dydt[2] = v2 - v5;
        dydt[3] = v1 - v4;
        dydt[4] = v3 - v6;
        dydt[5] = v4 - v7;
        dydt[6] = v5 - v8;
        dydt[7] = v6 - v9;
    }

    @Benchmark
    public double[] compiled() {
        model.rhs(t, y, p, dydt);
        return dydt;
    }

    @Benchmark
    public double[] handWritten() {
        handWritten(t, y, p, dydt);
        return dydt;
    }
}
