package org.switchfit.audit;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.switchfit.objective.ObjectiveException;
import org.switchfit.objective.Prediction;
import org.switchfit.report.BranchesFile;
import org.switchfit.report.ProfilesFile;

/**
 * The thresholds claim: the model's switching thresholds (the fold ending the low branch for an up-sweep, the high
 * branch for a down-sweep) recomputed at the recorded optimum must equal the fold positions recorded in
 * {@code branches.json} (continuation) and the estimates of the fold profiles in {@code profiles.json}, to
 * {@link #RELATIVE_TOLERANCE}.
 */
final class ThresholdAudit {

    /**
     * Relative tolerance between a recomputed and a recorded fold position. Both come from Newton refinement of the
     * fold (the continuation's default relative tolerance is 1e-11), by two different codes (continuation's
     * bordered fold system; the objective's threshold block); 1e-6 leaves five orders for their different stopping
     * rules and is still far below the printed digits and the data's σ (0.05 on a value of about 1-2).
     */
    static final double RELATIVE_TOLERANCE = 1e-6;

    private ThresholdAudit() {
    }

    static List<Claim> claims(AuditInput in) {
        List<Claim> out = new ArrayList<>();
        for (Map.Entry<String, Prediction> f : in.folds().entrySet()) {
            String key = f.getKey();
            Map<String, Double> recorded = recorded(in, key);
            if (recorded.isEmpty()) {
                continue;
            }
            double now;
            try {
                now = f.getValue().evaluate(in.optimum(), null);
            } catch (ObjectiveException e) {
                out.add(new Claim("threshold " + key, false, "cannot be recomputed at the optimum: "
                        + e.getMessage(), Map.of()));
                continue;
            }
            for (Map.Entry<String, Double> r : recorded.entrySet()) {
                double rel = Math.abs(now - r.getValue()) / Math.max(Math.abs(now), Double.MIN_NORMAL);
                boolean ok = rel <= RELATIVE_TOLERANCE;
                Map<String, Double> v = new LinkedHashMap<>();
                v.put("recomputed", now);
                v.put("recorded", r.getValue());
                v.put("relativeDifference", rel);
                v.put("tolerance", RELATIVE_TOLERANCE);
                out.add(new Claim("threshold " + key, ok, String.format(Locale.ROOT, "model threshold recomputed at "
                                + "the optimum %.10g, %s records %.10g (relative difference %.2g %s %.0e)", now,
                        r.getKey(), r.getValue(), rel, ok ? "<=" : ">", RELATIVE_TOLERANCE), v));
            }
        }
        return out;
    }

    /** Recorded positions of fold {@code experiment/control/direction} by where they are recorded. */
    private static Map<String, Double> recorded(AuditInput in, String key) {
        Map<String, Double> out = new LinkedHashMap<>();
        String[] parts = key.split("/");
        BranchesFile b = in.branches();
        if (b != null && parts.length >= 3 && parts[parts.length - 2].equals(b.control())) {
            String dir = parts[parts.length - 1];
            for (BranchesFile.Threshold t : b.thresholds()) {
                if (dir.equalsIgnoreCase(t.direction()) && t.fold() != null) {
                    for (BranchesFile.Special s : b.folds()) {
                        if (s.id().equals(t.fold())) {
                            out.put("branches.json " + s.id(), s.value());
                        }
                    }
                    break;
                }
            }
        }
        if (in.profiles() != null) {
            for (ProfilesFile.Entry e : in.profiles().profiles()) {
                if (e.kind() == ProfilesFile.Kind.FOLD && e.id().equals(key)) {
                    out.put("profiles.json (estimate)", e.estimate());
                }
            }
        }
        return out;
    }
}
