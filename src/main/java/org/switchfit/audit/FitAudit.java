package org.switchfit.audit;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import java.util.concurrent.Callable;
import java.util.function.Consumer;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.FitResult;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.LocalTaskExecutor;
import org.switchfit.fit.Multistart;
import org.switchfit.fit.TaskExecutor;
import org.switchfit.objective.ObjectiveException;
import org.switchfit.report.FitSummary;
import org.switchfit.util.UserInputException;

/**
 * The reviewer's audit of a fit directory: re-derives each claim of the fit from the model and data on disk and
 * returns one {@link Claim} per claim, in this order:
 * <ol>
 *   <li>{@code input FILE}: the SHA-256 of every input file listed in {@code result.json} matches, and the problem
 *       reads no unlisted file;</li>
 *   <li>{@code nll}: the NLL at the recorded optimum recomputes to {@value #NLL_RELATIVE_TOLERANCE} relative
 *       (relative to max(1, |NLL|), so that an NLL near 0 is not held to an absolute 1e-8 × |NLL|);</li>
 *   <li>{@code optimality}: first-order optimality on the box, see {@link #gradientTolerance};</li>
 *   <li>{@code fresh starts}: a new multistart with another seed finds nothing below the recorded best NLL minus
 *       {@value #BETTER_OPTIMUM_MARGIN}, see {@link #BETTER_OPTIMUM_MARGIN};</li>
 *   <li>{@code profile ID lower|upper}: each profile interval end in {@code profiles.json} re-derived by
 *       re-optimisation, see {@link ProfileAudit};</li>
 *   <li>{@code threshold KEY}: the model's fold positions recomputed at the optimum equal those recorded in
 *       {@code branches.json} and in the fold profiles, see {@link ThresholdAudit}.</li>
 * </ol>
 * Immutable; results are reproducible from the seed whatever the executor.
 */
public final class FitAudit {

    /** Relative tolerance of the NLL recomputation (as the issue states it: 1e-8 relative). */
    public static final double NLL_RELATIVE_TOLERANCE = 1e-8;
    /**
     * A fresh start may end at most this far (NLL units) below the recorded best before the claim "no better
     * optimum" fails. It is the tolerance the fit itself uses to count starts that reached the best value
     * ({@link FitResult#NEAR_BEST_TOLERANCE}), and it is about 5 % of the 95 % profile threshold in NLL units
     * (χ²₁(0.95)/2 ≈ 1.92), so a better optimum by less than this moves no interval end by more than a small
     * fraction of its width; a larger gap would mean the reported optimum, and every interval built on it, is wrong.
     */
    public static final double BETTER_OPTIMUM_MARGIN = FitResult.NEAR_BEST_TOLERANCE;
    /** Safety factor on √(cost tolerance) in the optimality test, see {@link #gradientTolerance}. */
    public static final double GRADIENT_MARGIN = 10;
    /** Cost-change tolerance of {@link LevenbergMarquardt#defaults()}, used when result.json records none. */
    public static final double DEFAULT_COST_TOLERANCE = 1e-14;
    /** Fresh starts by default: a modest number, so that the audit of the demo fit takes about a minute. */
    public static final int DEFAULT_STARTS = 4;

    private final int starts;
    private final Long seed;
    private final TaskExecutor executor;

    private FitAudit(int starts, Long seed, TaskExecutor executor) {
        this.starts = starts;
        this.seed = seed;
        this.executor = executor;
    }

    /** {@value #DEFAULT_STARTS} fresh starts, seed = the fit's seed + 1, one thread. */
    public static FitAudit defaults() {
        return new FitAudit(DEFAULT_STARTS, null, LocalTaskExecutor.sequential());
    }

    /** Number of fresh starts (0 skips that claim, which is then reported as not checked and fails). */
    public FitAudit withStarts(int n) {
        if (n < 0) {
            throw new IllegalArgumentException("starts must be >= 0, got " + n);
        }
        return new FitAudit(n, seed, executor);
    }

    /** Seed of the fresh starts; must differ from the fit's seed. */
    public FitAudit withSeed(long s) {
        return new FitAudit(starts, s, executor);
    }

    /** Executor for the fresh starts and the profile re-optimisations. */
    public FitAudit withExecutor(TaskExecutor e) {
        return new FitAudit(starts, seed, e);
    }

