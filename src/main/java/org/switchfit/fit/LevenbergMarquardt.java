package org.switchfit.fit;

import java.util.Locale;
import org.switchfit.objective.Objective;
import org.switchfit.objective.ObjectiveException;

/**
 * Levenberg-Marquardt for box-constrained nonlinear least squares: a projected, active-set variant.
 *
 * <p>Each iteration computes the gradient g = Jᵀr of the cost ½|r|², holds every free parameter that sits on a
 * bound with the gradient pushing outward (the binding set), and solves the damped Gauss-Newton subproblem
 * {@code min |J_W δ + r|² + λ |D_W δ|²} on the remaining working set W by Householder QR of the augmented matrix
 * {@code [J_W; √λ D_W]} (no normal equations, so ill-conditioned problems keep their accuracy; see below for the
 * augmented model used on large-residual problems). The trial point is
 * the projection {@code P(θ + δ)} onto the box; the step is accepted when the actual reduction is at least 1e-4
 * of the reduction predicted by the model for the projected step. D holds the current Euclidean column norms of J
 * (Marquardt's 1963 scaling, which makes the step invariant under rescaling of θ; Moré 1978, "The
 * Levenberg-Marquardt algorithm: implementation and theory", Lecture Notes in Mathematics 630,
 * doi:10.1007/BFb0067700, discusses both this and the non-decreasing variant). The non-decreasing variant is not
 * used: when a start has tiny noise spreads the early column norms are orders of magnitude above the later ones,
 * and keeping them froze the damping of those directions, so such starts crawled for hundreds of iterations
 * (measured on the PEtab benchmark Boehm_JProteomeRes2014: 8 of 20 starts hit 1000 iterations, none with this
 * scaling). λ follows Nielsen's update (Nielsen 1999, "Damping parameter in Marquardt's method", IMM-REP-1999-05,
 * DTU): λ ← λ·max(1/3, 1-(2ρ-1)³) on success, λ ← λ·ν, ν ← 2ν on failure. As λ grows the step tends to the
 * scaled negative gradient restricted to W, whose projection is a descent direction, so a non-stationary point
 * always yields an acceptable step for large enough λ.
 *
 * <p>Bounds and steps: a parameter on a bound leaves the working set also when the damped step on the working set
 * would push it outward (its gradient component can point inward while the coupled step points out); the step is
 * then recomputed without it, so projection acts only on interior parameters that cross a bound (choosing the
 * bound-held set from the step as well as from the gradient is common practice in active-set methods). Each trial
 * step is also confined to a box of relative half-width Δ around θ, in units of each parameter's range
 * {@code hi - lo} (a rectangular trust region, as in Voglis and Lagaris 2004, "A rectangular trust region dogleg
 * approach for unconstrained and bound constrained nonlinear optimization", WSEAS Int. Conf. on Applied
 * Mathematics): Δ starts unbounded, a rejected step sets Δ to half that step's largest relative component, and an
 * accepted step with gain ratio ρ &gt; 0.25 lets Δ grow to twice its largest component (unbounded again at 1).
 * Why: the scaling by column norms leaves parameters with nearly zero Jacobian columns (a rate in a saturated
 * regime) almost undamped, so every damped step moved them by decades and projected them onto a bound
 * however large λ grew; measured on the PEtab benchmarks, such starts ended with {@link Termination#NO_PROGRESS}
 * at NLL 1e9-1e20 (2 of 20 Boehm_JProteomeRes2014 starts, most Brannmark_JBC2010 starts). With both changes
 * 97-99 of 100 uniform Boehm starts stop by the cost-change test (79 before), in 41-46 instead of 65 iterations on
 * average.
 *
 * <p>Large residuals: Gauss-Newton drops the second-order term Σ r_i ∇²r_i of the Hessian, which is not small
 * when residuals stay large at the optimum (the log-σ residuals of estimated noise spreads never vanish), and then
 * converges only linearly. By default the run also keeps the secant approximation S of that term
 * ({@link SecantModel}, Dennis, Gay and Welsch 1981) and, as in their algorithm, uses the augmented model
 * {@code JᵀJ + S} (solved by Cholesky of {@code J_WᵀJ_W + S_WW + λ D_W²}) for the next step whenever it predicted
 * the reduction of the last accepted step better than Gauss-Newton did; otherwise the QR Gauss-Newton step.
 *
 * <p>Output factors: parameters that enter only as a factor of predictions with a constant noise spread (the
 * scaling of relative data, {@link org.switchfit.objective.Objective#outputFactors()}) are set to their closed-form
 * conditional optimum after every evaluation, at trial points too, so all costs compared are those of the
 * functional with the factors optimised out (variable projection, Golub and Pereyra 1973); with the Jacobian the
 * rows are updated exactly, without another evaluation. Why: on the log scale a factor that is decades off moves
 * by at most about 1/ln 10 decades per Gauss-Newton step (the linear model of s g in log s), and meanwhile the other
 * parameters follow wrong residual weights; measured on the PEtab problem Fujita_SciSignal2010 (three factors):
 * 0 of 100 Latin-hypercube starts reached the nominal NLL without (best -43.58), 2 of 100 with (best -66.56).
 *
 * <p>The cost-change stop (actual and predicted relative reductions below the tolerance, Moré 1978) is taken only
 * when the undamped Gauss-Newton step on the working set would not gain more than the tolerance either: after many
 * rejections λ can be so large that the damped step gains nothing far from any optimum, and such runs now end as
 * {@link Termination#NO_PROGRESS} instead of claiming convergence.
 *
 * <p>Evaluation noise: trial points are evaluated without sensitivities and accepted points again with them; the
 * two integrations take different steps, so their costs at the same point differ by about the integration's
 * relative tolerance times the cost, and near an optimum no trial can be accepted however small the step. When λ
 * then runs to its limit and the undamped Gauss-Newton model on the working set promises no more than ten times
 * the largest of the last five measured discrepancies, the run ends as {@link Termination#WITHIN_NOISE}, a local
 * optimum to within the integration accuracy; otherwise as {@link Termination#NO_PROGRESS}. Measured on 100
 * uniform starts (seed 2) of the PEtab problem Boehm_JProteomeRes2014: the 28 starts that ended with NO_PROGRESS
 * at the local minima 149.52, 149.59 and 154.16 had a promised gain of 0.07-1.9 times the discrepancy; the one
 * start whose promise was 2e6 times the discrepancy (NLL 178.47) keeps NO_PROGRESS, and so does start 0 of the
 * Smith_BMCSystBiol2013 benchmark run (promise 1.6e3, discrepancy 1e-3: the model promises gains that no trial
 * delivers, so the run cannot certify a local optimum).
 *
 * <p>Stationarity is measured by the projected gradient {@code θ - P(θ - g)}, which vanishes at a local optimum
 * on the box even when g itself does not (optimum on a bound).
 *
 * <p>Evaluation failures ({@link ObjectiveException} or non-finite residuals or Jacobian) at a trial point count
 * as a rejected step; at the start point they propagate to the caller. Immutable and thread-safe: one configured
 * instance can serve every start on every thread.
 */
