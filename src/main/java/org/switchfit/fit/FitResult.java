package org.switchfit.fit;

import java.util.List;

/**
 * The outcome of a multistart fit. Immutable value.
 *
 * @param parameterIds     parameter ids in θ order
 * @param scales           estimation scale of each parameter (θ is on these scales)
 * @param bestTheta        best θ on the estimation scale (null when every start failed)
 * @param bestNll          best NLL (NaN when every start failed)
 * @param starts           all starts sorted by {@link StartResult#BY_NLL}
 * @param startsNearBest   number of non-failed starts with NLL within {@link #NEAR_BEST_TOLERANCE} of the best
 * @param wallTimeMillis   wall-clock time of this run (excludes starts resumed from storage; not reproducible)
 */
public record FitResult(String[] parameterIds, ParameterScale[] scales, double[] bestTheta, double bestNll,
                        List<StartResult> starts, int startsNearBest, long wallTimeMillis) {

    /** NLL distance to the best that counts as "found the optimum again", 0.1 NLL units (common practice). */
    public static final double NEAR_BEST_TOLERANCE = 0.1;

    public FitResult {
        parameterIds = parameterIds.clone();
        scales = scales.clone();
        bestTheta = bestTheta == null ? null : bestTheta.clone();
        starts = List.copyOf(starts);
    }

    @Override
    public String[] parameterIds() {
        return parameterIds.clone();
    }

    @Override
    public ParameterScale[] scales() {
        return scales.clone();
    }

    /** Best θ on the linear scale (null when every start failed). */
    public double[] bestLinear() {
        if (bestTheta == null) {
            return null;
        }
        double[] out = new double[bestTheta.length];
        for (int k = 0; k < out.length; k++) {
            out[k] = scales[k].toLinear(bestTheta[k]);
        }
        return out;
    }

    @Override
    public double[] bestTheta() {
        return bestTheta == null ? null : bestTheta.clone();
    }

    /** Number of starts with status FAILED. */
    public int failedCount() {
        int c = 0;
        for (StartResult r : starts) {
            c += r.status() == StartStatus.FAILED ? 1 : 0;
        }
        return c;
    }
}
