package org.switchfit.objective;

import java.util.LinkedHashMap;
import java.util.Map;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * The {@link FoldPredictionSource} of this build: one {@link FoldPrediction} per (experiment, control, direction)
 * of the problem's measured switching thresholds, keyed {@code experiment/control/up} or {@code .../down}.
 * Registered through {@code META-INF/services}. Stateless and thread-safe.
 */
public final class FoldPredictions implements FoldPredictionSource {

    /** For the service loader. */
    public FoldPredictions() {
    }

    @Override
    public LinkedHashMap<String, Prediction> foldPredictions(LikelihoodObjective objective) {
        LinkedHashMap<String, ThresholdBlock> blocks = SwitchingBlocks.thresholds(objective.problem());
        if (blocks.isEmpty()) {
            throw new UserInputException(SourceLocation.ofFile(objective.problem().problemFile().toString()),
                    "has no switching thresholds, so there are no fold positions to profile; add thresholds under "
                    + "data or drop --folds");
        }
        LinkedHashMap<String, Prediction> out = new LinkedHashMap<>();
        for (Map.Entry<String, ThresholdBlock> e : blocks.entrySet()) {
            out.put(e.getKey(), new FoldPrediction(objective, e.getValue()));
        }
        return out;
    }
}