public final class LevenbergMarquardt {

    private static final double ACCEPT_RATIO = 1e-4;
    private static final double LAMBDA_MAX = 1e20;
    private static final double LAMBDA_MIN = 1e-20;
    /** Accepted points whose evaluation discrepancy {@link Run#noiseLevel()} remembers. */
    private static final int NOISE_SAMPLES = 5;
    /**
     * How far above the measured evaluation noise the undamped Gauss-Newton gain may lie for a run that found no
     * acceptable step to end as {@link Termination#WITHIN_NOISE}: plain evaluations at neighbouring points
     * scatter by several times one measured discrepancy (Smith_BMCSystBiol2013 start 0: trials at vanishing steps
     * 0.7-1.4 times the largest), and a step that realises a fraction of its predicted gain can only be verified
     * when that gain is clearly above the scatter, so an order of magnitude.
     */
    private static final double NOISE_MARGIN = 10.0;

    private final int maxIterations;
    private final int maxEvaluations;
    private final double gradientTolerance;
    private final double costTolerance;
    private final double stepTolerance;
    private final double initialDamping;
    private final boolean secant;
    private final boolean factors;

    private LevenbergMarquardt(int maxIterations, int maxEvaluations, double gradientTolerance,
                               double costTolerance, double stepTolerance, double initialDamping, boolean secant,
                               boolean factors) {
        this.maxIterations = maxIterations;
        this.maxEvaluations = maxEvaluations;
        this.gradientTolerance = gradientTolerance;
        this.costTolerance = costTolerance;
        this.stepTolerance = stepTolerance;
        this.initialDamping = initialDamping;
        this.secant = secant;
        this.factors = factors;
    }

    /**
     * Defaults: 1000 iterations, 5000 evaluations, gradient tolerance 1e-10 (scaled, see
     * {@link #withGradientTolerance}),
     * cost tolerance 1e-14 (relative change of ½|r|², about 100 ulp), step tolerance 1e-10 (relative to |θ|),
     * initial λ 1e-3.
     */
    public static LevenbergMarquardt defaults() {
        return new LevenbergMarquardt(1000, 5000, 1e-10, 1e-14, 1e-10, 1e-3, true, true);
    }

