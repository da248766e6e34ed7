package org.switchfit.data;

import org.switchfit.util.SourceLocation;

/**
 * One measured value of a timecourse. Immutable.
 *
 * @param experiment experiment id
 * @param observable observable id
 * @param time       measurement time (model time units)
 * @param value      measured value
 * @param sigma      known standard deviation (or scale) of this point, NaN when not given; when given it takes
 *                   the place of the observable's noise-model spread for this point
 * @param location   file and line of the row
 */
public record TimecoursePoint(String experiment, String observable, double time, double value, double sigma,
        SourceLocation location) {
}
