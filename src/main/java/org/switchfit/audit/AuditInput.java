package org.switchfit.audit;

import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.switchfit.fit.FitProblem;
import org.switchfit.objective.Prediction;
import org.switchfit.report.BranchesFile;
import org.switchfit.report.FitSummary;
import org.switchfit.report.ProfilesFile;

/**
 * What the audit reads: the files of a fit directory, and the problem rebuilt from the model and data on disk.
 * Immutable apart from the arrays and predictions it was given (not copied deeply; do not change them).
 *
 * @param fitDir         the fit directory (recorded relative input paths are also tried against its parent)
 * @param summary        {@code result.json}
 * @param fitProblem     the problem rebuilt from the files on disk, with the fit's bounds, scales and tolerances
 * @param optimum        the recorded optimum θ* on the estimation scale, in the order of {@code fitProblem}
 * @param currentInputs  the files the problem reads now
 * @param profiles       {@code profiles.json}, or null when the directory has none
 * @param storedProfiles the stored profiles of {@code profiles/} by profile id (may be empty): their points'
 *                       parameters serve as warm starts
 * @param branches       {@code branches.json}, or null
 * @param folds          the problem's fold positions (switching thresholds of the model) as predictions of θ,
 *                       keyed {@code experiment/control/up|down} as the fold profiles in {@code profiles.json}
 * @param predictions    observable predictions of the prediction profiles in {@code profiles.json}, by profile id
 */
public record AuditInput(Path fitDir, FitSummary summary, FitProblem fitProblem, double[] optimum,
                         List<Path> currentInputs, ProfilesFile profiles, Map<String, ProfilesFile.Stored>
                                 storedProfiles, BranchesFile branches, Map<String, Prediction> folds,
                         Map<String, Prediction> predictions) {

    /** Copies the collections (null becomes empty). */
    public AuditInput {
        optimum = optimum.clone();
        currentInputs = currentInputs == null ? List.of() : List.copyOf(currentInputs);
        storedProfiles = storedProfiles == null ? Map.of() : new LinkedHashMap<>(storedProfiles);
        folds = folds == null ? Map.of() : new LinkedHashMap<>(folds);
        predictions = predictions == null ? Map.of() : new LinkedHashMap<>(predictions);
    }

    /** Key of a stored profile in {@link #storedProfiles}: kind token, a space, the profile id. */
    public static String storedKey(ProfilesFile.Kind kind, String id) {
        return kind.token() + " " + id;
    }

    @Override
    public double[] optimum() {
        return optimum.clone();
    }
}
