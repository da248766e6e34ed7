package org.switchfit.cli;

import com.fasterxml.jackson.annotation.JsonProperty;
import java.util.List;
import org.switchfit.report.ProfileDiagnostics;
import org.switchfit.report.ProfilesFile;

/**
 * Content of {@code FITDIR/profiles.json} as written by {@code switchfit profile}, in exactly the shape of the report
 * schema {@link ProfilesFile} (so {@code switchfit report} reads it), with kind and class as plain strings. All
 * values of profiled quantities are on the LINEAR scale; open interval ends are null. Immutable.
 *
 * @param level       confidence level
 * @param bestNll     NLL at the recorded optimum, re-evaluated
 * @param profiles    one entry per profiled quantity
 * @param diagnostics thresholds, better-optimum flag, fold status and structural rank check
 */
record ProfilesJson(double level, double bestNll, List<Entry> profiles, ProfileDiagnostics diagnostics) {

    /**
     * One profile (fields as {@link ProfilesFile.Entry}).
     *
     * @param kind           parameter, fold or prediction
     * @param classification identifiable, practically-nonidentifiable or structurally-nonidentifiable
     * @param details        simultaneous interval, bounds class of folds and predictions, sides, compensations
     */
    record Entry(String id, String kind, String scale, double estimate, Double lower, Double upper,
                 double thresholdNll, @JsonProperty("class") String classification, List<String> compensating,
                 List<Point> points, ProfileDiagnostics.Entry details) {
    }

    /**
     * A profile point.
     *
     * @param value profiled quantity, linear scale
     * @param nll   minimised NLL there
     */
    record Point(double value, double nll) {
    }

    /**
     * What {@code FITDIR/profiles/KEY.json} holds for resume: the entry, the level it was computed at, and the
     * re-optimised parameters (linear) of each point, for the CSV.
     */
    record Stored(double level, Entry entry, List<String> parameterIds, List<double[]> pointParameters) {
    }
}
