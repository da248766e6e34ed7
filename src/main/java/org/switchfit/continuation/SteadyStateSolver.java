package org.switchfit.continuation;

import java.util.Locale;
import org.switchfit.ode.OdeSystem;

/**
 * Finds an equilibrium f(y, p) = 0 from a starting guess: damped Newton with the analytic Jacobian and Armijo
 * backtracking on ½|f|² (Dennis and Schnabel, Numerical Methods for Unconstrained Optimization and Nonlinear
 * Equations, 1983/1996, sec. 6.3), falling back to pseudo-transient continuation, i.e. implicit Euler steps
 * {@code (I/dt - J) Δy = f} with the step grown by switched evolution relaxation
 * {@code dt_{k+1} = dt_k |f_{k-1}| / |f_k|} (Kelley and Keyes 1998, SIAM J. Numer. Anal. 35:508-523,
 * doi:10.1137/S0036142996304796), with a Newton polish once |f| is small. Pseudo-transient continuation follows
 * the dynamics, so from a given start it tends to the stable equilibrium the trajectory approaches.
 *
 * <p>Systems with conservation laws have a singular Jacobian; solve their {@link ReducedSystem} instead.
 * Convergence: {@code max|f_i| <= residualTolerance}, or a Newton step with
 * {@code max|Δy_i| <= stepTolerance * (1 + max|y_i|)} after which |f| did not grow. Immutable and thread-safe
 * (each call allocates its own workspace).
 *
 * @param residualTolerance  absolute max-norm tolerance on f (units of f, e.g. concentration / time)
 * @param stepTolerance      relative tolerance on the Newton step
 * @param maxNewtonSteps     Newton iterations per attempt
 * @param maxTransientSteps  pseudo-transient steps before giving up
 * @param initialDt          first pseudo-time step (units of t)
 * @param eigenvalueLimit    all eigenvalues (stability) are computed when the system has at most this many states;
 *                           above it a sparse Jacobian gets its dominant eigenvalues from {@code CayleyArnoldi};
 *                           0 computes none
 */
