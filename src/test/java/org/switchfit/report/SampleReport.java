package org.switchfit.report;

import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.Map;
import java.util.SplittableRandom;

/**
 * A sample report showing every figure kind the command line draws, with synthetic numbers (closed-form curves and
 * seeded noise; nothing here is a fit result). Used by {@link SampleReportTest} to write
 * {@code target/sample-report.html}, which {@code .ci/render-report.sh} renders in a headless browser.
 */
final class SampleReport {
    private SampleReport() {
    }

    static final long SEED = 20261202L;

    static HtmlReport build() {
        HtmlReport r = new HtmlReport("switchfit sample report <synthetic> & \"escaped\" 'text'");
        r.note(HtmlReport.NoteKind.INFO, "All numbers in this report are synthetic: closed-form curves with seeded "
                + "noise (seed " + SEED + "). It exists to check the look of every figure kind.");
        Map<String, Object> kv = new LinkedHashMap<>();
        kv.put("model", "toggle <two-gene> & friends");
        kv.put("free parameters", 4);
        kv.put("best NLL", -123.456789012);
        kv.put("starts converged", "47 / 50");
        kv.put("undefined", Double.NaN);
        r.keyValues(kv);

        r.section("Fit: data and trajectories");
        r.figure(trajectories(), "Measured data (markers, 1 sigma bars) and fitted trajectories with 95 % "
                + "prediction bands.");
        r.section("Multistart");
        r.figure(waterfall(), null);
        Table t = new Table("Best starts", "start", "final NLL", "k_on", "status");
        SplittableRandom rnd = new SplittableRandom(SEED);
        for (int i = 0; i < 8; i++) {
            t.row(i, -123.4 + 3 * rnd.nextDouble() * i, Math.exp(rnd.nextGaussian()), i == 5 ? "max iterations"
                    : "converged");
        }
        t.row(8, Double.NaN, Double.POSITIVE_INFINITY, "failed: <integration> & \"stiff\"");
        r.table(t.sortBy(1, true));
        r.section("Profile likelihoods");
        r.note(HtmlReport.NoteKind.WARNING, "Parameter k_deg is practically non-identifiable: its profile stays "
                + "below the 95 % threshold towards large values.");
        r.figure(profiles(), "Profile likelihoods with the 95 % pointwise threshold (dashed).");
        r.section("Bifurcation analysis");
        r.figure(bifurcation(), "Steady states against the inducer: stable (solid), unstable (dashed); folds "
                + "with 95 % intervals; measured thresholds with 1 sigma bars.");
        r.figure(bistableRegion(), "Two-parameter region of bistability.");
        r.figure(hysteresis(), "Simulated hysteresis sweep.");
        r.figure(phasePlane(), "Phase plane with nullclines and trajectories.");
        r.section("Command");
        r.preformatted("switchfit fit --problem problem.yaml --starts 50 --seed " + SEED);
        r.footer("switchfit sample report; synthetic data");
        return r;
    }

