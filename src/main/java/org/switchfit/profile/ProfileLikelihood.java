package org.switchfit.profile;

import java.util.ArrayList;
import java.util.Collection;
import java.util.Comparator;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;
import org.hipparchus.distribution.continuous.ChiSquaredDistribution;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.LocalFit;
import org.switchfit.fit.TaskExecutor;
import org.switchfit.objective.Prediction;

/**
 * Profile likelihoods of parameters (Raue et al. 2009, "Structural and practical identifiability analysis of
 * partially observed dynamical models by exploiting the profile likelihood", Bioinformatics 25(15):1923-1929,
 * doi:10.1093/bioinformatics/btp358) and of predictions (Kreutz, Raue and Timmer 2012, "Likelihood based
 * observability analysis and confidence intervals for predictions of dynamic models", BMC Syst Biol 6:120,
 * doi:10.1186/1752-0509-6-120).
 *
 * <p>For each profiled quantity both directions are traced from the optimum ({@link ProfileTracer}), the other
 * parameters re-optimised by the bounded {@link LevenbergMarquardt} with warm starts, until the likelihood ratio
 * {@code 2 (nll - nll*)} exceeds the larger of the pointwise threshold (χ² quantile, 1 dof) and the simultaneous
 * threshold (χ² quantile, #free-parameter dof), or a bound is hit. Interval ends are the refined crossings.
 * If any profile point has an NLL below nll* by more than {@link #withBetterOptimumTolerance the tolerance}, the
 * problem is re-fitted from there, the profile is flagged and restarted from the new optimum.
 *
 * <p>Classification: {@link Identifiability#STRUCTURALLY_NONIDENTIFIABLE} when no explored point rises above the
 * flatness tolerance (default 1e-5 in Δχ² units) and no side closes. Justification of the default: the LM stops
 * when the relative cost change is below 1e-14, so with costs up to 1e6 the re-optimised NLL is reproducible to
 * about 1e-8; an exactly compensated direction therefore shows Δχ² ≲ 1e-7, while any data that carry information
 * over a bounded range raise Δχ² far above 1e-5 (5 orders below the 95 % threshold 3.84). Objectives computed by
 * ODE integration at a loose tolerance can need a larger value.
 *
 * <p>Immutable and thread-safe; {@code withX} returns changed copies.
 */
public final class ProfileLikelihood {

    private final LevenbergMarquardt optimizer;
    private final double level;
    private final int maxSteps;
    private final double stepTarget;
    private final double flatTolerance;
    private final double betterTolerance;
    private final int maxRestarts;
    private final boolean simultaneous;

    private ProfileLikelihood(LevenbergMarquardt optimizer, double level, int maxSteps, double stepTarget,
                              double flatTolerance, double betterTolerance, int maxRestarts, boolean simultaneous) {
        this.optimizer = optimizer;
        this.level = level;
        this.maxSteps = maxSteps;
        this.stepTarget = stepTarget;
        this.flatTolerance = flatTolerance;
        this.betterTolerance = betterTolerance;
        this.maxRestarts = maxRestarts;
        this.simultaneous = simultaneous;
    }

    /**
     * Level 0.95; at most 100 accepted steps per side; target increase of √Δχ² per step 0.25
     * ({@link #withStepTarget}); flatness tolerance 1e-5 (Δχ²); better-optimum
     * tolerance 1e-4 NLL units (moves interval ends by about 1e-4 standard errors, below plotting resolution, and
     * well above the LM's convergence noise); at most 3 restarts.
     */
    public static ProfileLikelihood defaults() {
        return new ProfileLikelihood(LevenbergMarquardt.defaults(), 0.95, 100, 0.25, 1e-5, 1e-4, 3, true);
    }

    /** The LM used for the constrained re-optimisations and for re-fits from a better optimum. */
    public ProfileLikelihood withOptimizer(LevenbergMarquardt lm) {
        return new ProfileLikelihood(lm, level, maxSteps, stepTarget, flatTolerance, betterTolerance,
                maxRestarts, simultaneous);
    }

