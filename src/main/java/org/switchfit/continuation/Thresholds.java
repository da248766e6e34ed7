package org.switchfit.continuation;

import java.util.Arrays;
import java.util.Locale;
import org.switchfit.ode.OdeSystem;

/**
 * Switching thresholds for fitting measured switch-on / switch-off points.
 *
 * <p><b>Semantics.</b> The control parameter λ is swept quasi-statically over [lowerBound, upperBound] of the
 * settings. The <em>switch-on</em> threshold is the fold that ends the branch reached from the steady state at
 * λ = lowerBound when λ increases (the state jumps there when sweeping up); the <em>switch-off</em> threshold is
 * the fold that ends the branch reached from the steady state at λ = upperBound when λ decreases. Which
 * steady state is "the" one at a bound is decided by pseudo-transient continuation from the caller's
 * {@code yStart} (see {@link SteadyStateSolver}), so pass the state the experiment starts from.
 *
 * <p>When the traced branch has no fold inside the bounds (monostable at these parameters) the threshold is
 * continued as the point of steepest response: the λ where |c^T dy/dλ| is maximal along the single branch, c a
 * readout weight vector, i.e. where {@code g(λ) = c^T d²y/dλ² = 0}. As the parameters approach a cusp from the
 * monostable side, dy/dλ blows up at the cusp point, so the steepest point meets both folds there and the
 * threshold is continuous across the cusp (though not differentiable there). With
 * {@code J z = -f_λ} and {@code J z' = -(D²_y f(z, z) + 2 f_{yλ} z + f_{λλ})}, g = c^T z'.
 *
 * <p><b>Gradients.</b> Fold: exact, see {@link Folds#parameterGradient}. Steepest response: implicit
 * differentiation of g(λ*, θ) = 0, {@code dλ* / dθ_k = -(∂g/∂θ_k) / (∂g/∂λ)}, where g is re-solved (equilibrium,
 * z, z') at shifted arguments and the two partials are five-point central differences with relative step 1e-5
 * (g varies on the narrow scale of the steep region: in the tests relative steps of 1e-4 and 1e-3 lost 4e-5 and
 * 3e-2); second derivatives inside g are central differences of the analytic Jacobian. Accuracy better than 1e-5
 * relative in the tests (closed form and differences of recomputed thresholds). Near a cusp the steep region
 * narrows further and the gradient degrades; it is undefined at the cusp itself. Immutable and thread-safe.
 */
public final class Thresholds {
    private static final double DIFF_STEP = 1e-5;
    private static final int ZOOM_LEVELS = 2;

    private final ContinuationSettings settings;

    /** @param settings sweep range (bounds) and continuation steps */
    public Thresholds(ContinuationSettings settings) {
        this.settings = settings;
    }

    /**
     * Switch-on threshold when sweeping λ = p[control] up from lowerBound.
     *
     * @param yStart  state the experiment starts from (relaxed to the steady state at lowerBound)
     * @param p       parameters (the control entry is ignored)
     * @param readout weights c of the measured response c^T y (used only when monostable), length n
     * @throws ContinuationException when no steady state is found, or the model is monostable and the response
     *                               is steepest at a bound (no threshold inside the range)
     */
    public Threshold switchOn(OdeSystem sys, double[] yStart, double[] p, int control, double[] readout) {
        return threshold(sys, yStart, p, control, readout, +1);
    }

    /** Switch-off threshold when sweeping λ down from upperBound; arguments as in {@link #switchOn}. */
    public Threshold switchOff(OdeSystem sys, double[] yStart, double[] p, int control, double[] readout) {
        return threshold(sys, yStart, p, control, readout, -1);
    }

