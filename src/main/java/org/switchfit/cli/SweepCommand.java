package org.switchfit.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.switchfit.continuation.Branch;
import org.switchfit.continuation.BranchPoint;
import org.switchfit.continuation.ContinuationException;
import org.switchfit.continuation.HysteresisSweep;
import org.switchfit.continuation.PseudoArclength;
import org.switchfit.continuation.SweepResult;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.Integrators;
import org.switchfit.ode.SolverSettings;
import org.switchfit.report.Json;
import org.switchfit.report.SweepFile;
import org.switchfit.util.AtomicFiles;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/**
 * {@code switchfit sweep}: a simulated slow ramp of the control quantity from A up to B and back down, the readout
 * along each ramp and where it jumped. The up ramp starts from the steady state at A; the down ramp from the
 * steady state at B on the branch continued from it (the state an up ramp slow enough ends in). Written as
 * {@link SweepFile} JSON and a CSV.
 */
@Command(name = "sweep", mixinStandardHelpOptions = true,
        footer = {"", "Examples:", "  switchfit sweep models/stress_switch.xml --vary stimulus --from 0 --to 4 --rate 0.005 --readout ZarnA"},
        description = "Simulate a slow ramp of a control quantity up and down and report where the response jumps.")
public final class SweepCommand implements Callable<Integer> {

    /**
     * Most samples per ramp. Each sample is kept in about ten double arrays along the way (sweep, user units, the
     * file record) and written as two numbers of ~20 characters to JSON and CSV: 1e6 samples are ~100 MB of
     * memory and ~80 MB of files for the two ramps, the most a default JVM heap and the HTML report handle; the
     * jump is located to 1e-6 of the range, finer than the integrator's tolerances make meaningful.
     */
    static final int MAX_SAMPLES = 1_000_000;

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Mixin
    SwitchSetup setup;

    @Option(names = "--rate", required = true, paramLabel = "R", description = "ramp speed, control units per "
            + "model time unit (> 0)")
    double rate;

    @Option(names = "--readout", paramLabel = "SPECIES", description = "state followed (default: the first state)")
    String readout;

    @Option(names = "--samples", defaultValue = "401", paramLabel = "N", description = "samples per ramp, 3 to "
            + "1000000 (default: ${DEFAULT-VALUE})")
    int samples;

    @Option(names = "--json", paramLabel = "FILE", description = "write the ramps as JSON")
    Path json;

    @Option(names = "--csv", paramLabel = "FILE", description = "write direction, value, response rows as CSV")
    Path csv;

    @Override
    public Integer call() {
        if (!(rate > 0) || !Double.isFinite(rate)) {
            throw new UserInputException(null, "--rate " + rate + ": need a positive ramp speed, e.g. 0.01");
        }
        if (samples < 3 || samples > MAX_SAMPLES) {
            throw new UserInputException(null, String.format(Locale.ROOT, "--samples %d: need between 3 and %d "
                    + "samples per ramp", samples, MAX_SAMPLES));
        }
        List<SweepResult> results = new ArrayList<>();
        SwitchSetup.Start start = setup.start();
        SwitchSetup.printCaveats(start, true, spec.commandLine().getErr());
        SweepFile file = sweep(setup, start, readout, rate, samples, results);
        String ro = file.readout();
        String label = file.parameter();
        List<SweepFile.Run> runs = file.runs();
        PrintWriter out = spec.commandLine().getOut();
        for (int d = 0; d < runs.size(); d++) {
            SweepFile.Run r = runs.get(d);
            out.printf(Locale.ROOT, "%s ramp at %s per time unit: %s%n", r.direction() == SweepFile.Direction.UP
                    ? "up" : "down", SwitchSetup.fmt(rate), describe(results.get(d), r, ro, label));
        }
        out.flush();
        Path jsonOut = setup.output(json, "sweep.json");
        if (jsonOut != null) {
            Json.write(jsonOut, file);
        }
        if (csv != null) {
            StringBuilder sb = new StringBuilder("direction,").append(org.switchfit.report.Csv.field(label))
                    .append(',').append(org.switchfit.report.Csv.field(ro)).append('\n');
            for (SweepFile.Run r : runs) {
                double[] v = r.values();
                double[] y = r.response();
                for (int i = 0; i < v.length; i++) {
                    sb.append(r.direction() == SweepFile.Direction.UP ? "up" : "down").append(',').append(v[i])
                            .append(',').append(y[i]).append('\n');
                }
            }
            AtomicFiles.writeString(csv, sb.toString());
        }
        return 0;
    }

    /** Reduced steady state at qb on the branch continued from (xa, qa); the plain steady state if that fails. */
    private static double[] endState(SwitchSetup setup, SwitchSetup.Start s, double[] xa, double qa, double qb) {
        double[] q = s.q.clone();
        q[s.control.index()] = qa;
        try {
            Branch b = new PseudoArclength(SwitchSetup.settings(s.control, setup.from, setup.to))
                    .trace(s.sm.reduced, xa, q, s.control.index(), qb > qa ? +1 : -1);
            BranchPoint last = b.point(b.size() - 1);
            if (last.parameter() == qb) {
                return last.state();
            }
        } catch (ContinuationException e) {
            // fall back to the steady state reached from xa
        }
        q[s.control.index()] = qb;
        return s.sm.steadyState(xa, q, s.pEff);
    }

