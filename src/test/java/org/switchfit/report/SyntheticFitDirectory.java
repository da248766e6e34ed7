package org.switchfit.report;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;

/**
 * Synthetic content for every file of a fit directory, from closed-form curves and seeded noise (nothing here is
 * a fit result). Used by {@link FitReportTest}.
 */
final class SyntheticFitDirectory {
    private SyntheticFitDirectory() {
    }

    static final long SEED = 20261202L;
    /** 95 % pointwise threshold in NLL units, chi2_1(0.95) / 2; common practice, value shown only. */
    static final double HALF_CHI2 = 1.920729410347062;

    static FitSummary result() {
        Map<String, Double> lin = new LinkedHashMap<>();
        Map<String, Double> est = new LinkedHashMap<>();
        Map<String, String> scales = new LinkedHashMap<>();
        Map<String, FitSummary.Bounds> bounds = new LinkedHashMap<>();
        String[] ids = {"k_on", "K_d", "k_deg"};
        double[] v = {0.5, 20, 1e-3};
        for (int j = 0; j < ids.length; j++) {
            lin.put(ids[j], v[j]);
            est.put(ids[j], Math.log10(v[j]));
            scales.put(ids[j], "log10");
            bounds.put(ids[j], new FitSummary.Bounds(1e-3, 1e3));
        }
        SplittableRandom rnd = new SplittableRandom(SEED);
        List<FitSummary.Start> starts = new ArrayList<>();
        for (int i = 0; i < 20; i++) {
            double u = rnd.nextDouble();
            double nll = u < 0.4 ? -50.0 + 1e-3 * rnd.nextDouble() : -40 + 10 * rnd.nextDouble();
            starts.add(i == 7 ? new FitSummary.Start(i, Double.NaN, "FAILED", null, 3, 9, "integration <failed> & "
                    + "stopped") : new FitSummary.Start(i, nll, "CONVERGED", "SMALL_STEP", 10 + i, 20 + i, null));
        }
        double best = starts.stream().filter(s -> !s.failed()).mapToDouble(FitSummary.Start::nll).min()
                .orElseThrow();
        int near = (int) starts.stream().filter(s -> !s.failed() && s.nll() - best <= 0.1).count();
        Map<String, String> versions = new LinkedHashMap<>();
        versions.put("switchfit", "switchfit 0.1.0-SNAPSHOT");
        versions.put("java", "17");
        return new FitSummary("problem.yaml", best, lin, est, scales, bounds, near, 0.1, 1, starts,
                new FitSummary.Settings(20, SEED, 1e-8, 1e-12, false), 12.5, versions,
                List.of(new FitSummary.InputFile("problem.yaml", "ab".repeat(32)),
                        new FitSummary.InputFile("model.xml", "cd".repeat(32))));
    }

    static TrajectoriesFile trajectories() {
        SplittableRandom rnd = new SplittableRandom(SEED + 1);
        List<TrajectoriesFile.Experiment> ex = new ArrayList<>();
        for (int e = 0; e < 2; e++) {
            double amp = 5 + 3 * e;
            double[] t = grid(0, 10, 101);
            double[] y = new double[t.length];
            double[] lo = new double[t.length];
            double[] hi = new double[t.length];
            for (int i = 0; i < t.length; i++) {
                y[i] = amp * (1 - Math.exp(-0.5 * t[i]));
                lo[i] = y[i] - 0.4;
                hi[i] = y[i] + 0.4;
            }
            double[] td = grid(1, 10, 10);
            double[] yd = new double[td.length];
            double[] sd = new double[td.length];
            for (int i = 0; i < td.length; i++) {
                sd[i] = 0.3;
                yd[i] = amp * (1 - Math.exp(-0.5 * td[i])) + sd[i] * rnd.nextGaussian();
            }
            ex.add(new TrajectoriesFile.Experiment("cond" + e, List.of(new TrajectoriesFile.Observable("gfp", t, y,
                    e == 0 ? lo : null, e == 0 ? hi : null, td, yd, sd))));
        }
        return new TrajectoriesFile(0.95, ex);
    }

    /** Quadratic profile nll = best + 0.5 ((x - est) / se)^2, cut at an open side. */
    static ProfilesFile.Entry quadratic(String id, ProfilesFile.Kind kind, double est, double se, double best,
                                        boolean openUpper, ProfilesFile.Identifiability cls) {
        List<ProfilesFile.Point> pts = new ArrayList<>();
        for (double z = -3; z <= 3.0001; z += 0.25) {
            double x = est + z * se;
            double nll = z > 0 && openUpper ? best + 0.1 * (1 - Math.exp(-z)) : best + 0.5 * z * z;
            pts.add(new ProfilesFile.Point(x, nll));
        }
        double half = Math.sqrt(2 * HALF_CHI2) * se;
        return new ProfilesFile.Entry(id, kind, "lin", est, est - half, openUpper ? null : est + half,
                best + HALF_CHI2, cls, List.of("K_d"), pts);
    }

    static ProfilesFile profiles() {
        double best = result().bestNll();
        return new ProfilesFile(0.95, best, List.of(
                quadratic("k_on", ProfilesFile.Kind.PARAMETER, 0.5, 0.05, best, false,
                        ProfilesFile.Identifiability.IDENTIFIABLE),
                quadratic("K_d", ProfilesFile.Kind.PARAMETER, 20, 2, best, false,
                        ProfilesFile.Identifiability.IDENTIFIABLE),
                quadratic("k_deg", ProfilesFile.Kind.PARAMETER, 1e-3, 1e-4, best, true,
                        ProfilesFile.Identifiability.PRACTICALLY_NONIDENTIFIABLE),
                quadratic("fold1", ProfilesFile.Kind.FOLD, 2, 0.1, best, false,
                        ProfilesFile.Identifiability.IDENTIFIABLE),
                quadratic("fold2", ProfilesFile.Kind.FOLD, -2, 0.2, best, true,
                        ProfilesFile.Identifiability.PRACTICALLY_NONIDENTIFIABLE),
                quadratic("gfp(cond1, t=10)", ProfilesFile.Kind.PREDICTION, 8, 0.3, best, false,
                        ProfilesFile.Identifiability.IDENTIFIABLE)));
    }