    private Threshold threshold(OdeSystem sys, double[] yStart, double[] p, int control, double[] readout,
                                int direction) {
        if (readout.length != sys.stateCount()) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "readout has %d weights; the system has %d states", readout.length, sys.stateCount()));
        }
        double[] q = p.clone();
        q[control] = direction > 0 ? settings.lowerBound() : settings.upperBound();
        SteadyStateSolver ss = new SteadyStateSolver(1e-10, 1e-12, 50, 5000, 1e-3, 0);
        SteadyState start = ss.solve(sys, yStart, q);
        ContinuationSettings cs = settings.withEigenvalueLimit(0);
        Branch br = new PseudoArclength(cs).trace(sys, start.state(), q, control, direction);
        if (!br.folds().isEmpty()) {
            Fold f = br.folds().get(0);
            return new Threshold(Threshold.Kind.FOLD, control, f.parameter(), Folds.parameterGradient(sys, f, q),
                    f.state(), f);
        }
        return steepest(sys, br, q, control, readout, direction);
    }

    private Threshold steepest(OdeSystem sys, Branch traced, double[] p, int control, double[] c, int direction) {
        int n = sys.stateCount();
        Branch br = traced;
        int best = steepestIndex(sys, br, p, control, c);
        // Zoom: near a cusp the two folds can be closer than the step, so the trace may have stepped across the
        // small S between them. Re-trace between the neighbours of the steepest point with steps 1/50 of their
        // distance, twice; a fold found there is the threshold.
        for (int level = 0; level < ZOOM_LEVELS; level++) {
            BranchPoint a = br.point(best - 1);
            BranchPoint b = br.point(best + 1);
            double dist = Math.hypot(distance(a.state(), b.state()), a.parameter() - b.parameter());
            double lo = Math.min(a.parameter(), b.parameter());
            double hi = Math.max(a.parameter(), b.parameter());
            if (!(hi > lo) || !(dist > 0)) {
                break;
            }
            ContinuationSettings cs = settings.withBounds(lo, hi).withEigenvalueLimit(0)
                    .withSteps(dist / 200, Math.min(settings.minStep(), dist * 1e-9), dist / 50).withMaxPoints(2000);
            double[] q = p.clone();
            q[control] = a.parameter();
            Branch local = new PseudoArclength(cs).trace(sys, a.state(), q, control, direction);
            if (!local.folds().isEmpty()) {
                Fold f = local.folds().get(0);
                return new Threshold(Threshold.Kind.FOLD, control, f.parameter(), Folds.parameterGradient(sys, f, q),
                        f.state(), f);
            }
            int lb = steepestIndexOrMinusOne(sys, local, p, control, c);
            if (lb < 0) {
                break;
            }
            br = local;
            best = lb;
        }
        Evaluator ev = new Evaluator(sys, p, control, c);
        BranchPoint a = br.point(best - 1);
        BranchPoint b = br.point(best + 1);
        double la = a.parameter();
        double lb = b.parameter();
        double ga = ev.g(la, a.state());
        double gb = ev.g(lb, b.state());
        double[] y = br.point(best).state();
        if (ga * gb > 0) {
            throw new ContinuationException(String.format(Locale.ROOT,
                    "steepest response near λ = %.6g could not be bracketed (g = %.3g, %.3g)",
                    br.point(best).parameter(), ga, gb));
        }
        double lam = 0.5 * (la + lb);
        int side = 0;
        for (int it = 0; it < 100; it++) {
            lam = (la * gb - lb * ga) / (gb - ga);
            double gl = ev.g(lam, y);
            y = ev.y.clone();
            if (gl == 0 || Math.abs(lb - la) <= 1e-14 * (Math.abs(lam) + 1e-300)) {
                break;
            }
            if (gl * gb > 0) {
                lb = lam;
                gb = gl;
                if (side == 1) {
                    ga *= 0.5;
                }
                side = 1;
            } else {
                la = lam;
                ga = gl;
                if (side == -1) {
                    gb *= 0.5;
                }
                side = -1;
            }
            if (Math.abs(lb - la) <= 1e-13 * Math.max(Math.abs(lam), 1e-12)) {
                break;
            }
        }
        double[] yStar = y.clone();
        double hl = DIFF_STEP * Math.max(Math.abs(lam), 1e-3);
        double dgdl = (8 * (ev.g(lam + hl, yStar) - ev.g(lam - hl, yStar))
                - (ev.g(lam + 2 * hl, yStar) - ev.g(lam - 2 * hl, yStar))) / (12 * hl);
        double[] grad = new double[p.length];
        for (int k = 0; k < p.length; k++) {
            if (k == control) {
                continue;
            }
            double h = DIFF_STEP * Math.max(Math.abs(p[k]), 1e-3);
            double save = ev.p[k];
            double[] gk = new double[4];
            double[] offs = {h, -h, 2 * h, -2 * h};
            for (int j = 0; j < 4; j++) {
                ev.p[k] = save + offs[j];
                gk[j] = ev.g(lam, yStar);
            }
            ev.p[k] = save;
            grad[k] = -((8 * (gk[0] - gk[1]) - (gk[2] - gk[3])) / (12 * h)) / dgdl;
        }
        ev.g(lam, yStar);
        return new Threshold(Threshold.Kind.STEEPEST_RESPONSE, control, lam, grad, Arrays.copyOf(ev.y, n), null);
    }

    private int steepestIndex(OdeSystem sys, Branch br, double[] p, int control, double[] c) {
        int best = steepestIndexOrMinusOne(sys, br, p, control, c);
        if (best < 0) {
            int i = argmaxResponse(sys, br, p, control, c);
            throw new ContinuationException(String.format(Locale.ROOT,
                    "monostable response is steepest at the bound λ = %.6g: no switching threshold inside "
                            + "[%.6g, %.6g]", br.point(Math.max(i, 0)).parameter(), settings.lowerBound(),
                    settings.upperBound()));
        }
        return best;
    }

    private static int steepestIndexOrMinusOne(OdeSystem sys, Branch br, double[] p, int control, double[] c) {
        int best = argmaxResponse(sys, br, p, control, c);
        return best <= 0 || best >= br.size() - 1 ? -1 : best;
    }

    private static int argmaxResponse(OdeSystem sys, Branch br, double[] p, int control, double[] c) {
        int n = sys.stateCount();
        int m = sys.parameterCount();
        LinearSolver lu = LinearSolvers.forPattern(n, sys.jacobianPattern());
        double[] q = p.clone();
        double[] jac = new double[n * n];
        double[] jp = new double[n * m];
        double[] z = new double[n];
        int best = -1;
        double bestR = -1;
        for (int k = 0; k < br.size(); k++) {
            BranchPoint bp = br.point(k);
            double[] y = bp.state();
            q[control] = bp.parameter();
            sys.jacobianY(0, y, q, jac);
            sys.jacobianP(0, y, q, jp);
            double r;
            if (!lu.factor(jac, n)) {
                r = Double.POSITIVE_INFINITY;
            } else {
                for (int i = 0; i < n; i++) {
                    z[i] = -jp[i * m + control];
                }
                lu.solve(z, z);
                r = 0;
                for (int i = 0; i < n; i++) {
                    r += c[i] * z[i];
                }
                r = Math.abs(r);
            }
            if (r > bestR) {
                bestR = r;
                best = k;
            }
        }
        return best;
    }

    private static double distance(double[] a, double[] b) {
        double s = 0;
        for (int i = 0; i < a.length; i++) {
            s += (a[i] - b[i]) * (a[i] - b[i]);
        }
        return Math.sqrt(s);
    }

    /** g(λ) = c^T z' on the equilibrium branch; keeps its last equilibrium in y. One thread. */
    private static final class Evaluator {
        final OdeSystem sys;
        final double[] p;
        final int control;
        final double[] c;
        final int n;
        final int m;
        double[] y;
        private final LinearSolver lu;
        private final SteadyStateSolver tight = new SteadyStateSolver(1e-13, 1e-14, 60, 0, 1e-3, 0);
        private final SteadyStateSolver loose = new SteadyStateSolver(1e-11, 1e-13, 60, 0, 1e-3, 0);
        private final double[] jac;
        private final double[] jp;
        private final double[] jpp;
        private final double[] jpm;
        private final double[] dz;
        private final double[] djl;
        private final double[] scratchNn;
        private final double[] scratchN;
        private final double[] scratchM;
        private final double[] f;
        private final double[] z;
        private final double[] bz;
        private final double[] jlz;
        private final double[] rhs;

        Evaluator(OdeSystem sys, double[] p, int control, double[] c) {
            this.sys = sys;
            this.p = p.clone();
            this.control = control;
            this.c = c;
            this.n = sys.stateCount();
            this.m = sys.parameterCount();
            this.lu = LinearSolvers.forPattern(n, sys.jacobianPattern());
            jac = new double[n * n];
            jp = new double[n * m];
            jpp = new double[n * m];
            jpm = new double[n * m];
            dz = new double[n * n];
            djl = new double[n * n];
            scratchNn = new double[n * n];
            scratchN = new double[n];
            scratchM = new double[m];
            f = new double[n];
            z = new double[n];
            bz = new double[n];
            jlz = new double[n];
            rhs = new double[n];
        }

        double g(double lam, double[] guess) {
            p[control] = lam;
            try {
                y = tight.solve(sys, guess, p).state();
            } catch (ContinuationException e) {
                y = loose.solve(sys, guess, p).state();
            }
            // Two plain Newton steps past convergence: near a steep response g amplifies state errors by
            // |dy/dλ|^2 or more, so the equilibrium is taken to the rounding floor.
            for (int it = 0; it < 2; it++) {
                sys.rhs(0, y, p, f);
                sys.jacobianY(0, y, p, jac);
                if (lu.factor(jac, n)) {
                    lu.solve(f, f);
                    for (int i = 0; i < n; i++) {
                        y[i] -= f[i];
                    }
                }
            }
            sys.jacobianY(0, y, p, jac);
            sys.jacobianP(0, y, p, jp);
            if (!lu.factor(jac, n)) {
                throw new ContinuationException(String.format(Locale.ROOT,
                        "singular Jacobian at λ = %.6g while locating the steepest response", lam));
            }
            for (int i = 0; i < n; i++) {
                z[i] = -jp[i * m + control];
            }
            lu.solve(z, z);
            FoldMath.directionalJacobian(sys, y, p, z, dz, scratchN, scratchNn);
            FoldMath.parameterJacobianDerivative(sys, y, p, control, djl, scratchM, scratchNn);
            double eps = 1e-5 * (1 + Math.abs(lam));
            p[control] = lam + eps;
            sys.jacobianP(0, y, p, jpp);
            p[control] = lam - eps;
            sys.jacobianP(0, y, p, jpm);
            p[control] = lam;
            FoldMath.multiply(dz, z, bz, n);
            FoldMath.multiply(djl, z, jlz, n);
            for (int i = 0; i < n; i++) {
                double fll = (jpp[i * m + control] - jpm[i * m + control]) / (2 * eps);
                rhs[i] = -(bz[i] + 2 * jlz[i] + fll);
            }
            lu.solve(rhs, rhs);
            double g = 0;
            for (int i = 0; i < n; i++) {
                g += c[i] * rhs[i];
            }
            return g;
        }
    }
}
