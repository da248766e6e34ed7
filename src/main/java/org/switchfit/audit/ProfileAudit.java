package org.switchfit.audit;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.ParameterScale;
import org.switchfit.objective.ObjectiveException;
import org.switchfit.objective.Prediction;
import org.switchfit.profile.ProfileLikelihood;
import org.switchfit.report.ProfilesFile;

/**
 * Re-derives the interval ends of {@code profiles.json} (profile likelihood, Raue et al. 2009, doi:10.1093/
 * bioinformatics/btp358): at each closed end z the profiled quantity is held at z, the other parameters are
 * re-optimised (a parameter is fixed; a fold position or prediction is held by {@link ConstrainedRefit}), and the
 * likelihood ratio 2 (NLL(z) − NLL*) must equal the threshold χ²₁(level) within {@link #CROSSING_TOLERANCE}. At an
 * open end the profile must stay below the threshold at the bound (when the side ended there) or at the outermost
 * traced point. Warm starts: the optimum with the quantity moved to z, and the stored profile point nearest z when
 * {@code profiles/} holds it (the lower NLL of the two counts, since the profile is a minimum).
 */
final class ProfileAudit {

    /**
     * Tolerance on 2 ΔNLL at an interval end, in χ² units. The profile command refines each end to |2ΔNLL − q| ≤
     * 1e-9, and a re-optimisation from another warm start differs by the LM stopping error plus the integration
     * error of the NLL (rtol 1e-8 on ~100 residuals of order 1: ~1e-6); 1e-3 is far above both, and for a
     * quadratic profile it moves the end by 1e-3 / (2 √q) ≈ 2.6e-4 standard errors at q = 3.84, below the printed
     * digits, so a pass means the printed end is right.
     */
    static final double CROSSING_TOLERANCE = 1e-3;

    private final AuditInput in;
    private final FitProblem fp;
    private final double nllStar;
    private final LevenbergMarquardt lm = LevenbergMarquardt.defaults();

    ProfileAudit(AuditInput in, double nllStar) {
        this.in = in;
        this.fp = in.fitProblem();
        this.nllStar = nllStar;
    }

    /** One task per interval end of every profile, in file order (lower, then upper). */
    List<Callable<Claim>> tasks() {
        List<Callable<Claim>> out = new ArrayList<>();
        ProfilesFile pf = in.profiles();
        if (pf == null) {
            return out;
        }
        double q = ProfileLikelihood.defaults().withLevel(pf.level()).threshold(1);
        for (ProfilesFile.Entry e : pf.profiles()) {
            out.add(() -> check(e, q, false));
            out.add(() -> check(e, q, true));
        }
        return out;
    }

    private Claim check(ProfilesFile.Entry e, double q, boolean upper) {
        String id = "profile " + (e.kind() == ProfilesFile.Kind.PARAMETER ? "" : e.kind().token() + " ") + e.id()
                + (upper ? " upper" : " lower");
        Double end = upper ? e.upper() : e.lower();
        double ref = Double.isFinite(e.optimumNll()) && e.optimumNll() < nllStar ? e.optimumNll() : nllStar;
        String side = upper ? e.upperSide() : e.lowerSide();
        try {
            if (end != null) {
                Solved s = solve(e, end, q);
                double d = 2 * (s.nll - ref);
                boolean ok = Math.abs(d - q) <= CROSSING_TOLERANCE;
                return new Claim(id, ok, String.format(Locale.ROOT, "end %.8g: 2(NLL - NLL*) = %.6f re-optimised "
                        + "there%s, threshold %.6f (|difference| %.2g %s %.0e)", end, d, s.note, q, Math.abs(d - q),
                        ok ? "<=" : ">", CROSSING_TOLERANCE), values(end, d, q));
            }
            Double z = openEnd(e, upper, side);
            if (z == null) {
                return new Claim(id, false, "open (" + side + "), but profiles.json holds no point on that side to "
                        + "check", Map.of());
            }
            Solved s = solve(e, z, q);
            double d = 2 * (s.nll - ref);
            boolean ok = d <= q + CROSSING_TOLERANCE;
            boolean atBound = e.kind() == ProfilesFile.Kind.PARAMETER && !z.equals(outermost(e, upper));
            return new Claim(id, ok, String.format(Locale.ROOT, "open (%s): at %s %.8g, 2(NLL - NLL*) = %.6f%s, %s "
                            + "threshold %.6f", side == null ? "side not recorded" : side, atBound ? "the bound"
                            : "the last profile point", z,
                    d, s.note, ok ? "below the" : "ABOVE the", q), values(z, d, q));
        } catch (ObjectiveException | IllegalArgumentException ex) {
            return new Claim(id, false, "could not be re-derived: " + ex.getMessage(), Map.of());
        }
    }