    /**
     * The ramp in user units. The sweep's readout is on the reduced state; the constant part of a dependent
     * species (its total divided by its coefficient) is added back per sample, and the amount is reported as
     * {@code simulate} reports the species (concentration unless hasOnlySubstanceUnits).
     */
    private static SweepFile.Run run(SweepFile.Direction d, SweepResult r, SwitchSetup.Start s, int ri) {
        ControlQuantity c = s.control;
        double[] lam = r.parameter();
        double[] v = new double[lam.length];
        double[] y = r.readout();
        double[] zero = new double[s.sm.reduced.stateCount()];
        double[] q = s.q.clone();
        for (int i = 0; i < v.length; i++) {
            v[i] = c.toUser(lam[i]);
            q[c.index()] = lam[i];
            double[] full = s.sm.reduced.fullState(zero, q);
            y[i] += full[ri];
            // the readout as simulate reports it: the amount held in the state divided by the compartment size
            // of this sample (a concentration unless hasOnlySubstanceUnits)
            full[ri] = y[i];
            y[i] = s.sm.reportedAt(full, q, s.pEff)[ri];
        }
        List<SweepFile.Jump> jumps = r.jumpIndex() < 0 ? List.of() : List.of(new SweepFile.Jump(
                c.toUser(r.jumpParameter()), y[r.jumpIndex()], y[r.jumpIndex() + 1]));
        return new SweepFile.Run(d, v, y, jumps);
    }

    /**
     * The terminal line of a ramp: the jump with the sample interval it happened in, or that there is none, or
     * that the readout oscillates (then the largest change is no jump between branches).
     */
    static String describe(SweepResult res, SweepFile.Run r, String ro, String label) {
        double[] v = r.values();
        double[] y = r.response();
        switch (res.response()) {
            case JUMP: {
                int i = res.jumpIndex();
                return String.format(Locale.ROOT, "%s jumps from %.6g to %.6g between %s = %.8g and %.8g "
                        + "(largest change between consecutive samples)", ro, y[i], y[i + 1], label, v[i], v[i + 1]);
            }
            case OSCILLATION:
                return String.format(Locale.ROOT, "%s oscillates (its increments change sign again and again, "
                        + "between %.6g and %.6g), so no jump is reported; compare with the Hopf points of "
                        + "'switchfit branches'", ro, min(y), max(y));
            default:
                return String.format(Locale.ROOT, "no jump of %s (it stays within %.6g .. %.6g without a step "
                        + "larger than twice its mean step)", ro, min(y), max(y));
        }
    }

    /**
     * Ramps the control of {@code s} up from {@code setup.from} to {@code setup.to} and back down at {@code rate}
     * (control units per model time unit) and returns the {@code sweep.json} record with the readout state in
     * full (the conserved part of a species eliminated by the reduction added back): the command's computation,
     * also used by the demo.
     *
     * @param readout state followed (null: the first state)
     * @throws UserInputException for an unknown readout or a failed integration
     */
    static SweepFile sweep(SwitchSetup setup, SwitchSetup.Start s, String readout, double rate, int samples) {
        return sweep(setup, s, readout, rate, samples, new ArrayList<>());
    }

    /** As {@link #sweep(SwitchSetup, SwitchSetup.Start, String, double, int)}; the two ramps also go to results. */
    static SweepFile sweep(SwitchSetup setup, SwitchSetup.Start s, String readout, double rate, int samples,
                           List<SweepResult> results) {
        // start the analysis at A: the up ramp begins there
        double[] range = {setup.from, setup.to};
        SwitchModel sm = s.sm;
        String ro = readout == null ? sm.states.get(0) : readout.strip();
        int ri = sm.states.indexOf(ro);
        if (ri < 0) {
            throw new UserInputException(SourceLocation.ofFile(setup.modelFile.toString()), String.format(
                    Locale.ROOT, "--readout %s: the model has no state '%s'%s; states include: %s", ro, ro,
                    SwitchModel.didYouMean(ro, sm.states), SimulateCommand.abbreviate(sm.states)));
        }
        ControlQuantity c = s.control;
        int k = c.index();
        double[] full = new double[sm.states.size()];
        full[ri] = 1;
        double[] w = sm.reducedReadout(full, s.q);
        double qa = c.toQ(range[0]);
        double qb = c.toQ(range[1]);
        double qRate = rate / Math.abs(c.scale());
        HysteresisSweep hs = new HysteresisSweep(Integrators.create(SolverSettings.defaults()
                .withMethod(SolverSettings.Method.BDF).withTolerances(1e-8, 1e-10)), samples);
        SweepResult up;
        SweepResult down;
        try {
            double[] xa = s.x;
            if (s.startValue != range[0]) {
                double[] q = s.q.clone();
                q[k] = qa;
                xa = sm.steadyState(s.x, q, s.pEff);
            }
            up = hs.run(sm.reduced, xa, s.q, k, qa, qb, qRate, w);
            double[] xb = endState(setup, s, xa, qa, qb);
            down = hs.run(sm.reduced, xb, s.q, k, qb, qa, qRate, w);
        } catch (ContinuationException | IntegrationException e) {
            throw new UserInputException(SourceLocation.ofFile(setup.modelFile.toString()), "sweep of "
                    + setup.vary + " failed: " + e.getMessage() + "; try a smaller --rate, a narrower range or "
                    + "other --set values");
        }
        results.add(up);
        results.add(down);
        List<SweepFile.Run> runs = List.of(run(SweepFile.Direction.UP, up, s, ri),
                run(SweepFile.Direction.DOWN, down, s, ri));
        SweepFile file = new SweepFile(c.label(), ro, rate, runs);
        return file;
    }

    private static double min(double[] y) {
        double lo = Double.POSITIVE_INFINITY;
        for (double x : y) {
            lo = Math.min(lo, x);
        }
        return lo;
    }

    private static double max(double[] y) {
        double hi = Double.NEGATIVE_INFINITY;
        for (double x : y) {
            hi = Math.max(hi, x);
        }
        return hi;
    }
}
