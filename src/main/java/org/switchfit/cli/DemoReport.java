package org.switchfit.cli;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.switchfit.continuation.BranchPoint;
import org.switchfit.continuation.Fold;
import org.switchfit.data.DoseResponsePoint;
import org.switchfit.data.EstimatedParameter;
import org.switchfit.data.Experiment;
import org.switchfit.data.SwitchingThreshold;
import org.switchfit.data.TimecoursePoint;
import org.switchfit.ode.Trajectory;
import org.switchfit.report.Axis;
import org.switchfit.report.Charts;
import org.switchfit.report.Figure;
import org.switchfit.report.HtmlReport;
import org.switchfit.report.Palette;
import org.switchfit.report.Plot;
import org.switchfit.report.ProfilesFile;
import org.switchfit.report.SweepFile;
import org.switchfit.report.Series;
import org.switchfit.report.Table;

/** The HTML report of {@code switchfit demo}: stage table, data with the model, branches, region, sweep. */
final class DemoReport {
    private DemoReport() {
    }

    static void write(Path file, DemoModel dm, DemoRun.Results r, List<DemoRun.Stage> stages,
                      DemoRun.Settings s) {
        HtmlReport h = new HtmlReport("switchfit demo: Zarn/Quel stress switch (SYNTHETIC data)");
        h.note(HtmlReport.NoteKind.WARNING, "All data in this report are SYNTHETIC, simulated from the invented "
                + "model models/stress_switch.xml with seeded noise (datasets/stress_switch-truth.md).");
        h.section("Stages");
        Table t = new Table("Stages of this run", "stage", "status", "seconds", "result");
        for (DemoRun.Stage st : stages) {
            t.row(st.name(), st.status().name().toLowerCase(Locale.ROOT).replace('_', ' '),
                    String.format(Locale.ROOT, "%.1f", st.seconds()), st.message());
        }
        h.table(t);
        h.paragraph("Branches, region and sweep below are computed at the " + r.at.label() + ".");

        h.section("Parameters");
        if (r.dataUsed != null) {
            h.paragraph("Data used by the fit: " + r.dataUsed + ".");
        }
        Table pt = new Table("Estimated parameters (log10 scale) against the truth", "parameter", "lower", "upper",
                "start", "true value", "best fit", "profile interval", "class", "truth inside");
        double[] truth = dm.nominal();
        for (EstimatedParameter e : r.problem.parameters()) {
            int k = dm.compiled.parameterIndex(e.id());
            double tv = k >= 0 ? truth[k] : e.id().equals("sigma_act") ? DemoScenario.SIGMA_ACT : Double.NaN;
            Double best = r.fit == null ? null : r.fit.parameters().get(e.id());
            ProfilesFile.Entry pe = profile(r, e.id());
            String interval = pe == null ? "" : "[" + (pe.lower() == null ? "-inf" : Table.formatNumber(pe.lower()))
                    + ", " + (pe.upper() == null ? "+inf" : Table.formatNumber(pe.upper())) + "]";
            String inside = pe == null ? "" : (pe.lower() == null || pe.lower() <= tv)
                    && (pe.upper() == null || tv <= pe.upper()) ? "yes" : "no";
            pt.row(e.id(), e.lower(), e.upper(), e.start(), tv, best == null ? "" : best, interval,
                    pe == null ? "" : String.valueOf(pe.classification()), inside);
        }
        h.table(pt);
        h.paragraph("The full fit report (multistart, profiles, branches, region, sweep) is report.html in the same "
                + "folder.");

        h.section("Timecourses");
        Figure tf = Figure.of("timecourses", "Stimulus steps: data and model").columns(2);
        for (Experiment e : r.problem.experiments()) {
            if (e.settleIn() != null) {
                tf.add(timecourse(dm, r, e));
            }
        }
        h.figure(tf, "act_frac = ZarnA / (ZarnI + ZarnA) and quel_level = QuelA after a stimulus step at t = 0; "
                + "lines: model at the " + shortLabel(r) + ".");

        h.section("Steady states and switching");
        Figure sf = Figure.of("steady", "Steady states").columns(1);
        sf.add(steadyStates(dm, r));
        h.figure(sf, "Branch of steady states (solid stable, dashed unstable), dose-response data from the low and "
                + "high state, measured switching thresholds (squares, with 1 sigma).");
        if (r.region != null) {
            Figure rf = Figure.of("region", "Bistable region").columns(1);
            rf.add(region(dm, r));
            h.figure(rf, "Region of (stimulus, " + DemoRun.REGION_PARAMETER + ") with two stable steady states.");
        }
        if (r.sweep != null && r.sweep.runs().size() == 2) {
            Figure hf = Figure.of("hysteresis", "Hysteresis sweep").columns(1);
            SweepFile.Run up = r.sweep.runs().get(0);
            SweepFile.Run down = r.sweep.runs().get(1);
            hf.add(Charts.hysteresis(up.values(), up.response(), down.values(), down.response(), "stimulus",
                    r.sweep.readout()));
            h.figure(hf, String.format(Locale.ROOT, "Stimulus ramped at %.3g per min up from the low state and down "
                    + "from the high state.", DemoRun.SWEEP_RATE));
        }
        h.footer("switchfit demo; starts " + s.starts() + ", seed " + s.seed() + ", threads " + s.threads()
                + (s.quick() ? ", quick" : ""));
        h.write(file);
    }

