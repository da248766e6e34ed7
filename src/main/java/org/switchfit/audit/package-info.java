/**
 * The reviewer's audit of a fit directory: every claim a fit makes (its inputs, its optimum, its profile intervals,
 * its thresholds) re-derived from the model and data on disk, with a verdict and the numbers behind it. Entry point
 * {@link org.switchfit.audit.FitAudit}; the outcome is a list of {@link org.switchfit.audit.Claim}s.
 *
 * <p>Layering: may import report, profile, fit, objective, problem, data, util (DEVELOPERS.md). Nothing here prints
 * or exits.
 */
package org.switchfit.audit;