    /** Confidence level in (0, 1). */
    public ProfileLikelihood withLevel(double newLevel) {
        if (!(newLevel > 0 && newLevel < 1)) {
            throw new IllegalArgumentException("level must be in (0, 1), got " + newLevel);
        }
        return new ProfileLikelihood(optimizer, newLevel, maxSteps, stepTarget, flatTolerance, betterTolerance,
                maxRestarts, simultaneous);
    }

    /** Limit on accepted steps per side, n ≥ 1; a side stopped by it is {@link SideStatus#OPEN_STEP_LIMIT}. */
    public ProfileLikelihood withMaxSteps(int n) {
        if (n < 1) {
            throw new IllegalArgumentException("maxSteps must be >= 1, got " + n);
        }
        return new ProfileLikelihood(optimizer, level, n, stepTarget, flatTolerance, betterTolerance,
                maxRestarts, simultaneous);
    }

    /**
     * Target increase of the signed root {@code √Δχ²} per accepted step, in (0, 1]. The root is linear in the
     * profiled value for a quadratic profile, so a fixed target gives evenly spaced points: 0.25 reaches the
     * 95 % pointwise threshold (√3.84 = 1.96) in about 8 steps. Raue et al. 2009 bound the Δχ² increase instead;
     * that packs points ever more densely towards the threshold without improving the interval ends, which the
     * crossing refinement determines.
     */
    public ProfileLikelihood withStepTarget(double t) {
        if (!(t > 0 && t <= 1)) {
            throw new IllegalArgumentException("stepTarget must be in (0, 1], got " + t);
        }
        return new ProfileLikelihood(optimizer, level, maxSteps, t, flatTolerance, betterTolerance, maxRestarts,
                simultaneous);
    }

    /** Largest Δχ² for which a profile still counts as flat. */
    public ProfileLikelihood withFlatTolerance(double tol) {
        if (!(tol >= 0)) {
            throw new IllegalArgumentException("flatTolerance must be >= 0, got " + tol);
        }
        return new ProfileLikelihood(optimizer, level, maxSteps, stepTarget, tol, betterTolerance, maxRestarts,
                simultaneous);
    }

    /** NLL decrease below the optimum that triggers a restart. */
    public ProfileLikelihood withBetterOptimumTolerance(double tol) {
        if (!(tol > 0)) {
            throw new IllegalArgumentException("betterOptimumTolerance must be > 0, got " + tol);
        }
        return new ProfileLikelihood(optimizer, level, maxSteps, stepTarget, flatTolerance, tol, maxRestarts,
                simultaneous);
    }

    /**
     * Whether to trace each side up to the simultaneous threshold (default true). With false, sides stop above the
     * pointwise threshold, which saves most of the steps when there are many free parameters (χ²₃₀(0.95) ≈ 43.8
     * against 3.84), and the simultaneous interval is reported with NaN ends (not computed).
     */
    public ProfileLikelihood withSimultaneousIntervals(boolean on) {
        return new ProfileLikelihood(optimizer, level, maxSteps, stepTarget, flatTolerance, betterTolerance,
                maxRestarts, on);
    }

    /** The confidence level. */
    public double level() {
        return level;
    }

    /** The χ² quantile with {@code dof} degrees of freedom at the configured level. */
    public double threshold(int dof) {
        return new ChiSquaredDistribution(dof).inverseCumulativeProbability(level);
    }

    /**
     * Profiles parameter {@code index}.
     *
     * @param problem the problem (fixed parameters stay fixed)
     * @param optimum the fitted θ (estimation scale)
     * @param index   the profiled parameter, which must be free
     */
    public Profile profileParameter(FitProblem problem, double[] optimum, int index) {
        if (problem.isFixed(index)) {
            throw new IllegalArgumentException("parameter '" + problem.id(index) + "' is fixed; profile a free one");
        }
        return run(problem, optimum, new ProfileTarget.ParameterTarget(problem, index));
    }

