package org.switchfit.report;

import com.fasterxml.jackson.annotation.JsonInclude;
import java.io.IOException;
import java.io.InputStream;
import java.nio.file.Files;
import java.nio.file.Path;
import java.security.MessageDigest;
import java.security.NoSuchAlgorithmException;
import java.util.HexFormat;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.switchfit.fit.FitResult;
import org.switchfit.fit.StartResult;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.FreeParameter;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Content of {@code result.json}, written by {@code switchfit fit}: the best parameter vector, the outcome of every
 * start of the multistart run, the run settings and the checksums of the inputs. Immutable (collections are copied;
 * maps keep their order).
 *
 * @param problem                   problem file as given on the command line
 * @param bestNll                   lowest negative log-likelihood over all starts (NaN when all failed)
 * @param parameters                best value of each estimated parameter on the linear scale (null entries when all
 *                                  starts failed), in θ order
 * @param parametersEstimationScale the same values on the estimation scale
 * @param scales                    estimation scale token of each parameter ({@code lin}, {@code log}, {@code log10})
 * @param bounds                    lower and upper bound of each parameter, linear scale; may be null for files
 *                                  written before bounds were recorded
 * @param startsNearBest            number of starts whose final value is within {@code nearBestTolerance} of the best
 * @param nearBestTolerance         that tolerance, in NLL units (0.1)
 * @param failedStarts              number of starts that failed
 * @param starts                    every start, in index order
 * @param settings                  run settings (number of starts, seed, tolerances)
 * @param wallSeconds               wall-clock duration of the run, s
 * @param versions                  program and runtime versions
 * @param inputs                    every input file with its SHA-256
 */
