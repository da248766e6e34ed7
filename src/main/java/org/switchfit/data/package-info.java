/**
 * Measurement data, thresholds, conditions and noise specifications as parsed from files; not yet tied to a model.
 *
 * <p>Entry points:
 * <ul>
 *   <li>{@link org.switchfit.data.ProblemFileReader#read(java.nio.file.Path)}: switchfit's own YAML problem format
 *       ({@code docs/problem-format.md}) and its CSV data tables, validated, as a
 *       {@link org.switchfit.data.SwitchfitProblem}; {@link org.switchfit.data.ProblemFileWriter} writes one.</li>
 *   <li>{@link org.switchfit.data.PetabReader#read(java.nio.file.Path)}: PEtab v1 problems as a
 *       {@link org.switchfit.data.PetabProblem}; single tables and simulated-data tables via its other methods.</li>
 *   <li>{@link org.switchfit.data.DelimitedReader} / {@link org.switchfit.data.DelimitedWriter}: CSV/TSV with
 *       quoting, comments and line numbers; {@link org.switchfit.data.DataNumbers} for nan/inf.</li>
 * </ul>
 * All values are immutable and carry {@link org.switchfit.util.SourceLocation}s; user errors are one-line
 * {@link org.switchfit.util.UserInputException}s naming file, line (and column) and the fix.
 *
 * <p>Layering: may import project packages {util} only.
 */
package org.switchfit.data;
