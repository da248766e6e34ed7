/**
 * Profile likelihoods (Raue et al. 2009) for parameters; prediction profiles (Kreutz et al. 2012) for folds and observables; structural identifiability checks.
 *
 * <p>Layering: may import project packages {fit, objective, problem, continuation, util} only.
 */
package org.switchfit.profile;
