/**
 * Profile likelihoods (Raue et al. 2009) for parameters; prediction profiles (Kreutz et al. 2012) for folds and observables; structural identifiability checks.
 *
 * <p>Entry points: {@link org.switchfit.profile.ProfileLikelihood#profileParameter},
 * {@link org.switchfit.profile.ProfileLikelihood#profilePrediction} (any
 * {@link org.switchfit.objective.Prediction}, e.g. a fold position or an observable at a time) and
 * {@link org.switchfit.profile.ProfileLikelihood#profileAll} (all free parameters as parallel tasks, with a
 * {@link org.switchfit.profile.ProfileListener} and resume); results are {@link org.switchfit.profile.Profile}
 * values with pointwise and simultaneous {@link org.switchfit.profile.ConfidenceInterval}s and an
 * {@link org.switchfit.profile.Identifiability} class. {@link org.switchfit.profile.JacobianRankCheck} gives the
 * numerical rank of the residual Jacobian and names the null-space combinations.
 *
 * <p>Layering: may import project packages {fit, objective, problem, continuation, util} only.
 */
package org.switchfit.profile;