    /** Cusp normal form dx/dt = p + 3x - x^3: p(x) = x^3 - 3x, stable for |x| > 1, folds at (p, x) = (+-2, -+1). */
    static BranchesFile branches() {
        double[] xs = grid(-2.4, 2.4, 97);
        List<BranchesFile.Point> pts = new ArrayList<>();
        for (double x : xs) {
            double lambda = 3 - 3 * x * x;
            pts.add(new BranchesFile.Point(x * x * x - 3 * x, new double[] {x, x * x}, lambda < 0,
                    new double[] {lambda}, new double[] {0}));
        }
        return new BranchesFile("p", new double[] {-5, 5}, List.of("x", "z"),
                List.of(new BranchesFile.Special("fold1", "p", 2, Map.of("x", -1.0, "z", 1.0), BranchesFile.Kind.FOLD),
                        new BranchesFile.Special("fold2", "p", -2, Map.of("x", 1.0, "z", 1.0),
                                BranchesFile.Kind.FOLD)),
                List.of(new BranchesFile.Branch("main", pts)),
                List.of(new BranchesFile.Threshold("up", 1.9, 0.15, "up", "fold1"),
                        new BranchesFile.Threshold("down", -2.1, 0.2, "down", null)));
    }

    /** Cusp p + a x - x^3: folds at p = +-2 (a/3)^(3/2) for a > 0, cusp at the origin. */
    static RegionFile region() {
        double[] a = grid(0, 3, 31);
        int n = a.length;
        double[] px = new double[2 * n];
        double[] py = new double[2 * n];
        double[] up = new double[n];
        double[] dn = new double[n];
        for (int i = 0; i < n; i++) {
            double w = 2 * Math.pow(a[i] / 3, 1.5);
            up[i] = w;
            dn[i] = -w;
            px[i] = a[i];
            py[i] = w;
            px[2 * n - 1 - i] = a[i];
            py[2 * n - 1 - i] = -w;
        }
        return new RegionFile("a", "p", new double[] {0, 3}, new double[] {-3, 3},
                List.of(new RegionFile.Curve(a, up), new RegionFile.Curve(a, dn)), List.of(new RegionFile.Cusp(0, 0)),
                new RegionFile.Curve(px, py), false, new RegionFile.Cusp(2.5, 0.3));
    }

    static SweepFile sweep() {
        double[] pu = grid(-3, 3, 25);
        double[] pd = grid(3, -3, 25);
        double[] xu = new double[pu.length];
        double[] xd = new double[pd.length];
        for (int i = 0; i < pu.length; i++) {
            xu[i] = pu[i] < 2 ? -upper(-pu[i]) : upper(pu[i]);
            xd[i] = pd[i] > -2 ? upper(pd[i]) : -upper(-pd[i]);
        }
        return new SweepFile("p", "x", 0.01, List.of(
                new SweepFile.Run(SweepFile.Direction.UP, pu, xu, List.of(new SweepFile.Jump(2, -1, 2))),
                new SweepFile.Run(SweepFile.Direction.DOWN, pd, xd, List.of(new SweepFile.Jump(-2, 1, -2)))));
    }

    /** Largest real root of x^3 - 3x - p = 0 by Newton from x = 3. */
    static double upper(double p) {
        double x = 3;
        for (int k = 0; k < 60; k++) {
            x -= (x * x * x - 3 * x - p) / (3 * x * x - 3);
        }
        return x;
    }

    /** Toggle switch u' = 4/(1+v^3) - u, v' = 4/(1+u^3) - v: nullclines u = 4/(1+v^3) and v = 4/(1+u^3). */
    static PhasePlaneFile phasePlane() {
        double[] g = grid(0, 4.5, 91);
        double[] un = new double[g.length];
        for (int i = 0; i < g.length; i++) {
            un[i] = 4 / (1 + g[i] * g[i] * g[i]);
        }
        double[] tx = grid(0.2, 3.9, 20);
        double[] ty = grid(0.5, 0.1, 20);
        return new PhasePlaneFile("u", "v", new double[] {0, 4.5}, new double[] {0, 4.5},
                new PhasePlaneFile.Curve(un, g), new PhasePlaneFile.Curve(g, un),
                List.of(new PhasePlaneFile.SteadyPoint(3.9, 0.06, true), new PhasePlaneFile.SteadyPoint(0.06, 3.9,
                        true), new PhasePlaneFile.SteadyPoint(1.38, 1.38, false)),
                List.of(new PhasePlaneFile.Curve(tx, ty)), Map.of());
    }

    static void writeAll(FitDirectory d) {
        d.write(FitFile.RESULT, result());
        d.write(FitFile.TRAJECTORIES, trajectories());
        d.write(FitFile.PROFILES, profiles());
        d.write(FitFile.BRANCHES, branches());
        d.write(FitFile.REGION, region());
        d.write(FitFile.SWEEP, sweep());
        d.write(FitFile.PHASE_PLANE, phasePlane());
    }

    static FitDirectory create(Path dir) {
        FitDirectory d = FitDirectory.of(dir);
        writeAll(d);
        return d;
    }

    static double[] grid(double a, double b, int n) {
        double[] x = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = a + (b - a) * i / (n - 1);
        }
        return x;
    }
}
