/**
 * JSON, CSV and HTML/SVG output from result values; atomic writes.
 *
 * <ul>
 *   <li>Figures: {@link org.switchfit.report.Figure} (panels in a grid, rendered to a self-contained SVG string)
 *       made of {@link org.switchfit.report.Plot} panels with {@link org.switchfit.report.Axis} (linear or log10;
 *       ticks by {@link org.switchfit.report.Ticks}, after Heckbert 1990) and {@link org.switchfit.report.Series}
 *       (lines, markers with error bars, bands, polygons, reference lines, notes). Colours from
 *       {@link org.switchfit.report.Palette} (Okabe and Ito 2008). Ready-made panels in
 *       {@link org.switchfit.report.Charts}.</li>
 *   <li>Pages: {@link org.switchfit.report.HtmlReport} (one self-contained HTML file) with
 *       {@link org.switchfit.report.Table}.</li>
 *   <li>Data files: {@link org.switchfit.report.Json} (mapper conventions; NaN and infinities as null),
 *       {@link org.switchfit.report.Csv}, and {@link org.switchfit.report.ResultStore} (one JSON file per finished
 *       task, for resuming runs).</li>
 *   <li>Fit directories: {@link org.switchfit.report.FitDirectory} reads and writes the JSON files listed in
 *       {@link org.switchfit.report.FitFile} as immutable records that writers and the report share:
 *       {@link org.switchfit.report.FitSummary} ({@code result.json}), {@link org.switchfit.report.TrajectoriesFile},
 *       {@link org.switchfit.report.ProfilesFile}, {@link org.switchfit.report.BranchesFile},
 *       {@link org.switchfit.report.RegionFile}, {@link org.switchfit.report.SweepFile} and
 *       {@link org.switchfit.report.PhasePlaneFile}. Unknown fields fail the read; a missing or malformed file is a
 *       one-line {@code UserInputException} naming the file and the command that writes it.
 *       {@link org.switchfit.report.FittedTrajectories} and {@link org.switchfit.report.PhasePlanes} compute the
 *       content of {@code trajectories.json} and {@code phaseplane.json} from the fitted model;
 *       {@link org.switchfit.report.FitReport} turns a directory into one HTML page without recomputing
 *       anything.</li>
 * </ul>
 * All files are written atomically through {@code org.switchfit.util.AtomicFiles}. Nothing here prints or exits.
 *
 * <p>Layering: may import project packages {all packages above except cli} only.
 */
package org.switchfit.report;
