package org.switchfit.report;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;

/** The figures of {@link FitReport}, built from the fit-directory records. Stateless. */
final class FitReportFigures {
    private FitReportFigures() {
    }

    /** At most this many panels per figure, so pages stay readable for big models. */
    static final int MAX_PANELS = 24;
    /** At most this many states get a bifurcation-diagram panel. */
    static final int MAX_STATE_PANELS = 4;

    static Figure trajectories(TrajectoriesFile t) {
        Figure f = Figure.of("trajectories", "Data and fitted trajectories").columns(2).panelSize(460, 300);
        String band = t.bandLevel() == null ? "prediction band"
                : String.format(Locale.ROOT, "%.0f %% prediction band", 100 * t.bandLevel());
        int k = 0;
        for (TrajectoriesFile.Experiment e : t.experiments()) {
            for (TrajectoriesFile.Observable o : e.observables()) {
                if (k == MAX_PANELS) {
                    return f;
                }
                String c = Palette.color(k % Palette.size());
                Plot p = new Plot(o.id() + " (" + e.id() + ")", Axis.linear("time"), Axis.linear(o.id()))
                        .legend(Plot.Legend.BOTTOM_RIGHT);
                if (o.hasBand()) {
                    p.add(Series.band(band, o.time(), o.lower(), o.upper()).color(c));
                }
                p.add(Series.line("fit", o.time(), o.fitted()).color(c));
                double[] s = o.dataSigma();
                boolean anySigma = false;
                for (double v : s) {
                    anySigma |= Double.isFinite(v);
                }
                Series.Points d = Series.points("data", o.dataTime(), o.dataValue()).color(Palette.BLACK).size(6);
                p.add(anySigma ? d.ySigma(s) : d);
                f.add(p);
                k++;
            }
        }
        return f;
    }

    /** Profile panels of one kind, or empty when there is none of that kind. */
    static Optional<Figure> profiles(ProfilesFile prof, ProfilesFile.Kind kind, String id, String title) {
        Figure f = Figure.of(id, title).columns(3).panelSize(340, 280);
        int k = 0;
        for (ProfilesFile.Entry e : prof.profiles()) {
            if (e.kind() != kind || k == MAX_PANELS) {
                continue;
            }
            int n = e.points().size();
            double[] x = new double[n];
            double[] d = new double[n];
            for (int i = 0; i < n; i++) {
                x[i] = e.points().get(i).value();
                d[i] = 2 * (e.points().get(i).nll() - prof.bestNll());
            }
            double thr = 2 * (e.thresholdNll() - prof.bestNll());
            boolean log = e.logScale() && e.estimate() > 0;
            Plot p = Charts.profile(e.id() + " \u2014 " + FitReportTables.classText(e.classification()), x, d, thr,
                    e.estimate(), log);
            if (e.lower() != null) {
                p.add(Series.vertical("lower", e.lower()).dash(Series.Dash.DOTTED).color(Palette.GREY));
            }
            if (e.upper() != null) {
                p.add(Series.vertical("upper", e.upper()).dash(Series.Dash.DOTTED).color(Palette.GREY));
            }
            f.add(p);
            k++;
        }
        return k == 0 ? Optional.empty() : Optional.of(f);
    }