    private static ProfilesFile.Entry profile(DemoRun.Results r, String id) {
        if (r.profiles == null) {
            return null;
        }
        for (ProfilesFile.Entry e : r.profiles.profiles()) {
            if (e.kind() == ProfilesFile.Kind.PARAMETER && e.id().equals(id)) {
                return e;
            }
        }
        return null;
    }

    private static String shortLabel(DemoRun.Results r) {
        int cut = r.at.label().indexOf(" (");
        return cut < 0 ? r.at.label() : r.at.label().substring(0, cut);
    }

    private static Plot timecourse(DemoModel dm, DemoRun.Results r, Experiment e) {
        int stim = dm.index(DemoScenario.CONTROL);
        Experiment from = r.problem.experiment(e.settleIn()).orElseThrow();
        double[] pFrom = r.at.p().clone();
        pFrom[stim] = from.parameterValues().get(DemoScenario.CONTROL).number();
        double[] y0 = dm.settle(pFrom, DemoScenario.lowState(dm, pFrom));
        double[] p = r.at.p().clone();
        p[stim] = e.parameterValues().get(DemoScenario.CONTROL).number();
        double[] times = new double[121];
        for (int i = 0; i < times.length; i++) {
            times[i] = 0.5 * i;
        }
        Trajectory tr = dm.simulate(p, y0, times);
        double[] act = new double[times.length];
        double[] quel = new double[times.length];
        for (int i = 0; i < times.length; i++) {
            act[i] = tr.value(i, dm.states.indexOf("ZarnA"))
                    / (tr.value(i, dm.states.indexOf("ZarnA")) + tr.value(i, dm.states.indexOf("ZarnI")));
            quel[i] = tr.value(i, dm.states.indexOf("QuelA"));
        }
        Plot pl = new Plot(e.id() + " (stimulus " + Table.formatNumber(p[stim]) + ")", Axis.linear("time (min)"),
                Axis.linear("level"));
        pl.add(Series.line("act_frac model", times, act).color(Palette.BLUE));
        pl.add(points(r, e.id(), "act_frac").color(Palette.BLUE));
        if (r.problem.timecourses().stream().anyMatch(tp -> tp.experiment().equals(e.id())
                && tp.observable().equals("quel_level"))) {
            pl.add(Series.line("quel_level model", times, quel).color(Palette.VERMILLION).dashed());
            pl.add(points(r, e.id(), "quel_level").color(Palette.VERMILLION).marker(Series.Marker.SQUARE));
        }
        return pl;
    }

