package org.switchfit.report;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;

/** The tables of {@link FitReport}. Stateless. */
final class FitReportTables {
    private FitReportTables() {
    }

    /** Relative distance to a bound under which an estimate is flagged as "at bound". */
    static final double AT_BOUND_REL = 1e-6;

    /** Verdict on how well an interval pins a quantity down. */
    enum Pinning {
        /** Closed on both sides. */
        PINNED("pinned"),
        /** Closed on one side only. */
        ONE_SIDED("bounded on one side"),
        /** Open on both sides. */
        FREE("free");

        final String text;

        Pinning(String text) {
            this.text = text;
        }

        static Pinning of(Double lower, Double upper) {
            boolean lo = lower != null && Double.isFinite(lower);
            boolean hi = upper != null && Double.isFinite(upper);
            return lo && hi ? PINNED : lo || hi ? ONE_SIDED : FREE;
        }
    }

    /** Parameter table: estimate, interval, class, bounds, compensating parameters. Either argument may be null. */
    static void parameters(HtmlReport r, FitSummary fit, ProfilesFile prof) {
        Map<String, ProfilesFile.Entry> byId = new LinkedHashMap<>();
        if (prof != null) {
            for (ProfilesFile.Entry e : prof.profiles()) {
                if (e.kind() == ProfilesFile.Kind.PARAMETER) {
                    byId.put(e.id(), e);
                }
            }
        }
        Set<String> ids = new LinkedHashSet<>();
        if (fit != null) {
            ids.addAll(fit.parameters().keySet());
        }
        ids.addAll(byId.keySet());
        String lvl = prof == null ? "" : String.format(Locale.ROOT, " (%.0f %%)", 100 * prof.level());
        Table t = new Table("Estimates (linear scale) and profile-likelihood intervals" + lvl, "parameter",
                "estimate", "scale", "lower", "upper", "class", "bounds", "note", "compensated by");
        List<String> nonId = new ArrayList<>();
        for (String id : ids) {
            ProfilesFile.Entry e = byId.get(id);
            Double est = fit != null && fit.parameters().get(id) != null ? fit.parameters().get(id)
                    : e == null ? null : e.estimate();
            String scale = fit != null && fit.scales().containsKey(id) ? fit.scales().get(id)
                    : e == null ? "" : e.scale();
            FitSummary.Bounds b = fit == null || fit.bounds() == null ? null : fit.bounds().get(id);
            String bounds = b == null ? "" : "[" + Table.formatNumber(b.lower()) + ", " + Table.formatNumber(b.upper())
                    + "]";
            String note = b != null && est != null && atBound(est, b) ? "at a bound" : "";
            String cls = "";
            String comp = "";
            Object lo = "";
            Object hi = "";
            if (e != null) {
                cls = classText(e.classification());
                comp = String.join(", ", e.compensating());
                lo = e.lower() == null ? "open" : e.lower();
                hi = e.upper() == null ? "open" : e.upper();
                if (e.classification() != ProfilesFile.Identifiability.IDENTIFIABLE) {
                    nonId.add(id + " (" + cls + ")");
                }
            } else if (prof != null) {
                cls = "not profiled";
            }
            t.row(id, est, scale, lo, hi, cls, bounds, note, comp);
        }
        r.table(t);
        if (prof != null) {
            diagnostics(r, prof);
        }
        if (!nonId.isEmpty()) {
            r.note(HtmlReport.NoteKind.WARNING, "Not identifiable from these data: " + String.join(", ", nonId)
                    + ". Their estimates are one point of a flat or one-sided valley; do not report them as "
                    + "measured values.");
        }
    }

    /** Optimum and rank-check diagnostics of the profile run, when recorded. */
    static void diagnostics(HtmlReport r, ProfilesFile prof) {
        if (prof.betterOptimumFound()) {
            r.note(HtmlReport.NoteKind.WARNING, String.format(Locale.ROOT, "A profile met a lower negative "
                    + "log-likelihood (%.8g) than the fit (%.8g): the fit had not reached the optimum. Refit (more "
                    + "starts) before using these intervals.", prof.bestNllFound(), prof.bestNll()));
        }
        ProfilesFile.RankCheck rc = prof.rankCheck();
        if (rc != null && rc.atOptimum() != null) {
            String txt = String.format(Locale.ROOT, "Residual Jacobian at the optimum: rank %d of %d free parameters",
                    rc.atOptimum().rank(), rc.atOptimum().freeCount());
            if (rc.atOptimum().fullRank()) {
                r.paragraph(txt + " (locally identifiable structure).");
            } else {
                StringBuilder sb = new StringBuilder(txt).append("; directions the data cannot see: ");
                for (int i = 0; i < rc.atOptimum().nullSpace().size(); i++) {
                    sb.append(i > 0 ? "; " : "").append(rc.atOptimum().nullSpace().get(i).description());
                }
                r.note(HtmlReport.NoteKind.WARNING, sb.append('.').toString());
            }
        }
    }