    /**
     * Runs every check.
     *
     * @param in      the fit directory's files and the rebuilt problem
     * @param onClaim told about each claim as it is decided (in the order of the returned list), may be null
     * @return the claims
     * @throws UserInputException when the seed equals the fit's seed (the starts would repeat the fit's)
     */
    public List<Claim> run(AuditInput in, Consumer<Claim> onClaim) {
        FitSummary.Settings set = in.summary().settings();
        long s = seed != null ? seed : (set == null ? 1 : set.seed()) + 1;
        if (set != null && s == set.seed()) {
            throw UserInputException.of(null, "--seed %d is the seed of the fit itself, so the fresh starts would "
                    + "repeat the fit's starts; choose another seed", s);
        }
        List<Claim> out = new ArrayList<>();
        Consumer<Claim> add = c -> {
            out.add(c);
            if (onClaim != null) {
                onClaim.accept(c);
            }
        };
        inputs(in).forEach(add);
        double nll = nll(in, add);
        add.accept(optimality(in));
        add.accept(freshStarts(in, s));
        ProfileAudit pa = new ProfileAudit(in, Double.isFinite(nll) ? nll : in.summary().bestNll());
        List<Callable<Claim>> tasks = pa.tasks();
        executor.runAll(tasks, null).forEach(add);
        ThresholdAudit.claims(in).forEach(add);
        return out;
    }

    /** The Levenberg-Marquardt configuration of the fit, as recorded in result.json. */
    static LevenbergMarquardt lm(AuditInput in) {
        LevenbergMarquardt lm = LevenbergMarquardt.defaults();
        FitSummary.Settings set = in.summary().settings();
        if (set != null && set.maxIterations() > 0) {
            lm = lm.withMaxIterations(set.maxIterations());
        }
        if (set != null && set.costTolerance() > 0) {
            lm = lm.withCostTolerance(set.costTolerance());
        }
        return lm.withFactorProjection(set == null || set.closedFormFactors());
    }

    /**
     * Tolerance on the scaled projected gradient {@code max_k |pg_k| / (|J_k| |r|)} (pg = θ − P(θ − Jᵀr), J_k the
     * residual Jacobian's column k): {@value #GRADIENT_MARGIN} × √ε, ε the fit's cost-change tolerance. Derivation:
     * the fit stops when a Levenberg-Marquardt step predicts a relative cost reduction below ε. The model's predicted
     * reduction is at least the best reduction along coordinate k alone, ½ g_k² / (|J_k|² + λ d_k²), and g_k/(|J_k||r|)
     * is the cosine above, so at the stop cos_k² ≲ 2 ε (1 + λ d_k²/|J_k|²). The margin 10 (100 on ε) covers the
     * damping λ d_k²/|J_k|² up to about 50 and the sensitivity error of the integration (relative ~rtol).
     */
    static double gradientTolerance(FitSummary.Settings set) {
        double eps = set != null && set.costTolerance() > 0 ? set.costTolerance() : DEFAULT_COST_TOLERANCE;
        return GRADIENT_MARGIN * Math.sqrt(eps);
    }

    private static List<Claim> inputs(AuditInput in) {
        List<Claim> out = new ArrayList<>();
        Set<Path> recorded = new HashSet<>();
        for (FitSummary.InputFile f : in.summary().inputs()) {
            Path p = FitSummary.resolveRecorded(in.fitDir(), f.file());
            recorded.add(p.toAbsolutePath().normalize());
            String id = "input " + f.file();
            if (!Files.isRegularFile(p)) {
                out.add(new Claim(id, false, "file not found (result.json records SHA-256 " + shortHash(f.sha256())
                        + ")", Map.of()));
                continue;
            }
            String now = FitSummary.InputFile.sha256(p);
            boolean same = now.equalsIgnoreCase(f.sha256());
            out.add(new Claim(id, same, same ? "SHA-256 " + shortHash(now) + " matches result.json"
                    : "SHA-256 now " + shortHash(now) + ", result.json records " + shortHash(f.sha256())
                    + ": the file changed since the fit", Map.of()));
        }
        for (Path p : in.currentInputs()) {
            if (!recorded.contains(p.toAbsolutePath().normalize())) {
                out.add(new Claim("input " + p, false, "the problem reads this file now, but result.json does not "
                        + "list it", Map.of()));
            }
        }
        if (in.summary().inputs().isEmpty()) {
            out.add(new Claim("inputs", false, "result.json lists no input files, so none can be checked",
                    Map.of()));
        }
        return out;
    }

    private static String shortHash(String h) {
        return h == null ? "(none)" : h.length() > 16 ? h.substring(0, 16) + "..." : h;
    }

    /**
     * The NLL at the recorded optimum, computed as the fitter computes the value it records: together with the
     * Jacobian, so that the forward sensitivities take part in the integrator's error control. The value without
     * them is shown as well; the two differ by the integration error (about rtol relative).
     */
    private static double nll(AuditInput in, Consumer<Claim> add) {
        double rec = in.summary().bestNll();
        FitProblem fp = in.fitProblem();
        int m = fp.objective().residualCount();
        double now;
        double plain;
        try {
            now = fp.objective().evaluate(in.optimum(), new double[m], new double[m * fp.parameterCount()]);
            plain = fp.objective().evaluate(in.optimum(), new double[m], null);
        } catch (ObjectiveException e) {
            add.accept(new Claim("nll", false, "cannot be recomputed at the recorded optimum: " + e.getMessage(),
                    Map.of("recorded", rec)));
            return Double.NaN;
        }
        double rel = Math.abs(now - rec) / Math.max(1, Math.abs(rec));
        Map<String, Double> v = new LinkedHashMap<>();
        v.put("recorded", rec);
        v.put("recomputed", now);
        v.put("relativeDifference", rel);
        v.put("tolerance", NLL_RELATIVE_TOLERANCE);
        v.put("recomputedWithoutSensitivities", plain);
        boolean ok = rel <= NLL_RELATIVE_TOLERANCE;
        add.accept(new Claim("nll", ok, String.format(Locale.ROOT, "recorded %.12g, recomputed %.12g at the "
                + "recorded optimum (relative difference %.2g %s %.0e; %.12g without sensitivities in the error "
                + "control)", rec, now, rel, ok ? "<=" : ">", NLL_RELATIVE_TOLERANCE, plain), v));
        return now;
    }

