package org.switchfit.cli;

import com.fasterxml.jackson.databind.JsonNode;
import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.Locale;
import org.switchfit.fit.FitProblem;
import org.switchfit.objective.LikelihoodObjective;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.report.FitSummary;
import org.switchfit.report.Json;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * A finished fit read back from {@code FITDIR/result.json} (written by {@code switchfit fit}): the problem is
 * reloaded from its recorded path, the objective rebuilt with the recorded integration tolerances, and the
 * recorded optimum θ* (estimation scale) taken as the starting point. Immutable.
 *
 * @param dir          the fit directory
 * @param problem      the reloaded problem
 * @param settings     integration settings of the fit
 * @param objective    the rebuilt objective
 * @param fitProblem   bounds and scales as in the fit
 * @param optimum      recorded θ* in θ order
 * @param recordedNll  the NLL recorded in result.json
 * @param nllAtOptimum the NLL re-evaluated at θ* now
 */
record FitDirectoryInput(Path dir, EstimationProblem problem, SolverSettings settings, LikelihoodObjective objective,
                         FitProblem fitProblem, double[] optimum, double recordedNll, double nllAtOptimum) {

    /**
     * Reads {@code dir/result.json}.
     *
     * @throws UserInputException when the directory or file is missing or unreadable, holds no successful fit, or its
     *                            problem cannot be loaded
     */
    static FitDirectoryInput load(Path dir) {
        Path result = dir.resolve("result.json");
        if (!Files.isDirectory(dir)) {
            throw new UserInputException(SourceLocation.ofFile(dir.toString()), "is not a fit directory (it does not"
                    + " exist or is not a folder); give the --out folder of a finished 'switchfit fit' run");
        }
        if (!Files.isRegularFile(result)) {
            throw new UserInputException(SourceLocation.ofFile(result.toString()), "not found; give the --out folder "
                    + "of a finished 'switchfit fit' run");
        }
        JsonNode root;
        try {
            root = Json.mapper().readTree(result.toFile());
        } catch (IOException e) {
            throw new UserInputException(SourceLocation.ofFile(result.toString()), "is not valid JSON ("
                    + e.getMessage().lines().findFirst().orElse("") + "); re-run 'switchfit fit' into this folder", e);
        }
        JsonNode prob = root.get("problem");
        JsonNode est = root.get("parametersEstimationScale");
        JsonNode best = root.get("bestNll");
        if (prob == null || !prob.isTextual() || est == null || !est.isObject()) {
            throw new UserInputException(SourceLocation.ofFile(result.toString()), "lacks 'problem' or "
                    + "'parametersEstimationScale'; it was not written by 'switchfit fit': re-run the fit");
        }
        if (best == null || !best.isNumber()) {
            throw new UserInputException(SourceLocation.ofFile(result.toString()), "records no successful start (best"
                    + " NLL is null); re-run 'switchfit fit' with more starts or other bounds before profiling");
        }
        EstimationProblem problem = ProblemLoader.load(resolveProblem(dir, result, prob.asText()));
        JsonNode st = root.path("settings");
        double rtol = st.path("rtol").asDouble(1e-8);
        double atol = st.path("atol").asDouble(1e-12);
        SolverSettings settings = SimulateCommand.settings("bdf", rtol, atol);
        LikelihoodObjective objective = LikelihoodObjective.of(problem, settings);
        FitProblem fp = FitCommand.fitProblem(problem, objective);
        double[] theta = new double[problem.parameterCount()];
        for (int k = 0; k < theta.length; k++) {
            String id = problem.parameters().get(k).id();
            JsonNode v = est.get(id);
            if (v == null || !v.isNumber()) {
                throw new UserInputException(SourceLocation.ofFile(result.toString()).withElement(id), "has no "
                        + "estimate for parameter '" + id + "' of the problem; the problem changed since the fit: "
                        + "re-run 'switchfit fit'");
            }
            theta[k] = v.asDouble();
        }
        double nll = objective.evaluate(theta, new double[objective.residualCount()], null);
        return new FitDirectoryInput(dir, problem, settings, objective, fp, theta, best.asDouble(), nll);
    }

    /**
     * The problem file a fit directory's {@code result.json} names (as {@link #load} resolves it), without loading
     * the problem.
     *
     * @throws UserInputException when result.json is missing, unreadable or names no existing problem file
     */
    static Path problemFile(Path dir) {
        Path result = dir.resolve("result.json");
        JsonNode prob;
        try {
            prob = Json.mapper().readTree(result.toFile()).get("problem");
        } catch (IOException e) {
            throw new UserInputException(SourceLocation.ofFile(result.toString()), "cannot be read ("
                    + e.getMessage().lines().findFirst().orElse("") + "); give the --out folder of a finished "
                    + "'switchfit fit' run", e);
        }
        if (prob == null || !prob.isTextual()) {
            throw new UserInputException(SourceLocation.ofFile(result.toString()), "lacks 'problem'; it was not "
                    + "written by 'switchfit fit': re-run the fit");
        }
        return resolveProblem(dir, result, prob.asText());
    }

    /** The recorded problem path, resolved as {@link FitSummary#resolveRecorded} does. */
    private static Path resolveProblem(Path dir, Path result, String recorded) {
        Path problemFile = FitSummary.resolveRecorded(dir, recorded);
        if (!Files.exists(problemFile)) {
            throw new UserInputException(SourceLocation.ofFile(result.toString()), "names problem file '"
                    + recorded + "', which does not exist" + (Path.of(recorded).isAbsolute() ? "" : " (relative to "
                    + "the working directory, the fit directory's parent or the fit directory)") + "; restore the "
                    + "file, or run from the folder the fit ran in");
        }
        return problemFile;
    }

    /** Whether the re-evaluated NLL differs from the recorded one by more than 1e-6 relative (+1e-6 absolute). */
    boolean nllChanged() {
        return !(Math.abs(nllAtOptimum - recordedNll) <= 1e-6 * (1 + Math.abs(recordedNll)));
    }

    /** One-line description of an NLL mismatch. */
    String nllChangeMessage() {
        return String.format(Locale.ROOT, "the NLL at the recorded optimum is now %.10g, but %.10g was recorded: the "
                + "problem files or tolerances changed since the fit", nllAtOptimum, recordedNll);
    }
}