    /** Limit on trial steps (accepted and rejected), n &gt; 0. */
    public LevenbergMarquardt withMaxIterations(int n) {
        return new LevenbergMarquardt(positive(n, "maxIterations"), maxEvaluations, gradientTolerance,
                costTolerance, stepTolerance, initialDamping, secant, factors);
    }

    /** Limit on objective evaluations, n &gt; 0. */
    public LevenbergMarquardt withMaxEvaluations(int n) {
        return new LevenbergMarquardt(maxIterations, positive(n, "maxEvaluations"), gradientTolerance,
                costTolerance, stepTolerance, initialDamping, secant, factors);
    }

    /**
     * Tolerance on the scaled projected gradient {@code max_k |g_k| / (d_k |r|)} over free parameters not held at
     * a bound by the gradient (g = Jᵀr, d_k the norm of column k of J): the cosine of the angle between r and
     * column k, so the test does not depend on the units of θ (the gradient test of More 1978).
     */
    public LevenbergMarquardt withGradientTolerance(double tol) {
        return new LevenbergMarquardt(maxIterations, maxEvaluations, nonNegative(tol, "gradientTolerance"),
                costTolerance, stepTolerance, initialDamping, secant, factors);
    }

    /** Relative tolerance on the actual and predicted reduction of ½|r|² in one accepted step. */
    public LevenbergMarquardt withCostTolerance(double tol) {
        return new LevenbergMarquardt(maxIterations, maxEvaluations, gradientTolerance,
                nonNegative(tol, "costTolerance"), stepTolerance, initialDamping, secant, factors);
    }

    /** Relative tolerance on the length of an accepted step: |s| ≤ tol·(tol + |θ|). */
    public LevenbergMarquardt withStepTolerance(double tol) {
        return new LevenbergMarquardt(maxIterations, maxEvaluations, gradientTolerance, costTolerance,
                nonNegative(tol, "stepTolerance"), initialDamping, secant, factors);
    }

    /** Initial λ relative to the column scaling D², λ &gt; 0. */
    public LevenbergMarquardt withInitialDamping(double lambda) {
        if (!(lambda > 0)) {
            throw new IllegalArgumentException("initialDamping must be > 0, got " + lambda);
        }
        return new LevenbergMarquardt(maxIterations, maxEvaluations, gradientTolerance, costTolerance,
                stepTolerance, lambda, secant, factors);
    }

    /**
     * Whether to use the augmented model {@code JᵀJ + S} with the secant approximation S of the second-order term
     * ({@link SecantModel}) when it predicted the last step better than Gauss-Newton (the model switch of Dennis,
     * Gay and Welsch 1981); false keeps plain Gauss-Newton models.
     */
    public LevenbergMarquardt withSecantModel(boolean on) {
        return new LevenbergMarquardt(maxIterations, maxEvaluations, gradientTolerance, costTolerance,
                stepTolerance, initialDamping, on, factors);
    }

    /**
     * Whether parameters that enter only as factors of predictions with constant noise
     * ({@link org.switchfit.objective.Objective#outputFactors()}) are set to their closed-form conditional
     * optimum after every evaluation with Jacobian (see the class comment); default true.
     */
    public LevenbergMarquardt withFactorProjection(boolean on) {
        return new LevenbergMarquardt(maxIterations, maxEvaluations, gradientTolerance, costTolerance,
                stepTolerance, initialDamping, secant, on);
    }

    /** The iteration limit. */
    public int maxIterations() {
        return maxIterations;
    }

    /** The scaled projected-gradient tolerance. */
    public double gradientTolerance() {
        return gradientTolerance;
    }

    /**
     * Minimises the problem's NLL from {@code start} (clamped into the bounds; fixed parameters keep their start
     * value).
     *
     * @throws ObjectiveException when the objective fails or is non-finite at the (clamped) start point
     */
    public LocalFit minimize(FitProblem problem, double[] start) {
        return new Run(problem, start).solve();
    }

    /** The state of one run; confined to the calling thread. */
    private final class Run {
        final Objective obj;
        final FitProblem problem;
        final int n;
        final int m;
        final int[] free;
        final double[] lo;
        final double[] hi;
        double[] x;
        double[] r;
        double[] jac;
        double nll;
        double cost;
        int evals;
        int jevals;
        int iters;
        boolean lastTrialProjected;
        double radius = Double.POSITIVE_INFINITY;
        final double[] width;
        boolean lastTrialAugmented;
        double lastPotential;
        /** |cost with sensitivities - cost without| at the last accepted points (ring buffer). */
        final double[] noise = new double[NOISE_SAMPLES];
        int accepted;
        final org.switchfit.objective.OutputFactor[] facs;
        double[][] bFac;

