package org.switchfit.objective;

/**
 * The model switching threshold (fold position) of one (experiment, control, direction) as a {@link Prediction}
 * of θ with its gradient, for prediction profiles (Kreutz et al. 2012, doi:10.1186/1752-0509-6-120). Same
 * definition and gradient as {@link ThresholdBlock} (fold ending the branch swept in the measured direction; the
 * steepest-response point where the model is monostable). Immutable and thread-safe.
 */
public final class FoldPrediction implements Prediction {
    private final LikelihoodObjective objective;
    private final ThresholdBlock block;

    FoldPrediction(LikelihoodObjective objective, ThresholdBlock block) {
        this.objective = objective;
        this.block = block;
    }

    @Override
    public int parameterCount() {
        return objective.parameterCount();
    }

    @Override
    public double evaluate(double[] theta, double[] gradient) {
        EvaluationContext ctx = new EvaluationContext(objective.problem(), theta, null, null);
        return block.threshold(ctx, gradient);
    }
}