    /**
     * Fold table: fold position estimate, interval, width relative to the value and the verdict pinned / bounded on
     * one side / free. Folds from branches.json without a profile are listed as "not profiled".
     */
    static void folds(HtmlReport r, ProfilesFile prof, BranchesFile br) {
        Table t = new Table("Fold positions" + (prof == null ? "" : String.format(Locale.ROOT,
                " with %.0f %% profile-likelihood intervals", 100 * prof.level())), "fold", "control",
                "value", "lower", "upper", "relative width", "verdict");
        Set<String> seen = new LinkedHashSet<>();
        Map<String, BranchesFile.Special> specials = new LinkedHashMap<>();
        if (br != null) {
            for (BranchesFile.Special s : br.folds()) {
                if (s.kind() == BranchesFile.Kind.FOLD) {
                    specials.put(s.id(), s);
                }
            }
        }
        int pinned = 0;
        int total = 0;
        if (prof != null) {
            for (ProfilesFile.Entry e : prof.profiles()) {
                if (e.kind() != ProfilesFile.Kind.FOLD) {
                    continue;
                }
                seen.add(e.id());
                BranchesFile.Special s = specials.get(e.id());
                Pinning p = Pinning.of(e.lower(), e.upper());
                double width = p == Pinning.PINNED ? (e.upper() - e.lower()) / Math.abs(e.estimate()) : Double.NaN;
                t.row(e.id(), s == null ? "" : s.parameter(), e.estimate(), e.lower() == null ? "open" : e.lower(),
                        e.upper() == null ? "open" : e.upper(), width, p.text);
                total++;
                if (p == Pinning.PINNED) {
                    pinned++;
                }
            }
        }
        for (BranchesFile.Special s : specials.values()) {
            if (!seen.contains(s.id())) {
                t.row(s.id(), s.parameter(), s.value(), "", "", Double.NaN, "not profiled");
            }
        }
        r.table(t);
        if (br != null && !br.thresholds().isEmpty()) {
            Table m = new Table("Measured switching thresholds against the fitted model's folds", "threshold",
                    "direction", "measured", "sigma", "model fold", "model", "residual");
            for (BranchesFile.Threshold th : br.thresholds()) {
                BranchesFile.Special s = th.fold() == null ? null : specials.get(th.fold());
                m.row(th.id(), th.direction(), th.value(), th.sigma(), s == null ? "none matched" : s.id(),
                        s == null ? null : s.value(), s == null ? null : (th.value() - s.value()) / th.sigma());
            }
            r.table(m);
            r.paragraph("Residual = (measured − model) / sigma; the fit's own values are in "
                    + "switching_residuals.csv.");
        }
        if (total > 0) {
            r.paragraph(String.format(Locale.ROOT, "%d of %d profiled fold positions are pinned down (interval "
                    + "closed on both sides). Relative width = (upper \u2212 lower) / |value|.", pinned, total));
        } else {
            r.note(HtmlReport.NoteKind.INFO, NO_FOLD_PROFILES);
        }
    }

    /** The fold section's note when profiles.json holds no fold profiles. */
    static final String NO_FOLD_PROFILES = "No fold positions were profiled; 'switchfit profile FITDIR --folds "
            + "--resume' adds them to profiles.json.";

    /** Table of the prediction profiles (Kreutz et al. 2012), when profiles.json has any. */
    static void predictions(HtmlReport r, ProfilesFile prof) {
        Table t = new Table(String.format(Locale.ROOT, "Predictions with %.0f %% prediction-profile intervals",
                100 * prof.level()), "prediction", "value", "lower", "upper", "verdict");
        int n = 0;
        for (ProfilesFile.Entry e : prof.profiles()) {
            if (e.kind() == ProfilesFile.Kind.PREDICTION) {
                t.row(e.id(), e.estimate(), e.lower() == null ? "open" : e.lower(),
                        e.upper() == null ? "open" : e.upper(), Pinning.of(e.lower(), e.upper()).text);
                n++;
            }
        }
        if (n > 0) {
            r.table(t);
        }
    }

    /** Table of the jumps of each ramp. */
    static void jumps(HtmlReport r, SweepFile s) {
        Table t = new Table("Jumps of " + s.readout(), "ramp", s.parameter(), "before", "after");
        int n = 0;
        for (SweepFile.Run run : s.runs()) {
            for (SweepFile.Jump j : run.jumps()) {
                t.row(run.direction() == SweepFile.Direction.UP ? "up" : "down", j.value(), j.before(), j.after());
                n++;
            }
        }
        if (n > 0) {
            r.table(t);
        } else {
            r.paragraph("No jumps along the ramps: the response followed one branch.");
        }
    }

    static boolean atBound(double v, FitSummary.Bounds b) {
        double tolLo = AT_BOUND_REL * Math.max(Math.abs(b.lower()), Double.MIN_NORMAL);
        double tolHi = AT_BOUND_REL * Math.max(Math.abs(b.upper()), Double.MIN_NORMAL);
        return Math.abs(v - b.lower()) <= tolLo || Math.abs(v - b.upper()) <= tolHi;
    }

    static String classText(ProfilesFile.Identifiability c) {
        if (c == null) {
            return "";
        }
        switch (c) {
            case IDENTIFIABLE:
                return "identifiable";
            case PRACTICALLY_NONIDENTIFIABLE:
                return "practically non-identifiable";
            default:
                return "structurally non-identifiable";
        }
    }
}