    private static Series.Points points(DemoRun.Results r, String exp, String obs) {
        List<double[]> l = new ArrayList<>();
        for (TimecoursePoint tp : r.problem.timecourses()) {
            if (tp.experiment().equals(exp) && tp.observable().equals(obs)) {
                l.add(new double[] {tp.time(), tp.value()});
            }
        }
        double[] x = new double[l.size()];
        double[] y = new double[l.size()];
        for (int i = 0; i < x.length; i++) {
            x[i] = l.get(i)[0];
            y[i] = l.get(i)[1];
        }
        return Series.points(obs + " data", x, y).size(6);
    }

    private static Plot steadyStates(DemoModel dm, DemoRun.Results r) {
        Plot pl = new Plot("Steady-state act_frac", Axis.linear("stimulus"), Axis.linear("act_frac"));
        if (r.branch != null) {
            int n = r.branch.size();
            double[] p = new double[n];
            double[] x = new double[n];
            boolean[] st = new boolean[n];
            for (int i = 0; i < n; i++) {
                BranchPoint bp = r.branch.point(i);
                p[i] = bp.parameter();
                x[i] = DemoScenario.actFrac(dm, dm.reduced.fullState(bp.state(), r.branchQ));
                st[i] = bp.stable();
            }
            for (Series sr : Charts.branch("model", p, x, st, Palette.BLUE)) {
                pl.add(sr);
            }
        }
        for (DoseResponsePoint.History hist : DoseResponsePoint.History.values()) {
            List<DoseResponsePoint> l = r.problem.doseResponses().stream().filter(d -> d.history() == hist).toList();
            double[] x = l.stream().mapToDouble(DoseResponsePoint::dose).toArray();
            double[] y = l.stream().mapToDouble(DoseResponsePoint::value).toArray();
            boolean low = hist == DoseResponsePoint.History.LOW;
            pl.add(Series.points(low ? "from low state" : "from high state", x, y).size(6)
                    .marker(low ? Series.Marker.TRIANGLE : Series.Marker.CIRCLE).hollow()
                    .color(Palette.BLACK));
        }
        Map<SwitchingThreshold.Direction, Double> level = new LinkedHashMap<>();
        if (r.branch != null) {
            for (Fold f : r.branch.folds()) {
                double a = DemoScenario.actFrac(dm, dm.reduced.fullState(f.state(), r.branchQ));
                level.put(f.kind() == Fold.Kind.MAXIMUM ? SwitchingThreshold.Direction.UP
                        : SwitchingThreshold.Direction.DOWN, a);
            }
        }
        List<SwitchingThreshold> th = r.problem.thresholds();
        double[] tp = new double[th.size()];
        double[] ty = new double[th.size()];
        double[] ts = new double[th.size()];
        for (int i = 0; i < th.size(); i++) {
            tp[i] = th.get(i).value();
            ty[i] = level.getOrDefault(th.get(i).direction(),
                    th.get(i).direction() == SwitchingThreshold.Direction.UP ? 0.1 : 0.5);
            ts[i] = th.get(i).sigma();
        }
        pl.add(Charts.thresholds("measured thresholds", tp, ty, ts));
        return pl;
    }

    private static Plot region(DemoModel dm, DemoRun.Results r) {
        double[][] poly = r.region.polygon();
        double[] x = new double[poly.length];
        double[] y = new double[poly.length];
        for (int i = 0; i < poly.length; i++) {
            x[i] = poly[i][0];
            y[i] = poly[i][1];
        }
        Plot pl = new Plot("Bistable region", Axis.linear("stimulus"), Axis.log10(DemoRun.REGION_PARAMETER));
        pl.add(Series.area("bistable", x, y).color(Palette.BLUE).opacity(0.3));
        double[] cx = r.region.cusps().stream().mapToDouble(c -> c.p1()).toArray();
        double[] cy = r.region.cusps().stream().mapToDouble(c -> c.p2()).toArray();
        if (cx.length > 0) {
            pl.add(Series.points("cusp", cx, cy).marker(Series.Marker.DIAMOND).color(Palette.VERMILLION).size(9));
        }
        pl.add(Series.horizontal(DemoRun.REGION_PARAMETER + " used", r.at.p()[dm.index(DemoRun.REGION_PARAMETER)])
                .dash(Series.Dash.DOTTED));
        return pl;
    }
}
