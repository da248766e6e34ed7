package org.switchfit.data;

import org.switchfit.util.SourceLocation;

/**
 * A parameter to estimate: its bounds and start value (linear scale), the scale the optimizer works on and an
 * optional prior. Immutable; instances read from files satisfy {@code lower < upper},
 * {@code lower <= start <= upper}, all finite, and {@code lower > 0} on log scales.
 *
 * @param id       parameter id (model parameter, or a data-side parameter such as a noise sigma)
 * @param lower    lower bound, linear scale
 * @param upper    upper bound, linear scale
 * @param scale    estimation scale
 * @param start    start value, linear scale
 * @param prior    prior distribution, or null for none
 * @param location where it was declared (may be null for parameters built in code)
 */
public record EstimatedParameter(String id, double lower, double upper, ParameterScale scale, double start,
        Prior prior, SourceLocation location) {
}