    private static Map<String, Double> values(double z, double d, double q) {
        Map<String, Double> v = new LinkedHashMap<>();
        v.put("value", z);
        v.put("deltaChi2", d);
        v.put("threshold", q);
        v.put("tolerance", CROSSING_TOLERANCE);
        return v;
    }

    /**
     * Where an open side is checked: the parameter's bound when the side ended there (or when the file does not say
     * how it ended and holds no point on that side, as when the estimate sits on the bound), else the outermost
     * profile point on that side.
     */
    private Double openEnd(ProfilesFile.Entry e, boolean upper, String side) {
        Double z = outermost(e, upper);
        int k = e.kind() == ProfilesFile.Kind.PARAMETER ? fp.indexOf(e.id()) : -1;
        if (k >= 0 && ("OPEN_AT_BOUND".equals(side) || side == null && z == null)) {
            return fp.scale(k).toLinear(upper ? fp.upper(k) : fp.lower(k));
        }
        return z;
    }

    private static Double outermost(ProfilesFile.Entry e, boolean upper) {
        Double z = null;
        for (ProfilesFile.Point p : e.points()) {
            boolean beyond = upper ? p.value() > e.estimate() : p.value() < e.estimate();
            if (beyond && Double.isFinite(p.nll()) && (z == null || (upper ? p.value() > z : p.value() < z))) {
                z = p.value();
            }
        }
        return z;
    }

    private record Solved(double nll, String note) {
    }

    /** Minimum NLL with the quantity held at {@code z} (linear scale). */
    private Solved solve(ProfilesFile.Entry e, double z, double q) {
        double[] stored = storedNear(e, z);
        if (e.kind() == ProfilesFile.Kind.PARAMETER) {
            int k = fp.indexOf(e.id());
            if (k < 0) {
                throw new IllegalArgumentException("'" + e.id() + "' is not an estimated parameter of the problem");
            }
            double zt = toEstimation(fp.scale(k), z);
            FitProblem fixed = fp.withFixed(k, true);
            double[] a = in.optimum();
            a[k] = zt;
            double best = lm.minimize(fixed, a).nll();
            if (stored != null) {
                stored[k] = zt;
                best = Math.min(best, lm.minimize(fixed, stored).nll());
            }
            return new Solved(best, "");
        }
        Prediction g = (e.kind() == ProfilesFile.Kind.FOLD ? in.folds() : in.predictions()).get(e.id());
        if (g == null) {
            throw new IllegalArgumentException("the problem has no " + e.kind().token() + " '" + e.id() + "' to "
                    + "recompute");
        }
        double scale = Math.abs(z - e.estimate()) / Math.sqrt(q);
        if (!(scale > 0)) {
            scale = 1e-6 * (1 + Math.abs(z));
        }
        ConstrainedRefit.Result r = ConstrainedRefit.solve(fp, g, z, scale, stored != null ? stored : in.optimum(),
                lm);
        return new Solved(r.nll(), String.format(Locale.ROOT, " (held at %.8g)", r.value()));
    }

    /** θ (estimation scale) of the stored profile point nearest z, or null. */
    private double[] storedNear(ProfilesFile.Entry e, double z) {
        ProfilesFile.Stored s = in.storedProfiles().get(AuditInput.storedKey(e.kind(), e.id()));
        if (s == null || !s.parameterIds().equals(List.of(fp.ids()))) {
            return null;
        }
        List<ProfilesFile.Point> pts = s.entry().points();
        int best = -1;
        for (int i = 0; i < pts.size() && i < s.pointParameters().size(); i++) {
            if (Double.isFinite(pts.get(i).nll()) && (best < 0
                    || Math.abs(pts.get(i).value() - z) < Math.abs(pts.get(best).value() - z))) {
                best = i;
            }
        }
        if (best < 0) {
            return null;
        }
        double[] lin = s.pointParameters().get(best);
        double[] th = new double[lin.length];
        for (int j = 0; j < th.length; j++) {
            th[j] = toEstimation(fp.scale(j), lin[j]);
        }
        return th;
    }

    static double toEstimation(ParameterScale s, double linear) {
        return switch (s) {
            case LOG10 -> Math.log10(linear);
            case LN -> Math.log(linear);
            default -> linear;
        };
    }
}
