package org.switchfit.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.Callable;
import org.switchfit.continuation.BistableRegion;
import org.switchfit.continuation.Branch;
import org.switchfit.continuation.ContinuationException;
import org.switchfit.continuation.ContinuationSettings;
import org.switchfit.continuation.FoldCurve;
import org.switchfit.continuation.FoldCurves;
import org.switchfit.report.Json;
import org.switchfit.report.RegionFile;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Spec;

/**
 * {@code switchfit region}: the fold curve of the model in two control quantities, traced from the first fold
 * found along the first quantity at the second quantity's start value, with its cusps and the bistable region
 * it bounds inside the box; written as {@link RegionFile} JSON.
 */
@Command(name = "region", mixinStandardHelpOptions = true,
        footer = {"", "Examples:", "  switchfit region models/stress_switch.xml --vary stimulus --from 0 --to 4 --and k_rec --from2 0.1 --to2 10"},
        description = "Trace the folds of an SBML model in two control quantities and report the cusps and the "
                + "bistable region.")
public final class RegionCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Mixin
    SwitchSetup setup;

    @Option(names = "--and", required = true, paramLabel = "ID", description = "second control quantity (same "
            + "forms as --vary)")
    String second;

    @Option(names = "--from2", required = true, paramLabel = "C", description = "lower end of the second range")
    double from2;

    @Option(names = "--to2", required = true, paramLabel = "D", description = "upper end of the second range")
    double to2;

    @Option(names = "--json", paramLabel = "FILE", description = "write the region as JSON")
    Path json;

    @Override
    public Integer call() {
        SwitchSetup.checkRange("--from2", "--to2", from2, to2);
        // the second quantity's start value goes in first, then the steady state is found
        SwitchSetup.Start s0 = setup.start();
        SwitchSetup.printCaveats(s0, false, spec.commandLine().getErr());
        ControlQuantity c2 = ControlQuantity.resolve(s0.sm, second, "--and", s0.sm.reduced.fullState(s0.x, s0.q),
                s0.q, s0.pEff);
        if (c2.index() == s0.control.index()) {
            throw new UserInputException(null, "--and " + second + " is the same quantity as --vary " + setup.vary
                    + "; name a different one");
        }
        double v2 = c2.toUser(s0.q[c2.index()]);
        if (!(v2 >= from2 && v2 <= to2)) {
            throw new UserInputException(null, String.format(Locale.ROOT, "--and %s: its value %s is outside "
                    + "[--from2, --to2] = [%s, %s]; widen the range or set it with --set", second,
                    SwitchSetup.fmt(v2), SwitchSetup.fmt(from2), SwitchSetup.fmt(to2)));
        }
        ContinuationSettings cs = SwitchSetup.settings(s0.control, setup.from, setup.to);
        Branch b = setup.branch(s0, cs);
        if (b.folds().isEmpty()) {
            throw new UserInputException(SourceLocation.ofFile(setup.modelFile.toString()), String.format(
                    Locale.ROOT, "no fold in %s over [%s, %s] at %s = %s, so no fold curve to trace; widen "
                            + "--from/--to or choose another --and value (run 'switchfit branches' to see the folds)",
                    setup.vary, SwitchSetup.fmt(setup.from), SwitchSetup.fmt(setup.to), second, SwitchSetup.fmt(v2)));
        }
        Traced t = trace(setup, s0, b, c2, from2, to2, cs);
        RegionFile file = t.file();
        FoldCurve curve = t.curve();
        BistableRegion region = t.region();
        ControlQuantity c1 = s0.control;
        PrintWriter out = spec.commandLine().getOut();
        for (RegionFile.Cusp c : file.cusps()) {
            out.printf(Locale.ROOT, "cusp at %s = %.12g, %s = %.12g%n", c1.label(), c.p1(), c2.label(), c.p2());
        }
        out.printf(Locale.ROOT, "%d fold-curve points (ends: %s, %s)%s, %d cusp(s), bistable area %.6g in "
                        + "(%s, %s)%s%n", curve.points().size(), curve.startEnd(), curve.finishEnd(),
                t.curveCount() > 1 ? String.format(Locale.ROOT, " and %d more separate fold curve(s)",
                        t.curveCount() - 1) : "", file.cusps().size(), t.note() != null ? Double.NaN
                        : Math.abs(region.area() * c1.scale() * c2.scale()), c1.label(), c2.label(),
                region.closedByChord() && t.note() == null ? " (polygon closed by a chord)" : "");
        if (t.note() != null) {
            out.println("note: " + t.note());
        }
        out.flush();
        Path jsonOut = setup.output(json, "region.json");
        if (jsonOut != null) {
            Json.write(jsonOut, file);
        }
        return 0;
    }

    /**
     * The first traced fold curve, how many separate curves were traced (one per fold of the branch not joined
     * to an earlier one through a cusp), the bistable region they bound, the file record (user units) and a note
     * when the region could not be built (else null).
     */
    record Traced(FoldCurve curve, int curveCount, BistableRegion region, RegionFile file, String note) {
    }

    /**
     * The fold curves in (control of {@code s0}, {@code c2}) started from the folds of {@code b} (a fold already on
     * a traced curve, joined through a cusp, starts none: without a cusp in the box the switch-on and switch-off
     * folds lie on separate curves), the bistable region they bound in the box, and the {@code region.json}
     * record: the command's computation, also used by the demo.
     *
     * @throws UserInputException when the fold-curve continuation fails
     */
    static Traced trace(SwitchSetup setup, SwitchSetup.Start s0, Branch b, ControlQuantity c2, double from2,
                        double to2, ContinuationSettings cs) {
        String second = c2.label();
        double q2a = c2.toQ(from2);
        double q2b = c2.toQ(to2);
        double lo2 = Math.min(q2a, q2b);
        double hi2 = Math.max(q2a, q2b);
        List<FoldCurve> curves = new ArrayList<>();
        double q2 = s0.q[c2.index()];
        double tol1 = 1e-3 * (cs.upperBound() - cs.lowerBound());
        for (org.switchfit.continuation.Fold f : b.folds()) {
            boolean known = false;
            for (FoldCurve c : curves) {
                known |= passesThrough(c, f.parameter(), q2, tol1);
            }
            if (known) {
                continue; // joined to an earlier fold through a cusp: the same curve
            }
            try {
                double[] q = s0.q.clone();
                curves.add(new FoldCurves(cs, lo2, hi2).trace(s0.sm.reduced, f, q, c2.index()));
            } catch (ContinuationException e) {
                throw new UserInputException(SourceLocation.ofFile(setup.modelFile.toString()), "fold-curve "
                        + "continuation in (" + setup.vary + ", " + second + ") failed: " + e.getMessage()
                        + "; try narrower ranges");
            }
        }
        FoldCurve curve = curves.get(0);
        BistableRegion region;
        String note = null;
        if (curves.size() == 1) {
            region = BistableRegion.of(curve, cs.lowerBound(), cs.upperBound(), lo2, hi2);
        } else {
            region = curves.size() == 2 ? BistableRegion.between(curves.get(0), curves.get(1), cs.lowerBound(),
                    cs.upperBound(), lo2, hi2) : null;
            if (region == null) {
                // the area between more than two curves, or curves ending inside the box, is not built: say so
                region = new BistableRegion(new double[0][], List.of(), true);
                note = String.format(Locale.ROOT, "%d separate fold curves were traced; the bistable region "
                        + "between them is not computed (area NaN); narrow or widen the ranges so each curve runs "
                        + "from edge to edge of the box", curves.size());
            }
        }
        ControlQuantity c1 = s0.control;
        double[] x1 = new double[curve.points().size()];
        double[] x2 = new double[x1.length];
        for (int i = 0; i < x1.length; i++) {
            x1[i] = c1.toUser(curve.points().get(i).p1());
            x2[i] = c2.toUser(curve.points().get(i).p2());
        }
        List<RegionFile.Cusp> cusps = new ArrayList<>();
        for (FoldCurve.Cusp c : curve.cusps()) {
            cusps.add(new RegionFile.Cusp(c1.toUser(c.p1()), c2.toUser(c.p2())));
        }
        double[][] poly = region.polygon();
        double[] y1 = new double[poly.length];
        double[] y2 = new double[poly.length];
        for (int i = 0; i < poly.length; i++) {
            y1[i] = c1.toUser(poly[i][0]);
            y2[i] = c2.toUser(poly[i][1]);
        }
        List<RegionFile.Curve> fileCurves = new ArrayList<>();
        fileCurves.add(new RegionFile.Curve(x1, x2));
        for (int k = 1; k < curves.size(); k++) {
            FoldCurve ck = curves.get(k);
            double[] z1 = new double[ck.points().size()];
            double[] z2 = new double[z1.length];
            for (int i = 0; i < z1.length; i++) {
                z1[i] = c1.toUser(ck.points().get(i).p1());
                z2[i] = c2.toUser(ck.points().get(i).p2());
            }
            fileCurves.add(new RegionFile.Curve(z1, z2));
            for (FoldCurve.Cusp c : ck.cusps()) {
                cusps.add(new RegionFile.Cusp(c1.toUser(c.p1()), c2.toUser(c.p2())));
            }
        }
        RegionFile file = new RegionFile(c1.label(), c2.label(), new double[] {setup.from, setup.to},
                new double[] {from2, to2}, fileCurves, cusps,
                new RegionFile.Curve(y1, y2), region.closedByChord(), null);
        return new Traced(curve, curves.size(), region, file, note);
    }

    /**
     * Whether the fold curve c crosses the line p2 = q2 at p1 within tol1 (linear interpolation between its
     * points): then a fold of the branch at (p1, q2) lies on c.
     */
    static boolean passesThrough(FoldCurve c, double p1, double q2, double tol1) {
        List<FoldCurve.Point> pts = c.points();
        for (int i = 0; i + 1 < pts.size(); i++) {
            FoldCurve.Point a = pts.get(i);
            FoldCurve.Point e = pts.get(i + 1);
            if ((a.p2() - q2) * (e.p2() - q2) <= 0) {
                double t = a.p2() == e.p2() ? 0 : (q2 - a.p2()) / (e.p2() - a.p2());
                if (Math.abs(a.p1() + t * (e.p1() - a.p1()) - p1) <= tol1) {
                    return true;
                }
            }
        }
        return false;
    }
}
