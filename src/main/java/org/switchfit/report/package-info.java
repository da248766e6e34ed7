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
 * </ul>
 * All files are written atomically through {@code org.switchfit.util.AtomicFiles}. Nothing here prints or exits.
 *
 * <p>Layering: may import project packages {all packages above except cli} only.
 */
package org.switchfit.report;