        Run(FitProblem problem, double[] start) {
            this.problem = problem;
            this.obj = problem.objective();
            this.n = obj.parameterCount();
            this.m = obj.residualCount();
            if (start.length != n) {
                throw new IllegalArgumentException("start length " + start.length + " != " + n);
            }
            int c = problem.freeCount();
            free = new int[c];
            int f = 0;
            for (int k = 0; k < n; k++) {
                if (!problem.isFixed(k)) {
                    free[f++] = k;
                }
            }
            lo = problem.lower();
            hi = problem.upper();
            x = problem.clamp(start);
            java.util.List<org.switchfit.objective.OutputFactor> fl = new java.util.ArrayList<>();
            if (factors) {
                for (org.switchfit.objective.OutputFactor of : obj.outputFactors()) {
                    if (!problem.isFixed(of.parameter())) {
                        fl.add(of);
                    }
                }
            }
            facs = fl.toArray(new org.switchfit.objective.OutputFactor[0]);
            width = new double[n];
            for (int k = 0; k < n; k++) {
                double wk = hi[k] - lo[k];
                width[k] = Double.isFinite(wk) && wk > 0 ? wk : Math.max(1.0, Math.abs(x[k]));
            }
        }

        private double relativeStep(double[] s) {
            double t = 0;
            for (int k = 0; k < n; k++) {
                t = Math.max(t, Math.abs(s[k]) / width[k]);
            }
            return t;
        }