public record SteadyStateSolver(double residualTolerance, double stepTolerance, int maxNewtonSteps,
                                int maxTransientSteps, double initialDt, int eigenvalueLimit) {

    /** Largest pseudo-time step (units of t). */
    private static final double MAX_DT = 1e12;

    /** Validates. */
    public SteadyStateSolver {
        if (!(residualTolerance > 0) || !(stepTolerance > 0) || maxNewtonSteps < 1 || maxTransientSteps < 0
                || !(initialDt > 0)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "need tolerances > 0 (got %.3g, %.3g), maxNewtonSteps >= 1 (got %d), maxTransientSteps >= 0 "
                            + "(got %d), initialDt > 0 (got %.3g)", residualTolerance, stepTolerance,
                    maxNewtonSteps, maxTransientSteps, initialDt));
        }
    }

    /**
     * Defaults: |f| 1e-10, step 1e-12, 50 Newton steps, 2000 pseudo-transient steps, dt0 1e-3, eigenvalues up to
     * 100 states (see {@link ContinuationSettings#of} for their cost).
     */
    public static SteadyStateSolver defaults() {
        return new SteadyStateSolver(1e-10, 1e-12, 50, 2000, 1e-3, 100);
    }

    /** Copy with other tolerances. */
    public SteadyStateSolver withTolerances(double residualTol, double stepTol) {
        return new SteadyStateSolver(residualTol, stepTol, maxNewtonSteps, maxTransientSteps, initialDt,
                eigenvalueLimit);
    }

    /**
     * Solves f(y, p) = 0 starting at y0.
     *
     * @throws ContinuationException when neither Newton nor pseudo-transient continuation converges
     */
    public SteadyState solve(OdeSystem sys, double[] y0, double[] p) {
        int n = sys.stateCount();
        double[] y = y0.clone();
        Work w = new Work(n, sys.jacobianPattern());
        int[] iters = {0};
        boolean ok = newton(sys, y, p, w, iters);
        if (!ok) {
            System.arraycopy(y0, 0, y, 0, n);
            ok = pseudoTransient(sys, y, p, w, iters, Math.max(residualTolerance * 1e3, 1e-8))
                    && newton(sys, y, p, w, iters);
        }
        sys.rhs(0, y, p, w.f);
        double res = maxAbs(w.f, n);
        if (!ok) {
            throw new ContinuationException(String.format(Locale.ROOT,
                    "no steady state found after %d iterations (last max|f| = %.6g, tolerance %.3g)",
                    iters[0], res, residualTolerance));
        }
        return classify(sys, y, p, res, iters[0], eigenvalueLimit);
    }

    /**
     * Follows the dynamics towards a steady state by pseudo-transient continuation only (no Newton polish, no
     * convergence requirement) and returns the state reached: a best-effort starting point, for example to decide
     * which directions are numerically resolvable before a full {@link #solve}.
     */
    public double[] relax(OdeSystem sys, double[] y0, double[] p) {
        int n = sys.stateCount();
        double[] y = y0.clone();
        Work w = new Work(n, sys.jacobianPattern());
        if (!pseudoTransient(sys, y, p, w, new int[1], 0.0)) {
            sys.rhs(0, y, p, w.f);
            if (!Double.isFinite(dot(w.f, n)) || !Double.isFinite(dot(y, n))) {
                return y0.clone();
            }
        }
        return y;
    }

    static SteadyState classify(OdeSystem sys, double[] y, double[] p, double res, int iters, int eigLimit) {
        int n = sys.stateCount();
        if (n > eigLimit) {
            int[][] pattern = sys.jacobianPattern();
            if (eigLimit <= 0 || !LinearSolvers.isSparse(n, pattern)) {
                return new SteadyState(y, p, res, -1, new double[0], new double[0], iters);
            }
            double[] jac = new double[n * n];
            sys.jacobianY(0, y, p, jac);
            double[][] partial = PseudoArclength.dominantSpectrum(jac, n, pattern);
            return partial == null ? new SteadyState(y, p, res, -1, new double[0], new double[0], iters)
                    : new SteadyState(y, p, res, Spectrum.unstableCount(partial[0], jac, n), partial[0], partial[1],
                    iters);
        }
        double[] jac = new double[n * n];
        sys.jacobianY(0, y, p, jac);
        double[] re = new double[n];
        double[] im = new double[n];
        if (!Spectrum.compute(jac, n, re, im)) {
            return new SteadyState(y, p, res, -1, new double[0], new double[0], iters);
        }
        return new SteadyState(y, p, res, Spectrum.unstableCount(re, jac, n), re, im, iters);
    }

    private static final class Work {
        final double[] f;
        final double[] fTrial;
        final double[] jac;
        final double[] dy;
        final double[] yTrial;
        final LinearSolver lu;

        Work(int n, int[][] pattern) {
            f = new double[n];
            fTrial = new double[n];
            jac = new double[n * n];
            dy = new double[n];
            yTrial = new double[n];
            lu = LinearSolvers.forPattern(n, pattern);
        }
    }

    /** Damped Newton in place; true on convergence. */
    private boolean newton(OdeSystem sys, double[] y, double[] p, Work w, int[] iters) {
        int n = y.length;
        sys.rhs(0, y, p, w.f);
        double phi = dot(w.f, n);
        if (!Double.isFinite(phi)) {
            return false;
        }
        for (int it = 0; it < maxNewtonSteps; it++) {
            if (maxAbs(w.f, n) <= residualTolerance) {
                return true;
            }
            iters[0]++;
            sys.jacobianY(0, y, p, w.jac);
            if (!w.lu.factor(w.jac, n)) {
                return false;
            }
            w.lu.solve(w.f, w.dy);
            double lambda = 1;
            boolean accepted = false;
            while (lambda >= 1e-6) {
                for (int i = 0; i < n; i++) {
                    w.yTrial[i] = y[i] - lambda * w.dy[i];
                }
                sys.rhs(0, w.yTrial, p, w.fTrial);
                double phiT = dot(w.fTrial, n);
                if (Double.isFinite(phiT) && phiT <= (1 - 1e-4 * lambda) * phi) {
                    accepted = true;
                    break;
                }
                lambda *= 0.5;
            }
            double stepNorm = maxAbs(w.dy, n) * lambda;
            double yNorm = maxAbs(y, n);
            if (!accepted) {
                // Rounding floor: a full step that is already tiny counts as converged.
                return maxAbs(w.dy, n) <= stepTolerance * (1 + yNorm);
            }
            System.arraycopy(w.yTrial, 0, y, 0, n);
            System.arraycopy(w.fTrial, 0, w.f, 0, n);
            phi = dot(w.f, n);
            if (lambda == 1 && stepNorm <= stepTolerance * (1 + yNorm)) {
                return true;
            }
        }
        return maxAbs(w.f, n) <= residualTolerance;
    }

    /**
     * Pseudo-transient continuation in place until max|f| &lt;= handover (with dt &gt; 1e3), or, when handover is
     * 0, until dt reaches its cap.
     */
    private boolean pseudoTransient(OdeSystem sys, double[] y, double[] p, Work w, int[] iters, double handover) {
        int n = y.length;
        double dt = initialDt;
        sys.rhs(0, y, p, w.f);
        double fNorm = Math.sqrt(dot(w.f, n));
        for (int k = 0; k < maxTransientSteps; k++) {
            if (!Double.isFinite(fNorm)) {
                return false;
            }
            if (maxAbs(w.f, n) <= handover && dt > 1e3) {
                return true;
            }
            if (handover == 0 && dt >= MAX_DT) {
                return true; // relax(): implicit Euler with steps of 1e12 has reached the slowest resolvable modes
            }
            iters[0]++;
            sys.jacobianY(0, y, p, w.jac);
            double inv = 1.0 / dt;
            for (int i = 0; i < n * n; i++) {
                w.jac[i] = -w.jac[i];
            }
            for (int i = 0; i < n; i++) {
                w.jac[i * n + i] += inv;
            }
            if (!w.lu.factor(w.jac, n)) {
                dt *= 0.5;
                continue;
            }
            w.lu.solve(w.f, w.dy);
            for (int i = 0; i < n; i++) {
                w.yTrial[i] = y[i] + w.dy[i];
            }
            sys.rhs(0, w.yTrial, p, w.fTrial);
            double newNorm = Math.sqrt(dot(w.fTrial, n));
            if (!Double.isFinite(newNorm)) {
                dt *= 0.25;
                continue;
            }
            System.arraycopy(w.yTrial, 0, y, 0, n);
            System.arraycopy(w.fTrial, 0, w.f, 0, n);
            // Switched evolution relaxation, but at least x1.5 after a step that did not raise |f|: on the slow
            // manifold of stiff networks |f| falls by a few per cent per step and the plain ratio rule would
            // need many thousands of steps (measured on a 500-species signalling model).
            double ratio = fNorm / Math.max(newNorm, 1e-300);
            double grow = ratio >= 1 ? Math.max(ratio, 1.5) : ratio;
            dt = Math.min(dt * Math.max(0.5, Math.min(grow, 10.0)), MAX_DT);
            fNorm = newNorm;
        }
        return maxAbs(w.f, n) <= handover;
    }

    static double dot(double[] a, int n) {
        double s = 0;
        for (int i = 0; i < n; i++) {
            s += a[i] * a[i];
        }
        return s;
    }

    static double maxAbs(double[] a, int n) {
        double s = 0;
        for (int i = 0; i < n; i++) {
            s = Math.max(s, Math.abs(a[i]));
        }
        return s;
    }
}
