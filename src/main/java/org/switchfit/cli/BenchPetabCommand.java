package org.switchfit.cli;

import java.io.IOException;
import java.io.PrintWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import java.util.stream.Stream;
import org.switchfit.objective.LikelihoodObjective;
import org.switchfit.ode.SolverSettings;
import org.switchfit.report.Json;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/**
 * {@code switchfit bench-petab DIR}: runs {@code check} on every PEtab problem folder in DIR and compares the
 * objective gradient with central finite differences. A benchmark, not a test: prints one line per problem and a
 * summary, optionally JSON.
 */
@Command(name = "bench-petab", hidden = true, mixinStandardHelpOptions = true,
        footer = {"", "Examples:", "  switchfit bench-petab ../shared/benchmarks/problems --json target/petab.json", "  switchfit bench-petab ../shared/benchmarks/problems --problems Boehm_JProteomeRes2014 --timing 5"},
        description = "Check every PEtab problem in a folder against its reference simulations and check gradients.")
public final class BenchPetabCommand implements Callable<Integer> {
    /** Relative agreement required between gradient and central finite differences. */
    static final double GRADIENT_REL_TOL = 1e-4;
    /** Largest number of gradient components checked by finite differences per problem. */
    static final int MAX_FD_PARAMETERS = 12;

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "DIR", description = "folder with one sub-folder per problem")
    Path dir;

    @Option(names = "--problems", split = ",", paramLabel = "NAME", description = "only these problems")
    List<String> only;

    @Option(names = "--json", paramLabel = "FILE", description = "write results as JSON")
    Path json;

    @Option(names = "--no-gradient", description = "skip the finite-difference gradient check")
    boolean noGradient;

    @Option(names = "--no-check", description = "skip the comparison with reference simulations")
    boolean noCheck;

    @Option(names = "--timing", paramLabel = "STARTS", defaultValue = "0",
            description = "time objective evaluations and this many single LM starts (rtol 1e-8, after warm-up)")
    int timingStarts;

    @Override
    public Integer call() throws IOException {
        if (!Files.isDirectory(dir)) {
            throw new org.switchfit.util.UserInputException(null, "benchmark folder '" + dir
                    + "' does not exist; pass the folder that holds one sub-folder per PEtab problem");
        }
        PrintWriter out = spec.commandLine().getOut();
        List<Path> folders;
        try (Stream<Path> s = Files.list(dir)) {
            folders = s.filter(Files::isDirectory).sorted().toList();
        }
        List<Map<String, Object>> results = new ArrayList<>();
        int matched = 0;
        int total = 0;
        int gradOk = 0;
        for (Path f : folders) {
            String name = f.getFileName().toString();
            if (only != null && !only.contains(name)) {
                continue;
            }
            total++;
            Map<String, Object> r = new LinkedHashMap<>();
            r.put("problem", name);
            Path yaml = f.resolve(name + ".yaml");
            if (!Files.isRegularFile(yaml)) {
                try (Stream<Path> s = Files.list(f)) {
                    yaml = s.filter(p -> p.toString().endsWith(".yaml")).sorted().findFirst().orElse(yaml);
                }
            }
            try {
                if (!noCheck) {
                    CheckRun run = new CheckRun(yaml, null, SolverSettings.defaults().withTolerances(1e-8, 1e-12));
                    r.putAll(run.json);
                    r.remove("observables");
                    boolean ok = run.allMatch();
                    matched += ok ? 1 : 0;
                    r.put("status", ok ? "match" : "mismatch");
                }
                if (timingStarts > 0) {
                    timing(yaml, timingStarts, r);
                    out.printf(Locale.ROOT, "%-32s timing: residuals %.4g s, residuals+Jacobian %.4g s, ratio %.2f;"
                            + " %d LM starts: mean %.4g s (median %.4g s), mean %.1f iterations, best NLL %.6g%n",
                            name, r.get("secondsResiduals"), r.get("secondsResidualsAndJacobian"),
                            r.get("jacobianCostRatio"), timingStarts, r.get("secondsPerStartMean"),
                            r.get("secondsPerStartMedian"), r.get("iterationsPerStartMean"), r.get("bestNllTiming"));
                }
                if (!noGradient) {
                    double err = gradientError(yaml, r);
                    gradOk += err <= GRADIENT_REL_TOL ? 1 : 0;
                }
            } catch (RuntimeException e) {
                r.put("status", "failed");
                r.put("reason", e.getClass().getSimpleName() + ": " + e.getMessage());
            }
            results.add(r);
            out.printf(Locale.ROOT, "%-32s %-9s nll=%-16s matched=%s/%s maxRel=%s grad=%s %s%s%n", name,
                    r.get("status"), fmt(r.get("nllAtNominal")), r.get("matched"), r.get("measurements"),
                    fmt(r.get("maxRelDeviation")), fmt(r.get("gradientRelError")), fmt(r.get("seconds")),
                    r.containsKey("reason") ? " " + r.get("reason") : (r.containsKey("firstMismatch")
                            ? " first: " + r.get("firstMismatch") : ""));
            out.flush();
        }
        out.printf(Locale.ROOT, "%d of %d problems match their reference simulations; gradients within %.0e: %d%n",
                matched, total, GRADIENT_REL_TOL, gradOk);
        if (json != null) {
            Map<String, Object> all = new LinkedHashMap<>();
            all.put("matched", matched);
            all.put("total", total);
            all.put("gradientsOk", gradOk);
            all.put("problems", results);
            Json.write(json, all);
        }
        return 0;
    }

    /**
     * Times, after 10 warm-up evaluations: mean of 20 residual evaluations, mean of 20 residual + Jacobian
     * evaluations at the nominal point, and single LM starts from Latin-hypercube points within the bounds (seed 1),
     * one thread, rtol 1e-8, LM cost tolerance 1e-10 (the fit command's default).
     */
    static void timing(Path yaml, int starts, Map<String, Object> r) {
        LikelihoodObjective obj = LikelihoodObjective.of(org.switchfit.problem.ProblemLoader.load(yaml),
                SolverSettings.defaults().withTolerances(1e-8, 1e-12));
        int np = obj.parameterCount();
        int nr = obj.residualCount();
        double[] th = obj.problem().nominalTheta();
        double[] res = new double[nr];
        double[] jac = new double[nr * np];
        for (int i = 0; i < 10; i++) {
            obj.evaluate(th, res, jac);
        }
        long t0 = System.nanoTime();
        for (int i = 0; i < 20; i++) {
            obj.evaluate(th, res, null);
        }
        double plain = (System.nanoTime() - t0) * 1e-9 / 20;
        t0 = System.nanoTime();
        for (int i = 0; i < 20; i++) {
            obj.evaluate(th, res, jac);
        }
        double withJac = (System.nanoTime() - t0) * 1e-9 / 20;
        org.switchfit.fit.FitProblem fp = FitCommand.fitProblem(obj.problem(), obj);
        org.switchfit.fit.Multistart ms = org.switchfit.fit.Multistart.defaults().withStarts(starts).withSeed(1)
                .withOptimizer(org.switchfit.fit.LevenbergMarquardt.defaults().withCostTolerance(1e-10));
        double[] secs = new double[starts];
        double iters = 0;
        double best = Double.POSITIVE_INFINITY;
        ms.runStart(fp, null, 0);
        for (int i = 0; i < starts; i++) {
            long s0 = System.nanoTime();
            org.switchfit.fit.StartResult sr = ms.runStart(fp, null, i);
            secs[i] = (System.nanoTime() - s0) * 1e-9;
            iters += sr.iterations();
            if (Double.isFinite(sr.nll())) {
                best = Math.min(best, sr.nll());
            }
        }
        double[] sorted = secs.clone();
        Arrays.sort(sorted);
        r.put("secondsResiduals", plain);
        r.put("secondsResidualsAndJacobian", withJac);
        r.put("jacobianCostRatio", withJac / plain);
        r.put("secondsPerStartMean", Arrays.stream(secs).average().orElse(Double.NaN));
        r.put("secondsPerStartMedian", sorted[starts / 2]);
        r.put("iterationsPerStartMean", iters / starts);
        r.put("bestNllTiming", best);
    }

    private static String fmt(Object o) {
        if (o instanceof Double d) {
            return String.format(Locale.ROOT, "%.6g", d);
        }
        return String.valueOf(o);
    }

    /**
     * Norm-wise relative gradient error {@code |g - g_fd|_inf / |g_fd|_inf} at a point moved off the nominal values
     * (each θ_j by 1 % of its box width toward the box centre), where the gradient is not nearly zero: g = J^T r
     * from sensitivities, g_fd central differences of the NLL with step 1e-4 max(1, |θ_j|) on the estimation
     * scale, both at rtol 1e-10 (so the differencing noise, about rtol / step = 1e-6, stays below the 1e-4 bar).
     */
    static double gradientError(Path yaml, Map<String, Object> r) {
        SolverSettings tight = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
        LikelihoodObjective obj = LikelihoodObjective.of(org.switchfit.problem.ProblemLoader.load(yaml), tight);
        int np = obj.parameterCount();
        int nr = obj.residualCount();
        double[] th = obj.problem().nominalTheta();
        for (int j = 0; j < np; j++) {
            org.switchfit.problem.FreeParameter p = obj.problem().parameters().get(j);
            double lo = p.thetaLower();
            double hi = p.thetaUpper();
            th[j] += (th[j] < 0.5 * (lo + hi) ? 0.01 : -0.01) * (hi - lo);
        }
        double[] res = new double[nr];
        double[] jac = new double[nr * np];
        long t0 = System.nanoTime();
        obj.evaluate(th, res, jac);
        double tGrad = (System.nanoTime() - t0) * 1e-9;
        t0 = System.nanoTime();
        obj.evaluate(th, res, null);
        double tPlain = (System.nanoTime() - t0) * 1e-9;
        obj.evaluate(th, res, jac);
        double[] g = new double[np];
        for (int i = 0; i < nr; i++) {
            for (int j = 0; j < np; j++) {
                g[j] += jac[i * np + j] * res[i];
            }
        }
        double[] rr = new double[nr];
        double num = 0.0;
        double den = 0.0;
        int worst = -1;
        // At most MAX_FD_PARAMETERS components (evenly spaced) keep the check affordable for large problems.
        int stride = Math.max(1, (np + MAX_FD_PARAMETERS - 1) / MAX_FD_PARAMETERS);
        for (int j = 0; j < np; j += stride) {
            double h = 1e-4 * Math.max(1.0, Math.abs(th[j]));
            double[] tp = th.clone();
            tp[j] += h;
            double fp = obj.evaluate(tp, rr, null);
            tp[j] = th[j] - h;
            double fm = obj.evaluate(tp, rr, null);
            double fd = (fp - fm) / (2 * h);
            if (Math.abs(g[j] - fd) > num) {
                num = Math.abs(g[j] - fd);
                worst = j;
            }
            den = Math.max(den, Math.abs(fd));
        }
        double err = den > 0 ? num / den : num;
        r.put("gradientRelError", err);
        r.put("gradientComponentsChecked", (np + stride - 1) / stride);
        r.put("gradientWorstParameter", worst < 0 ? null : obj.problem().parameters().get(worst).id());
        r.put("secondsObjectiveAndGradient", tGrad);
        r.put("secondsObjectiveOnly", tPlain);
        r.put("gradientNormInf", den);
        return err;
    }

    static double[] copy(double[] a) {
        return Arrays.copyOf(a, a.length);
    }
}