    /**
     * Profiles a prediction g(θ) (Kreutz et al. 2012) by equality-constrained re-optimisation, see
     * {@link PredictionSlice} for the method and its accuracy.
     *
     * @param lowerLimit smallest g value to explore (may be -∞; then the step limit ends an open side)
     * @param upperLimit largest g value to explore (may be +∞)
     */
    public Profile profilePrediction(FitProblem problem, double[] optimum, Prediction g, String name,
                                     double lowerLimit, double upperLimit) {
        return run(problem, optimum, new ProfileTarget.PredictionTarget(problem, g, name, lowerLimit, upperLimit));
    }

    /**
     * Profiles every free parameter as an independent task on {@code executor}; results (in parameter order) do
     * not depend on the executor or thread count.
     *
     * @param listener told about each newly finished profile, or null
     * @param finished profiles finished by an earlier run (matched by parameter id); reused, not recomputed
     */
    public List<Profile> profileAll(FitProblem problem, double[] optimum, TaskExecutor executor,
                                    ProfileListener listener, Collection<Profile> finished) {
        Map<String, Profile> done = new HashMap<>();
        for (Profile p : finished) {
            done.put(p.name(), p);
        }
        List<Profile> out = new ArrayList<>();
        List<Callable<Profile>> tasks = new ArrayList<>();
        for (int k = 0; k < problem.parameterCount(); k++) {
            if (problem.isFixed(k)) {
                continue;
            }
            Profile d = done.get(problem.id(k));
            if (d != null) {
                out.add(d);
            } else {
                final int idx = k;
                tasks.add(() -> {
                    try {
                        return profileParameter(problem, optimum, idx);
                    } catch (RuntimeException e) {
                        // One failed profile is a result, not an abort: the others are kept.
                        return Profile.failed(problem.id(idx), idx, problem.clamp(optimum), level,
                                "profile failed: " + e.getMessage());
                    }
                });
            }
        }
        out.addAll(executor.runAll(tasks, listener == null ? null : (i, p) -> listener.profileFinished(p)));
        out.sort(Comparator.comparingInt(Profile::parameterIndex));
        return out;
    }

    private Profile run(FitProblem problem, double[] optimum, ProfileTarget target) {
        double q1 = threshold(1);
        double qn = threshold(Math.max(1, problem.freeCount()));
        double stop = simultaneous ? Math.max(q1, qn) : q1;
        double[] theta = problem.clamp(optimum);
        int restarts = 0;
        int solves = 0;
        boolean better = false;
        double tolerance = betterTolerance;
        while (true) {
            double nllStar = nll(problem, theta);
            LocalCurvature curv = new LocalCurvature(problem, theta, 1e-10);
            double[] e = target.gradient(theta);
            double[] he = curv.covarianceTimes(e);
            double var = 0;
            for (int k = 0; k < e.length; k++) {
                var += e[k] * he[k];
            }
            double sigmaZ = var > 0 ? Math.sqrt(var) : Double.NaN;
            double[] slope0 = new double[e.length];
            if (var > 0) {
                for (int k = 0; k < e.length; k++) {
                    slope0[k] = he[k] / var;
                }
            }
            target.fixSlope(slope0);
            Slice slice = target.slice(optimizer, sigmaZ, theta);
            double maxStep = target.maxStep(sigmaZ, theta);
            double step0 = target.firstStep(sigmaZ * stepTarget, maxStep, theta);
            ProfilePoint p0 = new ProfilePoint(target.value(theta), nllStar, theta);
            ProfileTracer tracer = new ProfileTracer(slice, nllStar, stepTarget, stop, maxSteps, tolerance);
            ProfileTracer.Side lower;
            ProfileTracer.Side upper;
            try {
                lower = tracer.trace(p0, -1, step0, maxStep, slope0);
                upper = tracer.trace(p0, +1, step0, maxStep, slope0);
            } catch (ProfileTracer.BetterOptimumFound b) {
                solves += slice.solves();
                better = true;
                restarts++;
                LocalFit f = optimizer.minimize(problem, b.point.theta());
                theta = f.nll() < b.point.nll() ? f.theta() : b.point.theta();
                if (restarts >= maxRestarts) {
                    tolerance = Double.POSITIVE_INFINITY;
                }
                continue;
            }
            List<ProfilePoint> extra = new ArrayList<>();
            double lo1 = tracer.crossing(p0, lower.points, q1, extra);
            double hi1 = tracer.crossing(p0, upper.points, q1, extra);
            double loN = simultaneous ? tracer.crossing(p0, lower.points, qn, extra) : Double.NaN;
            double hiN = simultaneous ? tracer.crossing(p0, upper.points, qn, extra) : Double.NaN;
            solves += slice.solves();
            List<ProfilePoint> pts = new ArrayList<>();
            pts.add(p0);
            pts.addAll(lower.points);
            pts.addAll(upper.points);
            pts.addAll(extra);
            pts.sort(Comparator.comparingDouble(ProfilePoint::value));
            ConfidenceInterval ci1 = interval(target, 1, q1, lo1, hi1);
            ConfidenceInterval ciN = simultaneous
                    ? interval(target, Math.max(1, problem.freeCount()), qn, loN, hiN)
                    : new ConfidenceInterval(level, Math.max(1, problem.freeCount()), qn, Double.NaN, Double.NaN,
                            Double.NaN, Double.NaN);
            double maxD = 0;
            for (ProfilePoint p : pts) {
                maxD = Math.max(maxD, p.deltaChi2(nllStar));
            }
            Identifiability cls;
            if (maxD <= flatTolerance && lower.status != SideStatus.CLOSED && upper.status != SideStatus.CLOSED) {
                cls = Identifiability.STRUCTURALLY_NONIDENTIFIABLE;
            } else if (ci1.closed()) {
                cls = Identifiability.IDENTIFIABLE;
            } else {
                cls = Identifiability.PRACTICALLY_NONIDENTIFIABLE;
            }
            String msg = (lower.message + " " + upper.message).trim();
            return new Profile(target.name(), target.index(), p0.value(), nllStar, theta, pts, ci1, ciN,
                    lower.status, upper.status, cls, compensations(problem, target.index(), pts), better, restarts,
                    solves, msg);
        }
    }