@JsonInclude(JsonInclude.Include.NON_NULL)
public record FitSummary(String problem, double bestNll, Map<String, Double> parameters,
                         Map<String, Double> parametersEstimationScale, Map<String, String> scales,
                         Map<String, Bounds> bounds, int startsNearBest, double nearBestTolerance, int failedStarts,
                         List<Start> starts, Settings settings, double wallSeconds, Map<String, String> versions,
                         List<InputFile> inputs) {

    /** Copies the collections (null becomes empty, except {@code bounds}, which stays null when absent). */
    public FitSummary {
        parameters = copy(parameters);
        parametersEstimationScale = copy(parametersEstimationScale);
        scales = copy(scales);
        bounds = bounds == null ? null : copy(bounds);
        starts = starts == null ? List.of() : List.copyOf(starts);
        versions = copy(versions);
        inputs = inputs == null ? List.of() : List.copyOf(inputs);
    }

    /**
     * The summary of a finished multistart fit of {@code problem}, in the layout the {@code fit} command writes,
     * with the parameter bounds added.
     *
     * @param problem     the problem that was fitted
     * @param result      the multistart result (starts in the order given there)
     * @param settings    run settings
     * @param wallSeconds wall-clock duration, s
     * @param versions    program and runtime versions
     * @param inputs      input files with checksums
     * @return the summary
     */
    public static FitSummary of(EstimationProblem problem, FitResult result, Settings settings, double wallSeconds,
                                Map<String, String> versions, List<InputFile> inputs) {
        Map<String, Double> lin = new LinkedHashMap<>();
        Map<String, Double> est = new LinkedHashMap<>();
        Map<String, String> sc = new LinkedHashMap<>();
        Map<String, Bounds> bd = new LinkedHashMap<>();
        double[] th = result.bestTheta();
        for (int k = 0; k < problem.parameterCount(); k++) {
            FreeParameter p = problem.parameters().get(k);
            lin.put(p.id(), th == null ? null : p.toLinear(th[k]));
            est.put(p.id(), th == null ? null : th[k]);
            sc.put(p.id(), p.scale().token());
            bd.put(p.id(), new Bounds(p.lower(), p.upper()));
        }
        List<Start> st = new ArrayList<>();
        for (StartResult r : result.starts()) {
            st.add(new Start(r.index(), r.nll(), r.status().name(), r.termination() == null ? null
                    : r.termination().name(), r.iterations(), r.evaluations(), r.reason()));
        }
        return new FitSummary(absolute(problem.problemFile()), result.bestNll(), lin, est, sc, bd,
                result.startsNearBest(), FitResult.NEAR_BEST_TOLERANCE, result.failedCount(), st, settings,
                wallSeconds, versions, inputs);
    }

    /** {@code p} absolute and normalised, as paths are recorded (independent of the working directory). */
    private static String absolute(Path p) {
        return p.toAbsolutePath().normalize().toString();
    }

    /**
     * A file path recorded in {@code result.json} of fit directory {@code fitDir}, as a path to open. Paths are
     * recorded absolute; a relative one (written by older versions, relative to the working directory of the fit)
     * is tried relative to the working directory, then to the fit directory's parent (the usual working directory
     * of {@code fit --out NAME}), then to the fit directory itself. The first that exists wins; when none does,
     * the path as recorded.
     */
    public static Path resolveRecorded(Path fitDir, String recorded) {
        Path p = Path.of(recorded);
        if (p.isAbsolute() || Files.exists(p)) {
            return p;
        }
        Path dir = fitDir.toAbsolutePath().normalize();
        for (Path base : new Path[] {dir.getParent(), dir}) {
            if (base != null && Files.exists(base.resolve(p))) {
                return base.resolve(p);
            }
        }
        return p;
    }

    private static <V> Map<String, V> copy(Map<String, V> m) {
        return m == null ? Map.of() : java.util.Collections.unmodifiableMap(new LinkedHashMap<>(m));
    }

    /**
     * One start of the multistart run.
     *
     * @param index       start index (0-based; the random stream is derived from seed and index)
     * @param nll         final negative log-likelihood (NaN when failed)
     * @param status      outcome name, e.g. {@code CONVERGED}, {@code MAX_ITERATIONS}, {@code FAILED}
     * @param termination optimizer termination criterion name, or null
     * @param iterations  optimizer iterations
     * @param evaluations objective evaluations
     * @param reason      failure reason or null
     */
    @JsonInclude(JsonInclude.Include.ALWAYS)
    public record Start(int index, double nll, String status, String termination, int iterations, int evaluations,
                        String reason) {
        /** Whether the start failed (status {@code FAILED} or a non-finite value). */
        public boolean failed() {
            return "FAILED".equals(status) || !Double.isFinite(nll);
        }
    }

    /**
     * Run settings.
     *
     * @param starts       number of starts requested
     * @param seed         random seed
     * @param rtol         relative integration tolerance
     * @param atol         absolute integration tolerance
     * @param costTolerance relative cost-change tolerance of Levenberg-Marquardt (0: its default)
     * @param maxIterations iteration limit of Levenberg-Marquardt per start (0: its default)
     * @param nominalStart whether start 0 was the nominal parameter vector
     * @param closedFormFactors whether scaling factors of relative data were held at their closed-form conditional
     *                          optimum ({@code LevenbergMarquardt.withFactorProjection}); false in files written
     *                          before it existed, which were fitted without
     */
    public record Settings(int starts, long seed, double rtol, double atol, boolean nominalStart,
            double costTolerance, int maxIterations, boolean closedFormFactors) {
        /** Settings without explicit optimizer limits (recorded as 0: the optimizer's defaults). */
        public Settings(int starts, long seed, double rtol, double atol, boolean nominalStart) {
            this(starts, seed, rtol, atol, nominalStart, 0.0, 0, true);
        }
    }

    /**
     * Bounds of one parameter on the linear scale.
     *
     * @param lower lower bound
     * @param upper upper bound
     */
    public record Bounds(double lower, double upper) {
    }

    /**
     * An input file and its checksum.
     *
     * @param file   path as read
     * @param sha256 lower-case hexadecimal SHA-256 of its bytes
     */
    public record InputFile(String file, String sha256) {

        /**
         * The file named by {@code path} (recorded absolute and normalised, so the record does not depend on the
         * working directory) with the SHA-256 (FIPS 180-4) of its current bytes.
         *
         * @throws UserInputException when the file cannot be read
         */
        public static InputFile of(Path path) {
            return new InputFile(absolute(path), sha256(path));
        }

        /**
         * Lower-case hexadecimal SHA-256 of the file's bytes.
         *
         * @throws UserInputException when the file cannot be read
         */
        public static String sha256(Path path) {
            try (InputStream in = Files.newInputStream(path)) {
                MessageDigest md = MessageDigest.getInstance("SHA-256");
                byte[] buf = new byte[1 << 16];
                int k;
                while ((k = in.read(buf)) > 0) {
                    md.update(buf, 0, k);
                }
                return HexFormat.of().formatHex(md.digest());
            } catch (IOException e) {
                throw new UserInputException(SourceLocation.ofFile(path.toString()), "cannot be read for its "
                        + "checksum (" + e.getMessage() + "); check that it exists and is readable", e);
            } catch (NoSuchAlgorithmException e) {
                throw new IllegalStateException("SHA-256 is required of every Java runtime", e);
            }
        }
    }
}
