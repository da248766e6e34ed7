package org.switchfit.objective;

import java.util.Iterator;
import java.util.LinkedHashMap;
import java.util.Optional;
import java.util.ServiceLoader;

/**
 * Supplier of fold-position predictions: for each switching threshold of each condition of a problem, the
 * control-parameter value of the fold (saddle-node) as a {@link Prediction} of θ with its exact gradient, so the
 * fold position can be profiled like any other prediction (Kreutz et al. 2012, doi:10.1186/1752-0509-6-120).
 *
 * <p>Implementations register through {@link ServiceLoader} (a line with the implementing class name in
 * {@code META-INF/services/org.switchfit.objective.FoldPredictionSource}); {@link #find()} returns the first one, or
 * empty when the build has none, in which case callers must say that fold profiles are not available rather than
 * approximate them. Implementations are thread-safe.
 */
public interface FoldPredictionSource {

    /**
     * The fold positions of every threshold of every condition of the objective's problem, keyed by a fold id
     * that is stable between runs (iteration order is the order to report them in).
     *
     * @throws org.switchfit.util.UserInputException when the problem has no thresholds or they cannot be posed
     */
    LinkedHashMap<String, Prediction> foldPredictions(LikelihoodObjective objective);

    /** The registered implementation, if this build has one. */
    static Optional<FoldPredictionSource> find() {
        Iterator<FoldPredictionSource> it = ServiceLoader.load(FoldPredictionSource.class,
                FoldPredictionSource.class.getClassLoader()).iterator();
        return it.hasNext() ? Optional.of(it.next()) : Optional.empty();
    }
}