        LocalFit solve() {
            r = new double[m];
            jac = new double[m * n];
            nll = evalStrict(x, r, jac);
            cost = halfSquare(r);
            projectFactors();
            int w0 = free.length;
            double[] d = new double[w0];
            double[] g = new double[n];
            double[] gNew = new double[n];
            double[] ySharp = new double[n];
            double lambda = initialDamping;
            double nu = 2.0;
            double[] rTrial = new double[m];
            SecantModel sec = secant ? new SecantModel(n) : null;
            boolean augmented = false;
            Termination why = null;
            gradient(g, r, jac);
            while (why == null) {
                updateScaling(d);
                if (cost == 0.0) {
                    why = Termination.ZERO_RESIDUAL;
                    break;
                }
                if (scaledProjectedGradient(g, d) <= gradientTolerance) {
                    why = Termination.GRADIENT; // FLAT or GRADIENT: decided after the loop
                    break;
                }
                int[] work = workingSet(g);
                boolean accepted = false;
                while (!accepted) {
                    if (iters >= maxIterations) {
                        why = Termination.MAX_ITERATIONS;
                        break;
                    }
                    if (evals >= maxEvaluations) {
                        why = Termination.MAX_EVALUATIONS;
                        break;
                    }
                    if (lambda > LAMBDA_MAX) {
                        why = potentialReduction(work, d) <= NOISE_MARGIN * noiseLevel()
                                ? Termination.WITHIN_NOISE : Termination.NO_PROGRESS;
                        break;
                    }
                    iters++;
                    double[] xt = trialPoint(work, d, lambda, g, augmented ? sec : null);
                    boolean projected = lastTrialProjected;
                    double[] s = new double[n];
                    double sNorm2 = 0;
                    for (int k = 0; k < n; k++) {
                        s[k] = xt[k] - x[k];
                        sNorm2 += s[k] * s[k];
                    }
                    double sRel = relativeStep(s);
                    double predGn = predictedReduction(s);
                    double predAug = sec == null ? predGn : predGn - 0.5 * sec.quadratic(s);
                    double pred = lastTrialAugmented ? predAug : predGn;
                    lastPotential = Double.NaN;
                    // The minimiser of the damped linear model gains nothing measurable (More 1978, predicted-
                    // reduction test; pred may round to <= 0 at the optimum): take that last step if it does not
                    // raise the cost, then stop.
                    boolean converging = !projected && pred <= costTolerance * cost && !gainPossible(work, d);
                    if (!converging && (!(pred > 0) || sNorm2 == 0.0)) {
                        lambda *= nu;
                        nu *= 2;
                        continue;
                    }
                    double costTrial;
                    double nllTrial = Double.NaN;
                    try {
                        evals++;
                        nllTrial = obj.evaluate(xt, rTrial, null);
                        costTrial = halfSquare(rTrial);
                        if (facs.length > 0 && Double.isFinite(costTrial)) {
                            projectInPlace(xt, rTrial);
                            double atOptimum = halfSquare(rTrial);
                            nllTrial += atOptimum - costTrial;
                            costTrial = atOptimum;
                        }
                    } catch (ObjectiveException e) {
                        costTrial = Double.NaN;
                    }
                    boolean finite = Double.isFinite(costTrial) && Double.isFinite(nllTrial);
                    double actual = cost - costTrial;
                    double rho = actual / pred;
                    if (converging) {
                        if (finite && actual >= 0 && sNorm2 > 0) {
                            // on failure the run ends at the current point, converged all the same
                            accept(xt, costTrial);
                        }
                        why = Termination.COST_CHANGE;
                        break;
                    }
                    double oldCost = cost;
                    double xNorm = norm(x);
                    if (Math.abs(actual) <= costTolerance * oldCost && pred <= costTolerance * oldCost) {
                        lastPotential = potentialReduction(work, d);
                    }
                    double[] jOld = jac;
                    double[] xPrev = x;
                    if (finite && rho > ACCEPT_RATIO && accept(xt, costTrial)) {
                        accepted = true;
                        for (int k = 0; k < n; k++) {
                            s[k] = x[k] - xPrev[k]; // the factor projection may have moved x beyond xt
                        }
                        gradient(gNew, r, jac);
                        if (sec != null) {
                            // Model switch of Dennis, Gay and Welsch (1981): next time use the model whose
                            // predicted reduction came closer to the actual one.
                            augmented = Math.abs(predAug - actual) < Math.abs(predGn - actual);
                            gradient(ySharp, r, jOld);
                            for (int k = 0; k < n; k++) {
                                ySharp[k] = gNew[k] - ySharp[k];
                                g[k] = gNew[k] - g[k];
                            }
                            sec.update(s, g, ySharp);
                        }
                        System.arraycopy(gNew, 0, g, 0, n);
                        double t = 2 * rho - 1;
                        lambda = Math.max(LAMBDA_MIN, lambda * Math.max(1.0 / 3.0, 1 - t * t * t));
                        nu = 2;
                        if (rho > 0.25) {
                            radius = Math.max(radius, 2 * sRel);
                            if (radius >= 1) {
                                radius = Double.POSITIVE_INFINITY;
                            }
                        }
                        if (Math.abs(actual) <= costTolerance * oldCost && pred <= costTolerance * oldCost
                                && rho <= 2 && !gainPossibleAt(oldCost, lastPotential)) {
                            why = Termination.COST_CHANGE;
                        } else if (rho > 0.25 && Math.sqrt(sNorm2) <= stepTolerance * (stepTolerance + xNorm)) {
                            why = Termination.STEP_SIZE;
                        }
                    } else if (finite && Math.abs(actual) <= costTolerance * cost
                            && pred <= costTolerance * cost && !gainPossible(work, d)) {
                        // The linear model promises no relative gain above the tolerance and the trial confirms
                        // it (More 1978, test on actual and predicted reduction, applied to rejected trials too).
                        why = Termination.COST_CHANGE;
                        break;
                    } else {
                        lambda *= nu;
                        nu *= 2;
                        radius = 0.5 * sRel;
                    }
                }
            }
            gradient(g, r, jac);
            double pgNorm = projectedGradientNorm(g);
            if (why != Termination.ZERO_RESIDUAL && scaledProjectedGradient(g, d) <= gradientTolerance) {
                why = iters == 0 && allZero(g) && cost > 0.0 ? Termination.FLAT : Termination.GRADIENT;
            }
            int[] active = new int[n];
            for (int k = 0; k < n; k++) {
                active[k] = x[k] <= lo[k] ? -1 : (x[k] >= hi[k] ? 1 : 0);
            }
            return new LocalFit(x, nll, why, iters, evals, jevals, pgNorm, active);
        }

        /**
         * The largest of the last {@link #NOISE_SAMPLES} discrepancies between the cost of an accepted point
         * evaluated with sensitivities and evaluated without (its trial evaluation): the two integrations take
         * different steps, so the discrepancy samples the evaluation noise of the cost at the current
         * accuracy. 0 before the first accepted step.
         */
        private double noiseLevel() {
            double mx = 0;
            for (int i = 0; i < Math.min(accepted, noise.length); i++) {
                mx = Math.max(mx, noise[i]);
            }
            return mx;
        }

        /**
         * Evaluates residuals and Jacobian at xt and moves there; returns false (state unchanged) when that
         * evaluation fails or is non-finite, so the caller can treat the step as rejected.
         */
        private boolean accept(double[] xt, double plainCost) {
            double[] rNew = new double[m];
            double[] jNew = new double[m * n];
            double v;
            evals++;
            jevals++;
            try {
                v = obj.evaluate(xt, rNew, jNew);
            } catch (ObjectiveException e) {
                return false;
            }
            if (!Double.isFinite(v) || !Double.isFinite(halfSquare(rNew)) || firstNonFinite(jNew) >= 0) {
                return false;
            }
            x = xt;
            r = rNew;
            jac = jNew;
            nll = v;
            cost = halfSquare(r);
            noise[accepted++ % noise.length] = Math.abs(cost - plainCost);
            projectFactors();
            return true;
        }


