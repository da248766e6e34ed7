/**
 * Levenberg-Marquardt with bounds, multistart, fit results.
 *
 * <p>Layering: may import project packages {objective, problem, util} only.
 */
package org.switchfit.fit;
