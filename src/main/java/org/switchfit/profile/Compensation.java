package org.switchfit.profile;

/**
 * A parameter that moves along a profile, compensating the profiled quantity.
 *
 * @param parameterId the moving parameter
 * @param slope       least-squares slope dθ_j / d(profiled value) over the profile points (estimation scale)
 * @param min         smallest θ_j along the profile
 * @param max         largest θ_j along the profile
 */
public record Compensation(String parameterId, double slope, double min, double max) {
}
