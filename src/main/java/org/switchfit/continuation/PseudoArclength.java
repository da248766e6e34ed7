package org.switchfit.continuation;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Locale;
import org.switchfit.ode.OdeSystem;

/**
 * Pseudo-arclength continuation of equilibria f(y, λ) = 0 in one control parameter λ = p[control] (Keller 1977,
 * "Numerical solution of bifurcation and nonlinear eigenvalue problems", Applications of Bifurcation Theory,
 * Academic Press, pp. 359-384; Allgower and Georg 1990/2003, Introduction to Numerical Continuation Methods,
 * SIAM, ch. 2 and 6 for the step control).
 *
 * <p>Each step: tangent predictor {@code u + h t}, Newton corrector on the bordered system
 * {@code [f(u); t^T (u - u_pred)]}, step halved on corrector failure or when the tangent turns by more than
 * about 25°, grown by 1.5 after fast convergence (at most 3 iterations), shrunk by 0.6 after slow
 * convergence. With {@link ContinuationSettings#relativeSteps} (for unknowns scaled to order one), step lengths,
 * turns and corrections are measured in the weighted norm {@code |W du|} with {@code w_i = 1 / max(1, |y_i|)} on
 * the states taken at the step's start and weight 1 on λ ({@link CurveCorrector#stepWeighted}): absolute for states
 * of magnitude up to 1, relative beyond. A switch's states typically differ by orders of magnitude between its
 * branches, and in the plain Euclidean norm a state that has grown a thousandfold along the branch would limit
 * every step to the same absolute change as at the start, exhausting the point budget long before the branch's
 * second fold (measured on an invented toggle switch: 2000 points reached a third of the range). A branch ends when λ leaves [lowerBound, upperBound] (the end point is then corrected onto the
 * bound), after maxPoints points, or when the step falls below minStep.
 *
 * <p>Test functions (Kuznetsov 2004, Elements of Applied Bifurcation Theory, 3rd ed., sec. 10.2): a fold is
 * signalled by a sign change of the λ component of the tangent and located by Newton on an augmented system
 * (see {@link FoldRefiner}: minimally augmented bordered system, standard extended system (f, J v, c^T v - 1)
 * as fallback); a Hopf point by a complex pair of eigenvalues crossing the imaginary axis (the
 * unstable count changes by two and so does the count of unstable non-real eigenvalues), located by the secant
 * method on the real part of the critical pair along the branch.
 *
 * <p>To continue in the total of a conservation law, continue the {@link ReducedSystem} with
 * {@code control = reduced.totalIndex(c)}. Immutable and thread-safe; each call owns its workspace.
 */
public final class PseudoArclength {

    private final ContinuationSettings settings;

    /** @param settings bounds, steps and tolerances */
    public PseudoArclength(ContinuationSettings settings) {
        this.settings = settings;
    }

    /** The settings. */
    public ContinuationSettings settings() {
        return settings;
    }

    /** Copy with other settings. */
    public PseudoArclength withSettings(ContinuationSettings newSettings) {
        return new PseudoArclength(newSettings);
    }

    /**
     * Traces the branch through the equilibrium near (y0, p) in both directions; points run from the end reached
     * while decreasing λ initially to the end reached while increasing it.
     *
     * @throws ContinuationException when no equilibrium is found near y0 at p
     * @throws IllegalArgumentException when control is out of range or p[control] is outside the bounds
     */
    public Branch trace(OdeSystem sys, double[] y0, double[] p, int control) {
        Branch down = trace(sys, y0, p, control, -1);
        Branch up = trace(sys, y0, p, control, +1);
        List<BranchPoint> pts = new ArrayList<>();
        int nd = down.size();
        double lenDown = down.point(nd - 1).arclength();
        for (int i = nd - 1; i >= 1; i--) {
            pts.add(down.point(i).reversed(lenDown));
        }
        for (BranchPoint bp : up.points()) {
            pts.add(bp.shifted(lenDown));
        }
        List<Fold> folds = new ArrayList<>();
        List<Hopf> hopfs = new ArrayList<>();
        List<Fold> df = new ArrayList<>(down.folds());
        Collections.reverse(df);
        for (Fold f : df) {
            folds.add(f.withAfterPoint(nd - 2 - f.afterPoint()));
        }
        for (Fold f : up.folds()) {
            folds.add(f.withAfterPoint(f.afterPoint() + nd - 1));
        }
        List<Hopf> dh = new ArrayList<>(down.hopfs());
        Collections.reverse(dh);
        for (Hopf h : dh) {
            hopfs.add(h.withAfterPoint(nd - 2 - h.afterPoint()));
        }
        for (Hopf h : up.hopfs()) {
            hopfs.add(h.withAfterPoint(h.afterPoint() + nd - 1));
        }
        return new Branch(control, pts, folds, hopfs, down.finishEnd(), up.finishEnd());
    }