    static double[] grid(double a, double b, int n) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = a + (b - a) * i / (n - 1);
        }
        return x;
    }

    static Figure trajectories() {
        SplittableRandom rnd = new SplittableRandom(SEED);
        Figure f = Figure.of("trajectories", "Data and fitted trajectories").columns(2);
        String[] names = {"GFP", "RFP"};
        double[] amp = {8, 3};
        double[] rate = {0.6, 0.25};
        for (int o = 0; o < 2; o++) {
            double[] t = grid(0, 12, 121);
            double[] y = new double[t.length];
            double[] lo = new double[t.length];
            double[] hi = new double[t.length];
            for (int i = 0; i < t.length; i++) {
                y[i] = amp[o] * (1 - Math.exp(-rate[o] * t[i]));
                lo[i] = y[i] - 0.6 - 0.05 * y[i];
                hi[i] = y[i] + 0.6 + 0.05 * y[i];
            }
            double[] td = grid(0.5, 11.5, 12);
            double[] yd = new double[td.length];
            double[] sd = new double[td.length];
            for (int i = 0; i < td.length; i++) {
                sd[i] = 0.3 + 0.025 * amp[o];
                yd[i] = amp[o] * (1 - Math.exp(-rate[o] * td[i])) + sd[i] * rnd.nextGaussian();
            }
            yd[4] = Double.NaN; // a missing measurement
            Plot p = new Plot(names[o] + " (condition: high inducer)", Axis.linear("time [h]"),
                    Axis.linear(names[o] + " [a.u.]")).legend(Plot.Legend.BOTTOM_RIGHT);
            String c = Palette.color(o);
            p.add(Series.band("95 % prediction band", t, lo, hi).color(c));
            p.add(Series.line("fit", t, y).color(c));
            p.add(Series.points("data", td, yd).ySigma(sd).color(Palette.BLACK).size(6));
            f.add(p);
        }
        return f;
    }

    static Figure waterfall() {
        SplittableRandom rnd = new SplittableRandom(SEED + 1);
        int n = 50;
        double[] nll = new double[n];
        for (int i = 0; i < n; i++) {
            double u = rnd.nextDouble();
            nll[i] = u < 0.4 ? -123.456 + 1e-4 * rnd.nextDouble() : u < 0.7 ? -110.2 + 0.01 * rnd.nextDouble()
                    : -95 + 40 * rnd.nextDouble();
        }
        nll[7] = Double.NaN; // a failed start: not drawn
        Plot p = Charts.waterfall(nll, 1.92);
        return Figure.of("waterfall", "Multistart waterfall").add(p).panelSize(720, 340);
    }

    static Figure profiles() {
        Figure f = Figure.of("profiles", "Profile likelihoods").columns(3).panelSize(340, 280);
        double thr = 3.841458820694124; // chi2_1(0.95), common practice; value from memory, shown only
        String[] names = {"k_on", "K_d", "k_deg"};
        double[] best = {0.5, 20, 3e-3};
        for (int j = 0; j < 3; j++) {
            double[] lg = grid(Math.log10(best[j]) - 1.2, Math.log10(best[j]) + 1.2, 61);
            double[] x = new double[lg.length];
            double[] d = new double[lg.length];
            for (int i = 0; i < lg.length; i++) {
                x[i] = Math.pow(10, lg[i]);
                double z = (lg[i] - Math.log10(best[j])) / 0.35;
                d[i] = j < 2 ? z * z : (z < 0 ? z * z : 1.5 * (1 - Math.exp(-z)));
            }
            if (j == 1) {
                d[45] = Double.NaN; // a failed profile point breaks the line
            }
            Plot p = new Plot(names[j], Axis.log10(names[j]), Axis.linear("\u0394(\u22122 log L)")
                    .withRange(0, 6)).legend(Plot.Legend.NONE);
            p.add(Series.line("profile", x, d).marker(j == 1 ? Series.Marker.CIRCLE : Series.Marker.NONE));
            p.add(Series.horizontal("95 %", thr).color(Palette.VERMILLION));
            p.add(Series.vertical("estimate", best[j]).dash(Series.Dash.DOTTED));
            f.add(p);
        }
        return f;
    }

    /**
     * Cusp normal form: steady states of dx/dt = p + 3x - x^3, i.e. p(x) = x^3 - 3x, stable where
     * d(dx/dt)/dx = 3 - 3x^2 &lt; 0 (|x| &gt; 1); folds at x = -+1, p = +-2 (derived by hand).
     */
    static Figure bifurcation() {
        double[] xs = grid(-2.4, 2.4, 241);
        double[] ps = new double[xs.length];
        boolean[] stable = new boolean[xs.length];
        for (int i = 0; i < xs.length; i++) {
            ps[i] = xs[i] * xs[i] * xs[i] - 3 * xs[i];
            stable[i] = Math.abs(xs[i]) > 1;
        }
        Plot p = new Plot("Steady states", Axis.linear("inducer p"), Axis.linear("steady-state x"));
        for (Series s : Charts.branch("branch", ps, xs, stable, Palette.BLUE)) {
            p.add(s);
        }
        p.add(Charts.folds("fold (95 % interval)", new double[] {2, -2}, new double[] {-1, 1},
                new double[] {1.7, -2.4}, new double[] {2.25, -1.75}));
        p.add(Charts.thresholds("measured threshold (1 sigma)", new double[] {1.9, -2.1}, new double[] {-1.6, 1.6},
                new double[] {0.15, 0.2}));
        p.add(Series.note("fold LP1", 2.1, -0.8));
        return Figure.of("bifurcation", "Bifurcation diagram").add(p).panelSize(640, 380);
    }

    static Figure bistableRegion() {
        double[] a = grid(0, 3, 61);
        int n = a.length;
        double[] px = new double[2 * n];
        double[] py = new double[2 * n];
        for (int i = 0; i < n; i++) {
            double w = 2 * Math.pow(a[i] / 3, 1.5);
            px[i] = a[i];
            py[i] = w;
            px[2 * n - 1 - i] = a[i];
            py[2 * n - 1 - i] = -w;
        }
        Plot p = new Plot("Region of bistability", Axis.linear("cooperativity a"), Axis.linear("inducer p"));
        p.add(Series.area("bistable", px, py).color(Palette.ORANGE));
        p.add(Series.points("measured hysteresis", new double[] {2.2, 1.0}, new double[] {0.5, 1.5})
                .color(Palette.BLACK).marker(Series.Marker.TRIANGLE));
        p.add(Series.note("cusp", 0.05, -0.25));
        return Figure.of("region", "Two-parameter bistable region").add(p).panelSize(520, 360);
    }

    static Figure hysteresis() {
        double[] pu = grid(-3, 3, 61);
        double[] pd = grid(3, -3, 61);
        double[] xu = new double[pu.length];
        double[] xd = new double[pd.length];
        for (int i = 0; i < pu.length; i++) {
            xu[i] = pu[i] < 2 ? lowerBranch(pu[i]) : upperBranch(pu[i]);
            xd[i] = pd[i] > -2 ? upperBranch(pd[i]) : lowerBranch(pd[i]);
        }
        Plot p = Charts.hysteresis(pu, xu, pd, xd, "inducer p", "x at end of step");
        p.add(Series.vertical("jump up", 2));
        p.add(Series.vertical("jump down", -2));
        return Figure.of("hysteresis", "Hysteresis sweep").add(p).panelSize(520, 340);
    }

    /** Largest real root of x^3 - 3x - p = 0 (upper branch) by Newton from x = 3. */
    static double upperBranch(double p) {
        double x = 3;
        for (int k = 0; k < 60; k++) {
            x -= (x * x * x - 3 * x - p) / (3 * x * x - 3);
        }
        return x;
    }

    static double lowerBranch(double p) {
        return -upperBranch(-p);
    }

    static Figure phasePlane() {
        double alpha = 4;
        double[] g = grid(0, 4.5, 181);
        double[] uNull = new double[g.length]; // u-nullcline: u = alpha / (1 + v^3), parametrised by v
        double[] vNull = new double[g.length]; // v-nullcline: v = alpha / (1 + u^3), parametrised by u
        for (int i = 0; i < g.length; i++) {
            uNull[i] = alpha / (1 + g[i] * g[i] * g[i]);
            vNull[i] = alpha / (1 + g[i] * g[i] * g[i]);
        }
        Plot p = new Plot("Phase plane (toggle switch)", Axis.linear("repressor U"), Axis.linear("repressor V")
                .withRange(0, 4.5));
        p.add(Series.line("dU/dt = 0", uNull, g).color(Palette.BLUE).width(2.2));
        p.add(Series.line("dV/dt = 0", g, vNull).color(Palette.VERMILLION).width(2.2));
        double[][] starts = {{0.2, 0.5}, {0.5, 0.2}, {4.2, 4.0}, {3.8, 4.3}, {1.0, 3.5}, {3.5, 1.0}};
        for (int s = 0; s < starts.length; s++) {
            double[][] tr = euler(starts[s][0], starts[s][1], alpha);
            p.add(Series.line(s == 0 ? "trajectories" : null, tr[0], tr[1]).color(Palette.GREY).width(1)
                    .dash(Series.Dash.DOTTED));
        }
        double us = symmetricSteadyState(alpha);
        double[] hiLo = asymmetricSteadyState(alpha);
        p.add(Series.points("stable", new double[] {hiLo[0], hiLo[1]}, new double[] {hiLo[1], hiLo[0]})
                .color(Palette.BLACK).size(9));
        p.add(Series.points("saddle", new double[] {us}, new double[] {us}).color(Palette.BLACK).size(9).hollow());
        return Figure.of("phase", "Phase plane").add(p).panelSize(480, 440);
    }

    private static double[][] euler(double u, double v, double alpha) {
        int n = 400;
        double[] us = new double[n];
        double[] vs = new double[n];
        double dt = 0.02;
        for (int i = 0; i < n; i++) {
            us[i] = u;
            vs[i] = v;
            double du = alpha / (1 + v * v * v) - u;
            double dv = alpha / (1 + u * u * u) - v;
            u += dt * du;
            v += dt * dv;
        }
        return new double[][] {us, vs};
    }

    /** Root of u^4 + u - alpha = 0 (u = alpha / (1 + u^3)) by bisection on [0, alpha]. */
    static double symmetricSteadyState(double alpha) {
        double a = 0;
        double b = alpha;
        for (int k = 0; k < 200; k++) {
            double m = 0.5 * (a + b);
            if (m * m * m * m + m - alpha > 0) {
                b = m;
            } else {
                a = m;
            }
        }
        return 0.5 * (a + b);
    }

    /** The steady state with u > v: fixed point of u -> alpha / (1 + v(u)^3) started high. */
    static double[] asymmetricSteadyState(double alpha) {
        double u = alpha;
        double v = 0;
        for (int k = 0; k < 500; k++) {
            v = alpha / (1 + u * u * u);
            u = alpha / (1 + v * v * v);
        }
        return new double[] {u, v};
    }
}