        /**
         * Sets every output factor ({@link org.switchfit.objective.OutputFactor}) to its closed-form conditional
         * optimum at the current point and updates r, J, the cost and the NLL exactly, without an evaluation (see
         * {@link #projectInPlace}); the Jacobian rows of a factor scale with its multiplier c, except the factor's
         * own column on the linear scale. The NLL changes by the change of the cost (σ is constant in those rows).
         */
        private void projectFactors() {
            if (facs.length == 0) {
                return;
            }
            if (bFac == null) {
                bFac = new double[facs.length][];
                for (int f = 0; f < facs.length; f++) {
                    int k = facs[f].parameter();
                    int[] rows = facs[f].residuals();
                    double dLog = facs[f].scale().logDerivative(facs[f].scale().factor(x[k]));
                    bFac[f] = new double[rows.length];
                    for (int t = 0; t < rows.length; t++) {
                        bFac[f][t] = jac[rows[t] * n + k] / dLog - r[rows[t]];
                    }
                }
            }
            x = x.clone();
            double[] cs = projectInPlace(x, r);
            for (int f = 0; f < facs.length; f++) {
                if (cs[f] == 1.0) {
                    continue;
                }
                int k = facs[f].parameter();
                boolean linear = facs[f].scale() == org.switchfit.objective.OutputFactor.Scale.LINEAR;
                for (int i : facs[f].residuals()) {
                    int base = i * n;
                    for (int j = 0; j < n; j++) {
                        if (j != k || !linear) {
                            jac[base + j] *= cs[f];
                        }
                    }
                }
            }
            double newCost = halfSquare(r);
            nll += newCost - cost;
            cost = newCost;
        }

        /**
         * Moves each output factor of {@code xv} to its conditional optimum given the residuals {@code res} and
         * rewrites those residuals, in place. With s the factor, a_i = s g_i / σ_i (up to a common sign) and
         * b_i = a_i - r_i the constant scaled datum (found once, from the first Jacobian), the cost of the factor's
         * rows is the convex quadratic ½|c a - b|² in the multiplier c of s, minimised at c = aᵀb / aᵀa; c is
         * clamped so that the factor stays within its bounds (on a log scale an optimum at s &lt;= 0 goes to the
         * lower bound), so the cost never rises. Used on trial points too, so every comparison of costs is one of
         * the functional with the factors at their optimum (variable projection, Golub and Pereyra 1973, "The
         * differentiation of pseudo-inverses and nonlinear least squares problems whose variables separate",
         * SIAM J. Numer. Anal. 10(2):413-432).
         *
         * @return the multiplier c applied to each factor (1 where it did not move)
         */
        private double[] projectInPlace(double[] xv, double[] res) {
            double[] cs = new double[facs.length];
            for (int f = 0; f < facs.length; f++) {
                cs[f] = 1.0;
                int k = facs[f].parameter();
                int[] rows = facs[f].residuals();
                double[] b = bFac[f];
                org.switchfit.objective.OutputFactor.Scale sc = facs[f].scale();
                double sOld = sc.factor(xv[k]);
                double aa = 0;
                double ab = 0;
                for (int t = 0; t < rows.length; t++) {
                    double a = res[rows[t]] + b[t];
                    aa += a * a;
                    ab += a * b[t];
                }
                if (!(aa > 0) || !(sOld != 0.0) || !Double.isFinite(sOld)) {
                    continue;
                }
                double thetaNew = sc.theta(sOld * (ab / aa));
                if (Double.isNaN(thetaNew)) {
                    thetaNew = lo[k];
                }
                thetaNew = Math.min(hi[k], Math.max(lo[k], thetaNew));
                double c = sc.factor(thetaNew) / sOld;
                if (c == 1.0 || !Double.isFinite(c)) {
                    continue;
                }
                for (int t = 0; t < rows.length; t++) {
                    int i = rows[t];
                    res[i] = c * (res[i] + b[t]) - b[t];
                }
                xv[k] = thetaNew;
                cs[f] = c;
            }
            return cs;
        }

        private double evalStrict(double[] at, double[] res, double[] jj) {
            evals++;
            if (jj != null) {
                jevals++;
            }
            double v = obj.evaluate(at, res, jj);
            if (!Double.isFinite(v) || !Double.isFinite(halfSquare(res))) {
                throw new ObjectiveException(String.format(Locale.ROOT,
                        "non-finite negative log-likelihood %.6g at the start point", v));
            }
            checkFinite(at);
            return v;
        }