    static Figure bifurcation(BranchesFile b, ProfilesFile prof) {
        Map<String, ProfilesFile.Entry> foldProf = new HashMap<>();
        if (prof != null) {
            for (ProfilesFile.Entry e : prof.profiles()) {
                if (e.kind() == ProfilesFile.Kind.FOLD) {
                    foldProf.put(e.id(), e);
                }
            }
        }
        int panels = Math.max(1, Math.min(MAX_STATE_PANELS, b.stateIds().size()));
        Figure f = Figure.of("bifurcation", "Bifurcation diagram").columns(Math.min(2, panels))
                .panelSize(panels == 1 ? 640 : 460, panels == 1 ? 380 : 320);
        for (int s = 0; s < panels; s++) {
            String state = b.stateIds().isEmpty() ? "state" : b.stateIds().get(s);
            Plot p = new Plot("Steady states: " + state, Axis.linear(b.control()), Axis.linear(state));
            double yMin = Double.POSITIVE_INFINITY;
            for (int bi = 0; bi < b.branches().size(); bi++) {
                BranchesFile.Branch branch = b.branches().get(bi);
                int n = branch.points().size();
                double[] x = new double[n];
                double[] y = new double[n];
                boolean[] st = new boolean[n];
                for (int i = 0; i < n; i++) {
                    BranchesFile.Point pt = branch.points().get(i);
                    x[i] = pt.value();
                    double[] states = pt.states();
                    y[i] = s < states.length ? states[s] : Double.NaN;
                    st[i] = Boolean.TRUE.equals(pt.stable());
                    if (Double.isFinite(y[i])) {
                        yMin = Math.min(yMin, y[i]);
                    }
                }
                for (Series piece : Charts.branch(bi == 0 ? "branch" : null, x, y, st,
                        Palette.color(bi % 2 == 0 ? 0 : 5))) {
                    p.add(piece);
                }
            }
            addSpecials(p, b, state, foldProf);
            addThresholds(p, b, state, Double.isFinite(yMin) ? yMin : 0.0);
            f.add(p);
        }
        return f;
    }

    private static void addSpecials(Plot p, BranchesFile b, String state, Map<String, ProfilesFile.Entry> prof) {
        List<double[]> folds = new ArrayList<>();
        List<double[]> hopf = new ArrayList<>();
        for (BranchesFile.Special s : b.folds()) {
            Double v = s.states().get(state);
            double y = v == null ? Double.NaN : v;
            if (s.kind() == BranchesFile.Kind.HOPF) {
                hopf.add(new double[] {s.value(), y});
                continue;
            }
            ProfilesFile.Entry e = prof.get(s.id());
            double lo = e == null || e.lower() == null ? Double.NaN : e.lower();
            double hi = e == null || e.upper() == null ? Double.NaN : e.upper();
            folds.add(new double[] {s.value(), y, lo, hi});
        }
        if (!folds.isEmpty()) {
            p.add(Charts.folds("fold (interval)", col(folds, 0), col(folds, 1), col(folds, 2), col(folds, 3)));
        }
        if (!hopf.isEmpty()) {
            p.add(Series.points("Hopf", col(hopf, 0), col(hopf, 1)).marker(Series.Marker.TRIANGLE)
                    .color(Palette.PURPLE).size(9));
        }
    }

    /** Draws each threshold at the state of its matched fold, else at the lowest branch value. */
    private static void addThresholds(Plot p, BranchesFile b, String state, double fallbackY) {
        if (b.thresholds().isEmpty()) {
            return;
        }
        Map<String, Double> foldY = new HashMap<>();
        for (BranchesFile.Special s : b.folds()) {
            Double v = s.states().get(state);
            if (v != null) {
                foldY.put(s.id(), v);
            }
        }
        int n = b.thresholds().size();
        double[] v = new double[n];
        double[] y = new double[n];
        double[] sg = new double[n];
        for (int i = 0; i < n; i++) {
            BranchesFile.Threshold t = b.thresholds().get(i);
            v[i] = t.value();
            sg[i] = t.sigma();
            Double fy = t.fold() == null ? null : foldY.get(t.fold());
            y[i] = fy == null ? fallbackY : fy;
        }
        p.add(Charts.thresholds("measured threshold (1 sigma)", v, y, sg));
    }