    private static Claim optimality(AuditInput in) {
        FitProblem fp = in.fitProblem();
        int n = fp.parameterCount();
        int m = fp.objective().residualCount();
        double[] theta = in.optimum();
        double[] r = new double[m];
        double[] jac = new double[m * n];
        try {
            fp.objective().evaluate(theta, r, jac);
        } catch (ObjectiveException e) {
            return new Claim("optimality", false, "the gradient cannot be evaluated at the recorded optimum: "
                    + e.getMessage(), Map.of());
        }
        double rn = 0;
        for (double v : r) {
            rn += v * v;
        }
        rn = Math.sqrt(rn);
        double worst = 0;
        int arg = -1;
        List<String> active = new ArrayList<>();
        for (int k = 0; k < n; k++) {
            if (fp.isFixed(k)) {
                continue;
            }
            double g = 0;
            double cn = 0;
            for (int i = 0; i < m; i++) {
                g += jac[i * n + k] * r[i];
                cn += jac[i * n + k] * jac[i * n + k];
            }
            double pg = theta[k] - Math.min(fp.upper(k), Math.max(fp.lower(k), theta[k] - g));
            if (theta[k] <= fp.lower(k) || theta[k] >= fp.upper(k)) {
                active.add(fp.id(k) + (theta[k] <= fp.lower(k) ? " at its lower" : " at its upper") + " bound");
            }
            double cos = cn > 0 && rn > 0 ? Math.abs(pg) / (Math.sqrt(cn) * rn) : 0;
            if (!(cos <= worst)) {
                worst = cos;
                arg = k;
            }
        }
        double tol = gradientTolerance(in.summary().settings());
        boolean ok = worst <= tol;
        Map<String, Double> v = new LinkedHashMap<>();
        v.put("scaledProjectedGradient", worst);
        v.put("tolerance", tol);
        return new Claim("optimality", ok, String.format(Locale.ROOT, "largest scaled projected gradient %.3g%s %s "
                        + "%.3g (10 x sqrt of the fit's cost-change tolerance); %s", worst,
                arg < 0 ? "" : " (" + fp.id(arg) + ")", ok ? "<=" : ">", tol,
                active.isEmpty() ? "no parameter at a bound" : "projected out: " + String.join(", ", active)), v);
    }

    private Claim freshStarts(AuditInput in, long s) {
        double best = in.summary().bestNll();
        if (starts == 0) {
            return new Claim("fresh starts", false, "not checked (--starts 0)", Map.of());
        }
        FitResult r = Multistart.defaults().withStarts(starts).withSeed(s).withOptimizer(lm(in))
                .run(in.fitProblem(), null, executor);
        Map<String, Double> v = new LinkedHashMap<>();
        v.put("starts", (double) starts);
        v.put("seed", (double) s);
        v.put("lowestNll", r.bestNll());
        v.put("recordedBestNll", best);
        v.put("margin", BETTER_OPTIMUM_MARGIN);
        if (r.bestTheta() == null) {
            return new Claim("fresh starts", false, String.format(Locale.ROOT, "all %d starts (seed %d) failed, so "
                    + "the search for a better optimum was not done", starts, s), v);
        }
        boolean ok = r.bestNll() >= best - BETTER_OPTIMUM_MARGIN;
        int near = 0;
        for (var st : r.starts()) {
            if (Double.isFinite(st.nll()) && Math.abs(st.nll() - best) <= BETTER_OPTIMUM_MARGIN) {
                near++;
            }
        }
        return new Claim("fresh starts", ok, String.format(Locale.ROOT, "%d starts with seed %d (fit: seed %s): "
                        + "lowest NLL %.10g, %s recorded best %.10g - %.1f; %d of them within %.1f of the best, %d "
                        + "failed", starts, s, in.summary().settings() == null ? "?"
                        : Long.toString(in.summary().settings().seed()), r.bestNll(), ok ? "not below" : "BELOW",
                best, BETTER_OPTIMUM_MARGIN, near, BETTER_OPTIMUM_MARGIN, r.failedCount()), v);
    }
}