    private ConfidenceInterval interval(ProfileTarget target, int dof, double q, double lo, double hi) {
        double l = Double.isNaN(lo) ? Double.NEGATIVE_INFINITY : lo;
        double u = Double.isNaN(hi) ? Double.POSITIVE_INFINITY : hi;
        return new ConfidenceInterval(level, dof, q, l, u, target.toLinear(l), target.toLinear(u));
    }

    private static List<Compensation> compensations(FitProblem problem, int index, List<ProfilePoint> pts) {
        List<Compensation> out = new ArrayList<>();
        int n = problem.parameterCount();
        double mz = 0;
        for (ProfilePoint p : pts) {
            mz += p.value();
        }
        mz /= pts.size();
        double szz = 0;
        for (ProfilePoint p : pts) {
            szz += (p.value() - mz) * (p.value() - mz);
        }
        if (!(szz > 0)) {
            return out;
        }
        for (int j = 0; j < n; j++) {
            if (j == index || problem.isFixed(j)) {
                continue;
            }
            double mj = 0;
            double min = Double.POSITIVE_INFINITY;
            double max = Double.NEGATIVE_INFINITY;
            for (ProfilePoint p : pts) {
                double v = p.theta()[j];
                mj += v;
                min = Math.min(min, v);
                max = Math.max(max, v);
            }
            mj /= pts.size();
            // Movements below 1e-9 relative are LM convergence noise, not compensation.
            if (max - min <= 1e-9 * (1 + Math.abs(mj))) {
                continue;
            }
            double szj = 0;
            for (ProfilePoint p : pts) {
                szj += (p.value() - mz) * (p.theta()[j] - mj);
            }
            out.add(new Compensation(problem.id(j), szj / szz, min, max));
        }
        out.sort(Comparator.comparingDouble((Compensation c) -> -Math.abs(c.slope())));
        return out;
    }

    private static double nll(FitProblem problem, double[] theta) {
        double[] r = new double[problem.objective().residualCount()];
        return problem.objective().evaluate(theta, r, null);
    }
}