    static Figure region(RegionFile g) {
        Plot p = new Plot("Region of bistability", Axis.linear(g.parameter1()), Axis.linear(g.parameter2()));
        if (g.bistable().p1().length > 0) {
            p.add(Series.area("bistable", g.bistable().p1(), g.bistable().p2()).color(Palette.ORANGE));
        }
        for (int i = 0; i < g.curves().size(); i++) {
            RegionFile.Curve c = g.curves().get(i);
            p.add(Series.line(i == 0 ? "fold curve" : null, c.p1(), c.p2()).color(Palette.BLUE));
        }
        if (!g.cusps().isEmpty()) {
            double[] x = new double[g.cusps().size()];
            double[] y = new double[x.length];
            for (int i = 0; i < x.length; i++) {
                x[i] = g.cusps().get(i).p1();
                y[i] = g.cusps().get(i).p2();
            }
            p.add(Series.points("cusp", x, y).marker(Series.Marker.DIAMOND).color(Palette.VERMILLION).size(9));
        }
        if (g.fitted() != null) {
            p.add(Series.points("fitted", new double[] {g.fitted().p1()}, new double[] {g.fitted().p2()})
                    .marker(Series.Marker.SQUARE).color(Palette.BLACK).size(8));
        }
        return Figure.of("region", "Two-parameter bistable region").add(p).panelSize(560, 380);
    }

    static Figure sweep(SweepFile s) {
        Plot p = new Plot("Hysteresis sweep", Axis.linear(s.parameter()), Axis.linear(s.readout()));
        for (SweepFile.Run run : s.runs()) {
            boolean up = run.direction() == SweepFile.Direction.UP;
            Series.Line l = Series.line(up ? "ramp up" : "ramp down", run.values(), run.response()).width(1.4)
                    .marker(up ? Series.Marker.TRIANGLE : Series.Marker.CIRCLE)
                    .color(up ? Palette.BLUE : Palette.VERMILLION);
            p.add(up ? l : l.dashed());
            for (SweepFile.Jump j : run.jumps()) {
                p.add(Series.vertical(String.format(Locale.ROOT, "jump %s %.3g", up ? "up" : "down", j.value()),
                        j.value()).color(up ? Palette.BLUE : Palette.VERMILLION).dash(Series.Dash.DOTTED));
            }
        }
        return Figure.of("hysteresis", "Hysteresis sweep").add(p).panelSize(560, 360);
    }

    static Figure phase(PhasePlaneFile pp) {
        double[] xr = pp.xRange();
        double[] yr = pp.yRange();
        Plot p = new Plot("Phase plane", Axis.linear(pp.xState()).withRange(xr[0], xr[1]),
                Axis.linear(pp.yState()).withRange(yr[0], yr[1]));
        p.add(Series.line("d" + pp.xState() + "/dt = 0", pp.xNullcline().x(), pp.xNullcline().y())
                .color(Palette.BLUE).width(2.2));
        p.add(Series.line("d" + pp.yState() + "/dt = 0", pp.yNullcline().x(), pp.yNullcline().y())
                .color(Palette.VERMILLION).width(2.2));
        for (int i = 0; i < pp.trajectories().size(); i++) {
            PhasePlaneFile.Curve c = pp.trajectories().get(i);
            p.add(Series.line(i == 0 ? "trajectories" : null, c.x(), c.y()).color(Palette.GREY).width(1)
                    .dash(Series.Dash.DOTTED));
        }
        List<double[]> st = new ArrayList<>();
        List<double[]> un = new ArrayList<>();
        for (PhasePlaneFile.SteadyPoint s : pp.steadyStates()) {
            (s.stable() ? st : un).add(new double[] {s.x(), s.y()});
        }
        if (!st.isEmpty()) {
            p.add(Series.points("stable", col(st, 0), col(st, 1)).color(Palette.BLACK).size(9));
        }
        if (!un.isEmpty()) {
            p.add(Series.points("unstable", col(un, 0), col(un, 1)).color(Palette.BLACK).size(9).hollow());
        }
        return Figure.of("phase", "Phase plane").add(p).panelSize(480, 440);
    }

    private static double[] col(List<double[]> rows, int c) {
        double[] a = new double[rows.size()];
        for (int i = 0; i < a.length; i++) {
            a[i] = rows.get(i)[c];
        }
        return a;
    }
}
