package org.switchfit.profile;

import java.util.List;

/**
 * Numerical rank of the residual Jacobian (free parameters) at one point: local structural identifiability.
 *
 * @param theta          the point (estimation scale)
 * @param singularValues singular values of J, descending
 * @param rank           number of singular values above {@code relativeTolerance · s_max}
 * @param freeCount      number of free parameters; full rank means rank == freeCount
 * @param relativeTolerance the relative tolerance used
 * @param nullSpace      directions for the dropped singular values
 */
public record RankReport(double[] theta, double[] singularValues, int rank, int freeCount,
                         double relativeTolerance, List<NullDirection> nullSpace) {

    public RankReport {
        theta = theta.clone();
        singularValues = singularValues.clone();
        nullSpace = List.copyOf(nullSpace);
    }

    @Override
    public double[] theta() {
        return theta.clone();
    }

    @Override
    public double[] singularValues() {
        return singularValues.clone();
    }

    /** True when every free parameter is locally identifiable at this point. */
    public boolean fullRank() {
        return rank == freeCount;
    }
}
