/**
 * Levenberg-Marquardt with bounds, multistart, fit results.
 *
 * <p>Entry points: {@link org.switchfit.fit.FitProblem} (objective, ids, bounds and scales on the estimation
 * scale, fixed mask), {@link org.switchfit.fit.LevenbergMarquardt#minimize} (one bounded local fit, returns a
 * {@link org.switchfit.fit.LocalFit}), {@link org.switchfit.fit.Multistart#run} (seeded Latin-hypercube or Sobol
 * starts as tasks on a {@link org.switchfit.fit.TaskExecutor}, with a {@link org.switchfit.fit.StartListener}
 * and resume from finished {@link org.switchfit.fit.StartResult}s; returns a {@link org.switchfit.fit.FitResult}).
 * Results never depend on the thread count.
 *
 * <p>Layering: may import project packages {objective, problem, util} only.
 */
package org.switchfit.fit;
