package org.switchfit.report;

import java.io.IOException;
import java.io.UncheckedIOException;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Optional;

/**
 * How many data points of each kind a fit used, counted from the residual tables the fit command writes beside
 * result.json: rows of {@value #RESIDUALS} (timecourse measurements) and rows of {@value #SWITCHING_RESIDUALS} by
 * their first column ({@code dose_response}, {@code threshold}). Immutable.
 *
 * @param timecourse   measurements of the measurement table (timecourses; PEtab steady-state rows too)
 * @param doseResponse steady-state dose-response points
 * @param thresholds   measured switching thresholds
 */
public record DataCounts(int timecourse, int doseResponse, int thresholds) {
    /** Residuals of the measurements, one row each after the header. */
    public static final String RESIDUALS = "residuals.csv";
    /** Residuals of thresholds and dose-response points, one row each after the header, kind in column 1. */
    public static final String SWITCHING_RESIDUALS = "switching_residuals.csv";

    /** The counts of the fit in {@code dir}; empty when neither table is there (no start succeeded, or no fit). */
    public static Optional<DataCounts> read(Path dir) {
        Path tc = dir.resolve(RESIDUALS);
        Path sw = dir.resolve(SWITCHING_RESIDUALS);
        if (!Files.isRegularFile(tc) && !Files.isRegularFile(sw)) {
            return Optional.empty();
        }
        int timecourse = Math.max(0, lines(tc).size() - 1);
        int dose = 0;
        int thresholds = 0;
        List<String> rows = lines(sw);
        for (int i = 1; i < rows.size(); i++) {
            String kind = rows.get(i).split(",", 2)[0];
            if (kind.equals("dose_response")) {
                dose++;
            } else if (kind.equals("threshold")) {
                thresholds++;
            }
        }
        return Optional.of(new DataCounts(timecourse, dose, thresholds));
    }

    private static List<String> lines(Path f) {
        if (!Files.isRegularFile(f)) {
            return List.of();
        }
        try {
            return Files.readAllLines(f, StandardCharsets.UTF_8).stream().filter(l -> !l.isBlank()).toList();
        } catch (IOException e) {
            throw new UncheckedIOException("cannot read " + f + ": " + e.getMessage(), e);
        }
    }

    /** The counts in words: "0 measurements, 4 dose-response points, 2 switching thresholds". */
    public String summary() {
        return String.format(Locale.ROOT, "%d measurement%s, %d dose-response point%s, %d switching threshold%s",
                timecourse, timecourse == 1 ? "" : "s", doseResponse, doseResponse == 1 ? "" : "s", thresholds,
                thresholds == 1 ? "" : "s");
    }
}