        private void checkFinite(double[] at) {
            int i = firstNonFinite(jac);
            if (i >= 0) {
                throw new ObjectiveException(String.format(Locale.ROOT,
                        "non-finite Jacobian entry d r[%d] / d %s at the start point", i / n, problem.id(i % n)));
            }
        }

        /** g = Jᵀ r over all parameters. */
        private void gradient(double[] g, double[] r, double[] jac) {
            java.util.Arrays.fill(g, 0.0);
            for (int i = 0; i < m; i++) {
                double ri = r[i];
                int base = i * n;
                for (int k = 0; k < n; k++) {
                    g[k] += jac[base + k] * ri;
                }
            }
        }

        private void updateScaling(double[] d) {
            for (int f = 0; f < free.length; f++) {
                int k = free[f];
                double s = 0;
                for (int i = 0; i < m; i++) {
                    double v = jac[i * n + k];
                    s += v * v;
                }
                s = Math.sqrt(s);
                d[f] = s;
            }
        }

        private double projectedGradientNorm(double[] g) {
            double mx = 0;
            for (int k : free) {
                double p = Math.min(hi[k], Math.max(lo[k], x[k] - g[k]));
                mx = Math.max(mx, Math.abs(x[k] - p));
            }
            return mx;
        }

        /**
         * Scale-free stationarity measure: max over free k not held at a bound of |g_k| / (d_k |r|), the cosine
         * between r and the k-th Jacobian column (the gradient test of More 1978). Components pushing into a
         * bound count 0; the others count with |g_k|, not with the projected step θ - P(θ - g), whose size is
         * capped by the distance to the bound and so could pass the test far from any optimum.
         */
        private double scaledProjectedGradient(double[] g, double[] d) {
            double rn = Math.sqrt(2 * cost);
            if (rn == 0.0) {
                return 0.0;
            }
            double mx = 0;
            for (int f = 0; f < free.length; f++) {
                int k = free[f];
                boolean held = (x[k] <= lo[k] && g[k] > 0) || (x[k] >= hi[k] && g[k] < 0);
                double p = held ? 0.0 : Math.abs(g[k]);
                if (p > 0) {
                    mx = Math.max(mx, d[f] > 0 ? p / (d[f] * rn) : Double.POSITIVE_INFINITY);
                }
            }
            return mx;
        }

        /** Positions (into {@code free}) of free parameters not held at a bound by the gradient. */
        private int[] workingSet(double[] g) {
            int[] tmp = new int[free.length];
            int c = 0;
            for (int f = 0; f < free.length; f++) {
                int k = free[f];
                boolean held = (x[k] <= lo[k] && g[k] > 0) || (x[k] >= hi[k] && g[k] < 0);
                if (!held) {
                    tmp[c++] = f;
                }
            }
            return java.util.Arrays.copyOf(tmp, c);
        }

        /**
         * The projected trial point P(θ + δ) with δ from the damped model on the working set: Gauss-Newton by QR
         * ({@link DampedLeastSquares#solve}), or, when {@code sec} is given, the augmented model
         * {@code (J_WᵀJ_W + S_WW + λ D_W²) δ = -g_W} by Cholesky, falling back to Gauss-Newton when that matrix
         * is not positive definite.
         */
        private double[] dampedStep(int[] work, double[] d, double lambda, double[] g, SecantModel sec) {
            int w = work.length;
            double[] diag = new double[w];
            for (int j = 0; j < w; j++) {
                double dj = d[work[j]];
                diag[j] = dj > 0 ? dj : 1.0;
            }
            double[] delta = null;
            if (sec != null) {
                double[] hm = new double[w * w];
                double[] rhs = new double[w];
                for (int a = 0; a < w; a++) {
                    int ka = free[work[a]];
                    rhs[a] = -g[ka];
                    for (int b = 0; b <= a; b++) {
                        int kb = free[work[b]];
                        double e = 0;
                        for (int i = 0; i < m; i++) {
                            e += jac[i * n + ka] * jac[i * n + kb];
                        }
                        e += sec.get(ka, kb);
                        hm[a * w + b] = e;
                        hm[b * w + a] = e;
                    }
                    hm[a * w + a] += lambda * diag[a] * diag[a];
                }
                delta = DampedLeastSquares.solveSymmetric(hm, w, rhs);
            }
            lastTrialAugmented = delta != null;
            if (delta == null) {
                double[] a = new double[m * w];
                for (int i = 0; i < m; i++) {
                    for (int j = 0; j < w; j++) {
                        a[i * w + j] = jac[i * n + free[work[j]]];
                    }
                }
                double[] b = new double[m];
                for (int i = 0; i < m; i++) {
                    b[i] = -r[i];
                }
                delta = DampedLeastSquares.solve(a, m, w, b, diag, lambda);
            }
            return delta;
        }

