package org.switchfit.profile;

import java.util.List;

/**
 * A likelihood profile of one parameter or derived quantity (Raue et al. 2009, doi:10.1093/bioinformatics/btp358;
 * Kreutz et al. 2012, doi:10.1186/1752-0509-6-120 for predictions). Immutable value.
 *
 * @param name              parameter id or prediction name
 * @param parameterIndex    index of the profiled parameter, or -1 for a prediction profile
 * @param optimumValue      value of the profiled quantity at the optimum used
 * @param optimumNll        NLL at the optimum used (after any restart from a better optimum)
 * @param optimumTheta      the optimum used (estimation scale)
 * @param points            profile points sorted by value (includes the optimum and the refined crossings)
 * @param pointwise         interval at the 1-dof chi-square threshold
 * @param simultaneous      interval at the #free-parameters-dof threshold
 * @param lowerSide         how the side towards smaller values ended
 * @param upperSide         how the side towards larger values ended
 * @param identifiability   classification
 * @param compensations     parameters moving along the profile, largest |slope| first
 * @param betterOptimumFound true when the profile found an NLL lower than the given optimum by more than the
 *                          tolerance and was restarted from there
 * @param restarts          number of such restarts
 * @param solves            number of constrained re-optimisations performed
 * @param message           diagnostic text for FAILED sides, otherwise empty
 */
public record Profile(String name, int parameterIndex, double optimumValue, double optimumNll,
                      double[] optimumTheta, List<ProfilePoint> points, ConfidenceInterval pointwise,
                      ConfidenceInterval simultaneous, SideStatus lowerSide, SideStatus upperSide,
                      Identifiability identifiability, List<Compensation> compensations,
                      boolean betterOptimumFound, int restarts, int solves, String message) {

    public Profile {
        optimumTheta = optimumTheta.clone();
        points = List.copyOf(points);
        compensations = List.copyOf(compensations);
    }

    @Override
    public double[] optimumTheta() {
        return optimumTheta.clone();
    }

    /**
     * A profile that could not be computed at all (for example the objective fails at the optimum): both sides
     * {@link SideStatus#FAILED}, intervals open, classified practically non-identifiable, with the reason.
     */
    public static Profile failed(String name, int parameterIndex, double[] theta, double level, String message) {
        double inf = Double.POSITIVE_INFINITY;
        ConfidenceInterval open = new ConfidenceInterval(level, 1, Double.NaN, -inf, inf, Double.NaN, Double.NaN);
        double z = parameterIndex >= 0 ? theta[parameterIndex] : Double.NaN;
        return new Profile(name, parameterIndex, z, Double.NaN, theta, List.of(), open, open, SideStatus.FAILED,
                SideStatus.FAILED, Identifiability.PRACTICALLY_NONIDENTIFIABLE, List.of(), false, 0, 0, message);
    }

    /** True when a side failed (see {@link #message()}). */
    public boolean hasFailure() {
        return lowerSide == SideStatus.FAILED || upperSide == SideStatus.FAILED;
    }

    /** Largest likelihood-ratio statistic {@code 2 (nll - nll*)} over the points. */
    public double maxDeltaChi2() {
        double mx = 0;
        for (ProfilePoint p : points) {
            mx = Math.max(mx, p.deltaChi2(optimumNll));
        }
        return mx;
    }
}