    /**
     * Traces from the equilibrium near (y0, p) in one direction: {@code direction > 0} starts with increasing λ.
     *
     * @throws ContinuationException when no equilibrium is found near y0 at p
     */
    public Branch trace(OdeSystem sys, double[] y0, double[] p, int control, int direction) {
        int n = sys.stateCount();
        if (control < 0 || control >= sys.parameterCount()) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "control index %d outside [0, %d)", control, sys.parameterCount()));
        }
        double lam0 = p[control];
        if (lam0 < settings.lowerBound() || lam0 > settings.upperBound()) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "start value %.6g of the control parameter is outside [%.6g, %.6g]", lam0,
                    settings.lowerBound(), settings.upperBound()));
        }
        SteadyStateSolver ss = SteadyStateSolver.defaults();
        SteadyState start = new SteadyStateSolver(ss.residualTolerance(), ss.stepTolerance(), ss.maxNewtonSteps(),
                ss.maxTransientSteps(), ss.initialDt(), 0).solve(sys, y0, p);
        EquilibriumProblem prob = new EquilibriumProblem(sys, p, control, settings.linearAlgebra());
        CurveCorrector cc = new CurveCorrector(prob, settings.tolerance(), settings.maxCorrectorSteps());
        int n1 = n + 1;
        double[] u = new double[n1];
        System.arraycopy(start.state(), 0, u, 0, n);
        u[n] = lam0;
        double[] t = new double[n1];
        double[] ref = new double[n1];
        ref[n] = direction >= 0 ? 1 : -1;
        List<BranchPoint> pts = new ArrayList<>();
        List<Fold> folds = new ArrayList<>();
        List<Hopf> hopfs = new ArrayList<>();
        if (!cc.tangent(u, ref, t)) {
            pts.add(makePoint(prob, u, ref, 0));
            return new Branch(control, pts, folds, hopfs, Branch.EndReason.START, Branch.EndReason.SINGULAR);
        }
        BranchPoint prev = makePoint(prob, u, t, 0);
        pts.add(prev);
        double h = settings.initialStep();
        double s = 0;
        double[] uPred = new double[n1];
        double[] uNew = new double[n1];
        double[] tNew = new double[n1];
        double[] w = new double[n1];
        double[] border = new double[n1];
        Branch.EndReason end = Branch.EndReason.MAX_POINTS;
        while (pts.size() < settings.maxPoints()) {
            for (int i = 0; i < n; i++) {
                w[i] = settings.relativeSteps() ? 1.0 / Math.max(1.0, Math.abs(u[i])) : 1.0;
            }
            w[n] = 1.0;
            int iters = cc.stepWeighted(u, t, w, h, settings.minStep(), uPred, border, uNew, tNew);
            if (iters < 0) {
                h *= 0.5;
                if (h < settings.minStep()) {
                    end = Branch.EndReason.STEP_TOO_SMALL;
                    break;
                }
                continue;
            }
            Fold fold = null;
            if (t[n] * tNew[n] < 0) {
                fold = locateFold(prob, u, t, uNew, tNew);
                if (fold == null) {
                    if (h > 2 * settings.minStep()) {
                        h *= 0.5; // refinement found no fold consistent with this step: resolve it better
                        continue;
                    }
                    fold = estimateFold(prob, u, t, uNew, tNew);
                }
                if (fold.parameter() < settings.lowerBound() || fold.parameter() > settings.upperBound()) {
                    fold = null;
                } else {
                    folds.add(fold.withAfterPoint(pts.size() - 1));
                }
            }
            double lamNew = uNew[n];
            boolean outside = lamNew < settings.lowerBound() || lamNew > settings.upperBound();
            if (outside) {
                double bound = lamNew < settings.lowerBound() ? settings.lowerBound() : settings.upperBound();
                if (clipToBound(cc, u, uNew, bound, n)) {
                    cc.tangent(uNew, t, tNew);
                    s += CurveCorrector.distance(u, uNew, n1);
                    BranchPoint bp = makePoint(prob, uNew, tNew, s);
                    detectHopf(prob, cc, prev, bp, u, t, uNew, pts.size() - 1, hopfs);
                    pts.add(bp);
                }
                end = Branch.EndReason.BOUNDARY;
                break;
            }
            s += CurveCorrector.distance(u, uNew, n1);
            BranchPoint bp = makePoint(prob, uNew, tNew, s);
            detectHopf(prob, cc, prev, bp, u, t, uNew, pts.size() - 1, hopfs);
            pts.add(bp);
            prev = bp;
            System.arraycopy(uNew, 0, u, 0, n1);
            System.arraycopy(tNew, 0, t, 0, n1);
            if (iters <= 3) {
                h = Math.min(1.5 * h, settings.maxStep());
            } else if (iters >= 6) {
                h = Math.max(0.6 * h, settings.minStep());
            }
        }
        return new Branch(control, pts, folds, hopfs, Branch.EndReason.START, end);
    }

    /** Replaces uNew by the equilibrium at λ = bound, starting from linear interpolation between u and uNew. */
    private static boolean clipToBound(CurveCorrector cc, double[] u, double[] uNew, double bound, int n) {
        double theta = (bound - u[n]) / (uNew[n] - u[n]);
        double[] guess = new double[n + 1];
        for (int i = 0; i <= n; i++) {
            guess[i] = u[i] + theta * (uNew[i] - u[i]);
        }
        guess[n] = bound;
        double[] e = new double[n + 1];
        e[n] = 1;
        double[] out = new double[n + 1];
        if (cc.correct(guess, e, out) < 0) {
            return false;
        }
        out[n] = bound;
        System.arraycopy(out, 0, uNew, 0, n + 1);
        return true;
    }

    private BranchPoint makePoint(EquilibriumProblem prob, double[] u, double[] t, double s) {
        int n = prob.n;
        double[] y = java.util.Arrays.copyOf(u, n);
        double[] jac = new double[n * n];
        int[][] pattern = prob.sys.jacobianPattern();
        if (n > settings.eigenvalueLimit()) {
            if (!LinearSolvers.isSparse(n, pattern)) {
                return new BranchPoint(u[n], y, -1, new double[0], new double[0], t[n], s);
            }
            sysJacobian(prob, u, jac);
            return dominantPoint(jac, n, pattern, u, y, t, s);
        }
        sysJacobian(prob, u, jac);
        double[] re = new double[n];
        double[] im = new double[n];
        if (!Spectrum.compute(jac, n, re, im)) {
            // The dense QR iteration failed to converge: the stability verdict can still come from the dominant
            // eigenvalues of the Cayley transform, which include every eigenvalue with positive real part.
            return dominantPoint(jac, n, pattern, u, y, t, s);
        }
        return new BranchPoint(u[n], y, Spectrum.unstableCount(re, jac, n), re, im, t[n], s);
    }

    /**
     * A point whose stability comes from {@link #dominantSpectrum} (the converged eigenvalues only), or with
     * unstableCount -1 (unknown) when Arnoldi did not converge.
     */
    private static BranchPoint dominantPoint(double[] jac, int n, int[][] pattern, double[] u, double[] y,
                                             double[] t, double s) {
        double[][] partial = dominantSpectrum(jac, n, pattern);
        if (partial == null) {
            return new BranchPoint(u[n], y, -1, new double[0], new double[0], t[n], s);
        }
        return new BranchPoint(u[n], y, Spectrum.unstableCount(partial[0], jac, n), partial[0], partial[1], t[n], s);
    }

    /**
     * Whether the bordered systems of {@link #trace} on this system use the sparse LU with these settings (see
     * {@link LinearAlgebra}).
     */
    public static boolean usesSparseLu(OdeSystem sys, ContinuationSettings settings) {
        return new EquilibriumProblem(sys, new double[sys.parameterCount()], 0, settings.linearAlgebra())
                .pattern() != null;
    }

    /** First Krylov dimension of {@link #dominantSpectrum} (doubled up to twice when not converged). */
    private static final int ARNOLDI_STEPS = 40;

    /**
     * The converged dominant eigenvalues of the Cayley transform of a large sparse J ({@link CayleyArnoldi}, σ =
     * mean |J_ii| over non-zero diagonal entries): every eigenvalue with positive real part is among them once the
     * dominant one has converged. Returns {re, im} sorted by decreasing real part, or null when the dominant Ritz
     * value has not converged (residual above 1e-8 |μ|).
     */
    static double[][] dominantSpectrum(double[] jac, int n, int[][] pattern) {
        double sum = 0;
        int cnt = 0;
        for (int i = 0; i < n; i++) {
            double d = Math.abs(jac[i * n + i]);
            if (d > 0 && Double.isFinite(d)) {
                sum += d;
                cnt++;
            }
        }
        double sigma = cnt > 0 ? sum / cnt : 1;
        CayleyArnoldi.Result r = null;
        for (int m = ARNOLDI_STEPS; r == null && m <= 4 * ARNOLDI_STEPS; m *= 2) {
            r = CayleyArnoldi.compute(jac, n, pattern, sigma, Math.min(n, m));
            if (r != null && (r.re().length == 0 || !(r.residual()[0] <= 1e-8 * r.muAbs()[0]))) {
                r = m >= n ? r : null; // not converged: retry with a larger Krylov space
            }
        }
        if (r == null || r.re().length == 0 || !(r.residual()[0] <= 1e-8 * r.muAbs()[0])) {
            return null;
        }
        java.util.List<double[]> ok = new ArrayList<>();
        for (int k = 0; k < r.re().length; k++) {
            if (r.residual()[k] <= 1e-8 * r.muAbs()[k]) {
                ok.add(new double[] {r.re()[k], r.im()[k]});
            }
        }
        ok.sort((a, b) -> {
            int c = Double.compare(b[0], a[0]);
            return c != 0 ? c : Double.compare(b[1], a[1]);
        });
        double[][] out = new double[2][ok.size()];
        for (int k = 0; k < ok.size(); k++) {
            out[0][k] = ok.get(k)[0];
            out[1][k] = ok.get(k)[1];
        }
        return out;
    }

    private static void sysJacobian(EquilibriumProblem prob, double[] u, double[] jac) {
        double[] y = prob.load(u);
        prob.sys.jacobianY(0, y, prob.p, jac);
    }

    /**
     * Refines the fold between (ua, ta) and (ub, tb), where the λ component of the tangent changes sign. Returns
     * null unless the refined fold is consistent with the step: kind matching the sign change and (y, λ) within
     * the segment's bounding box enlarged by its length (otherwise Newton found another, nearby fold).
     */
    private Fold locateFold(EquilibriumProblem prob, double[] ua, double[] ta, double[] ub, double[] tb) {
        int n = prob.n;
        Fold est = estimateFold(prob, ua, ta, ub, tb);
        double[] q = prob.p.clone();
        q[prob.control] = est.parameter();
        Fold f = FoldRefiner.refine(prob.sys, est.state(), q, prob.control, est.rightNull(), settings.tolerance(),
                30);
        if (f == null) {
            return null;
        }
        Fold.Kind expected = ta[n] > 0 ? Fold.Kind.MAXIMUM : Fold.Kind.MINIMUM;
        if (f.kind() != expected) {
            return null;
        }
        double len = CurveCorrector.distance(ua, ub, n + 1);
        double[] y = f.state();
        for (int i = 0; i <= n; i++) {
            double v = i < n ? y[i] : f.parameter();
            if (v < Math.min(ua[i], ub[i]) - len || v > Math.max(ua[i], ub[i]) + len) {
                return null;
            }
        }
        return f;
    }

    /** Unrefined fold estimate by linear interpolation to the zero of the tangent's λ component. */
    private static Fold estimateFold(EquilibriumProblem prob, double[] ua, double[] ta, double[] ub, double[] tb) {
        int n = prob.n;
        double theta = ta[n] / (ta[n] - tb[n]);
        double[] y = new double[n];
        double[] v = new double[n];
        for (int i = 0; i < n; i++) {
            y[i] = ua[i] + theta * (ub[i] - ua[i]);
            v[i] = ta[i] + theta * (tb[i] - ta[i]);
        }
        double[] q = prob.p.clone();
        q[prob.control] = ua[n] + theta * (ub[n] - ua[n]);
        return FoldMath.foldAt(prob.sys, y, q, prob.control, v, false);
    }

    private void detectHopf(EquilibriumProblem prob, CurveCorrector cc, BranchPoint a, BranchPoint b,
                            double[] ua, double[] ta, double[] ub, int indexA, List<Hopf> hopfs) {
        if (a.unstableCount() >= 0 && b.unstableCount() >= 0
                && Math.abs(a.unstableCount() - b.unstableCount()) == 2
                && Math.abs(complexUnstable(a) - complexUnstable(b)) == 2) {
            Hopf hp = refineHopf(prob, cc, ua, ta, ub);
            if (hp != null) {
                hopfs.add(hp.withAfterPoint(indexA));
            }
        }
    }

    private static int complexUnstable(BranchPoint bp) {
        double[] re = bp.eigenReal();
        double[] im = bp.eigenImag();
        int c = 0;
        for (int i = 0; i < re.length; i++) {
            if (re[i] > 0 && im[i] != 0) {
                c++;
            }
        }
        return c;
    }

    /**
     * Secant (Illinois variant) on ψ(h) = real part of the critical complex pair at the branch point at distance
     * h along ta from ua, bracketed by [0, |ub - ua|].
     */
    private Hopf refineHopf(EquilibriumProblem prob, CurveCorrector cc, double[] ua, double[] ta, double[] ub) {
        int n = prob.n;
        int n1 = n + 1;
        double hb = 0;
        for (int i = 0; i < n1; i++) {
            hb += ta[i] * (ub[i] - ua[i]);
        }
        double[] uh = new double[n1];
        double[] crit = new double[2];
        double lo = 0;
        double hi = hb;
        if (!critical(prob, cc, ua, ta, lo, uh, crit)) {
            return null;
        }
        double flo = crit[0];
        if (!critical(prob, cc, ua, ta, hi, uh, crit)) {
            return null;
        }
        double fhi = crit[0];
        if (flo * fhi > 0) {
            return null;
        }
        int side = 0;
        for (int it = 0; it < 60; it++) {
            double x = (lo * fhi - hi * flo) / (fhi - flo);
            if (!critical(prob, cc, ua, ta, x, uh, crit)) {
                return null;
            }
            double fx = crit[0];
            if (Math.abs(fx) <= 1e-13 * (1 + Math.abs(crit[1])) || Math.abs(hi - lo) <= settings.tolerance() * hb) {
                break;
            }
            if (fx * fhi > 0) {
                hi = x;
                fhi = fx;
                if (side == 1) {
                    flo *= 0.5;
                }
                side = 1;
            } else {
                lo = x;
                flo = fx;
                if (side == -1) {
                    fhi *= 0.5;
                }
                side = -1;
            }
        }
        return new Hopf(prob.control, uh[n], java.util.Arrays.copyOf(uh, n), Math.abs(crit[1]), -1);
    }

    /** Corrects the point at distance h along ta from ua into uh; crit = (Re, Im) of the complex eigenvalue nearest the imaginary axis. */
    private static boolean critical(EquilibriumProblem prob, CurveCorrector cc, double[] ua, double[] ta, double h,
                                    double[] uh, double[] crit) {
        int n = prob.n;
        int n1 = n + 1;
        double[] pred = new double[n1];
        for (int i = 0; i < n1; i++) {
            pred[i] = ua[i] + h * ta[i];
        }
        if (h != 0 && cc.correct(pred, ta, uh) < 0) {
            return false;
        }
        if (h == 0) {
            System.arraycopy(ua, 0, uh, 0, n1);
        }
        double[] jac = new double[n * n];
        sysJacobian(prob, uh, jac);
        double[] re = new double[n];
        double[] im = new double[n];
        if (!Spectrum.compute(jac, n, re, im)) {
            return false;
        }
        double best = Double.POSITIVE_INFINITY;
        for (int i = 0; i < n; i++) {
            if (im[i] != 0 && Math.abs(re[i]) < best) {
                best = Math.abs(re[i]);
                crit[0] = re[i];
                crit[1] = im[i];
            }
        }
        return best < Double.POSITIVE_INFINITY;
    }
}