        private double[] trialPoint(int[] work0, double[] d, double lambda, double[] g, SecantModel sec) {
            int[] work = work0;
            double[] delta;
            while (true) {
                delta = dampedStep(work, d, lambda, g, sec);
                int[] keep = new int[work.length];
                int c = 0;
                for (int j = 0; j < work.length; j++) {
                    int k = free[work[j]];
                    boolean out = (x[k] <= lo[k] && delta[j] < 0) || (x[k] >= hi[k] && delta[j] > 0);
                    if (!out) {
                        keep[c++] = work[j];
                    }
                }
                if (c == work.length || c == 0) {
                    break;
                }
                work = java.util.Arrays.copyOf(keep, c);
            }
            int w = work.length;
            double[] xt = x.clone();
            lastTrialProjected = false;
            for (int j = 0; j < w; j++) {
                int k = free[work[j]];
                double v = x[k] + delta[j];
                double a = Math.max(lo[k], x[k] - radius * width[k]);
                double b = Math.min(hi[k], x[k] + radius * width[k]);
                xt[k] = Math.min(b, Math.max(a, v));
                lastTrialProjected |= xt[k] != v;
            }
            return xt;
        }

        /**
         * The reduction of ½|r|² the undamped Gauss-Newton model promises on the working set (λ = 1e-20 for
         * rank-deficient J). The cost-change tests compare the reduction of the damped step with the tolerance;
         * after many rejected steps λ can be so large that this step is tiny far from any optimum, so those tests
         * stop only when this undamped reduction is below the tolerance too.
         */
        private double potentialReduction(int[] work, double[] d) {
            int w = work.length;
            if (w == 0) {
                return 0.0;
            }
            double[] a = new double[m * w];
            for (int i = 0; i < m; i++) {
                for (int j = 0; j < w; j++) {
                    a[i * w + j] = jac[i * n + free[work[j]]];
                }
            }
            double[] diag = new double[w];
            double[] b = new double[m];
            for (int j = 0; j < w; j++) {
                diag[j] = d[work[j]] > 0 ? d[work[j]] : 1.0;
            }
            for (int i = 0; i < m; i++) {
                b[i] = -r[i];
            }
            double[] delta = DampedLeastSquares.solve(a, m, w, b, diag, LAMBDA_MIN);
            double[] s = new double[n];
            for (int j = 0; j < w; j++) {
                s[free[work[j]]] = delta[j];
            }
            return predictedReduction(s);
        }

        private boolean gainPossible(int[] work, double[] d) {
            return gainPossibleAt(cost, potentialReduction(work, d));
        }

        private boolean gainPossibleAt(double c, double potential) {
            return potential > costTolerance * c;
        }

        /** ½|r|² - ½|r + J s|². */
        private double predictedReduction(double[] s) {
            double red = 0;
            for (int i = 0; i < m; i++) {
                double js = 0;
                int base = i * n;
                for (int k = 0; k < n; k++) {
                    js += jac[base + k] * s[k];
                }
                red -= js * (2 * r[i] + js);
            }
            return 0.5 * red;
        }
    }

    private static int firstNonFinite(double[] a) {
        for (int i = 0; i < a.length; i++) {
            if (!Double.isFinite(a[i])) {
                return i;
            }
        }
        return -1;
    }

    static double halfSquare(double[] r) {
        double s = 0;
        for (double v : r) {
            s += v * v;
        }
        return 0.5 * s;
    }

    private static double norm(double[] v) {
        double s = 0;
        for (double e : v) {
            s += e * e;
        }
        return Math.sqrt(s);
    }

    private static int positive(int v, String name) {
        if (v > 0) {
            return v;
        }
        throw new IllegalArgumentException(name + " must be > 0, got " + v);
    }

    private static double nonNegative(double v, String name) {
        if (v >= 0) {
            return v;
        }
        throw new IllegalArgumentException(name + " must be >= 0, got " + v);
    }

    /**
     * Whether every gradient entry is exactly 0 (not merely small): no parameter moves the cost, as on a plateau of
     * the objective ({@link Termination#FLAT} when that holds at the start). A bound-constrained optimum has a
     * non-zero gradient pointing out of the box, so it is not taken for one.
     */
    private static boolean allZero(double[] g) {
        for (double v : g) {
            if (v != 0.0) {
                return false;
            }
        }
        return true;
    }
}
