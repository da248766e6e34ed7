package org.switchfit.objective;

/**
 * The parameters lie outside the support of a uniform prior, where the prior density is 0 and the negative
 * log-likelihood +infinity (PEtab v1 parameter table, "uniform"): a point the objective cannot evaluate, so an
 * optimizer rejects the step; {@link LikelihoodObjective#evaluateDetailed} reports it as an infinite NLL instead.
 */
public final class PriorSupportException extends ObjectiveException {
    private static final long serialVersionUID = 1L;

    PriorSupportException(String message) {
        super(message);
    }
}
