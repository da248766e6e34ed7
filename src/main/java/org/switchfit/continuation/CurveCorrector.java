package org.switchfit.continuation;

/**
 * Tangent and Newton corrector of Keller's pseudo-arclength method (Keller 1977, "Numerical solution of
 * bifurcation and nonlinear eigenvalue problems", in Applications of Bifurcation Theory, Academic Press,
 * pp. 359-384): the curve H(u) = 0 is parametrised by arclength s, the corrector solves the bordered system
 * {@code [H(u); t^T (u - u_pred)] = 0} by Newton with matrix {@code [H_u; t^T]}, and the tangent at u solves
 * {@code [H_u(u); t_prev^T] z = e_{N+1}}, t = z / |z| (so t keeps the orientation of t_prev).
 * Workspace owned; not thread-safe.
 */
final class CurveCorrector {
    private final CurveProblem problem;
    private final int n1;
    private final double[] jac;
    private final double[] bordered;
    private final double[] rhs;
    private final double[] h;
    private final LinearSolver lu;
    private final double tolerance;
    private final int maxIterations;
    /** Unit weights and scratch of {@link #step}. */
    private final double[] ones;
    private final double[] border;

    CurveCorrector(CurveProblem problem, double tolerance, int maxIterations) {
        this.problem = problem;
        int nEq = problem.equationCount();
        this.n1 = nEq + 1;
        this.jac = new double[nEq * n1];
        this.bordered = new double[n1 * n1];
        this.rhs = new double[n1];
        this.h = new double[nEq];
        int[][] rows = problem.pattern();
        if (rows == null) {
            this.lu = LinearSolvers.forSize(n1);
        } else {
            int[][] bordered = new int[n1][];
            System.arraycopy(rows, 0, bordered, 0, nEq);
            bordered[nEq] = LinearSolvers.denseRow(0, n1);
            // A problem that returns a pattern asks for the sparse LU (EquilibriumProblem applies the choice of
            // LinearAlgebra; others keep the size and density thresholds).
            this.lu = problem instanceof EquilibriumProblem ? LinearSolvers.sparse(n1, bordered)
                    : LinearSolvers.forPattern(n1, bordered);
        }
        this.tolerance = tolerance;
        this.maxIterations = maxIterations;
        this.ones = new double[n1];
        java.util.Arrays.fill(ones, 1.0);
        this.border = new double[n1];
    }

    int size() {
        return n1;
    }

    /** Whether the bordered systems are factored by the sparse LU. */
    boolean isSparse() {
        return lu instanceof LinearSolvers.SparseAdapter;
    }

    CurveProblem problem() {
        return problem;
    }

    private boolean factorBordered(double[] u, double[] t) {
        problem.jacobian(u, jac);
        int nEq = n1 - 1;
        System.arraycopy(jac, 0, bordered, 0, nEq * n1);
        System.arraycopy(t, 0, bordered, nEq * n1, n1);
        return lu.factor(bordered, n1);
    }

    /** Unit tangent at u oriented like tRef (|tRef| need not be 1); false when the bordered matrix is singular. */
    boolean tangent(double[] u, double[] tRef, double[] tOut) {
        if (!factorBordered(u, tRef)) {
            return false;
        }
        java.util.Arrays.fill(rhs, 0);
        rhs[n1 - 1] = 1;
        lu.solve(rhs, tOut);
        double norm = Math.sqrt(SteadyStateSolver.dot(tOut, n1));
        if (!(norm > 0) || !Double.isFinite(norm)) {
            return false;
        }
        for (int i = 0; i < n1; i++) {
            tOut[i] /= norm;
        }
        return true;
    }

    /**
     * Newton on {@code [H(u); t^T (u - uPred)] = 0} starting at uPred, result in uOut.
     *
     * @return number of iterations, or -1 when not converged within the limit
     */
    int correct(double[] uPred, double[] t, double[] uOut) {
        System.arraycopy(uPred, 0, uOut, 0, n1);
        int nEq = n1 - 1;
        double prevStep = Double.POSITIVE_INFINITY;
        for (int it = 1; it <= maxIterations; it++) {
            problem.evaluate(uOut, h);
            double s = 0;
            for (int i = 0; i < n1; i++) {
                s += t[i] * (uOut[i] - uPred[i]);
            }
            System.arraycopy(h, 0, rhs, 0, nEq);
            rhs[nEq] = s;
            if (!Double.isFinite(SteadyStateSolver.dot(rhs, n1)) || !factorBordered(uOut, t)) {
                return -1;
            }
            lu.solve(rhs, rhs);
            double step = SteadyStateSolver.maxAbs(rhs, n1);
            for (int i = 0; i < n1; i++) {
                uOut[i] -= rhs[i];
            }
            double scale = 1 + SteadyStateSolver.maxAbs(uOut, n1);
            if (step <= tolerance * scale) {
                return it;
            }
            if (it > 2 && step > 0.5 * prevStep) {
                return -1; // not contracting: let the caller shorten the step
            }
            prevStep = step;
        }
        return -1;
    }

    /** Smallest cosine between successive tangents for a step to count as regular (about 25 degrees of turn). */
    static final double MIN_COS_TURN = 0.9;
    /**
     * Largest corrector move, in units of the step: with the turn limit a regular correction moves about κh²/2
     * &lt;= 0.23 h, so a corrector that lands farther has likely jumped to another part of the curve (e.g. across
     * a small S between two close folds).
     */
    static final double MAX_CORRECTION = 0.3;

    /**
     * One pseudo-arclength predictor-corrector step of length h from (u, t): Euler predictor, Newton corrector
     * ({@link #correct}) into uNew and the new tangent into tNew. The step is regular when the corrector
     * converged, the tangent turned by less than {@link #MIN_COS_TURN} and the corrector moved less than
     * {@link #MAX_CORRECTION} h; at steps below {@code 2 minStep} only convergence counts.
     *
     * @param uPred scratch for the predictor (length {@link #size()})
     * @return the corrector's iterations when the step is regular, else -1
     */
    int step(double[] u, double[] t, double h, double minStep, double[] uPred, double[] uNew, double[] tNew) {
        return stepWeighted(u, t, ones, h, minStep, uPred, border, uNew, tNew);
    }

    /**
     * {@link #step} with the arclength measured in the weighted norm {@code |W du|}, W = diag(w) (w &gt; 0): the
     * unit tangent in the weighted variables v = W u is {@code tv = W t / |W t|}, the predictor
     * {@code u + h W⁻¹ tv}, the corrector's hyperplane {@code (W tv)ᵀ (u - uPred) = 0} (so h, minStep and the
     * turn and correction limits are all in the weighted norm). With w = 1 this is {@link #step}.
     *
     * @param w      weights per unknown (length {@link #size()})
     * @param border scratch (length {@link #size()})
     */
    int stepWeighted(double[] u, double[] t, double[] w, double h, double minStep, double[] uPred, double[] border,
                     double[] uNew, double[] tNew) {
        double nt = 0;
        for (int i = 0; i < n1; i++) {
            nt += (w[i] * t[i]) * (w[i] * t[i]);
        }
        nt = Math.sqrt(nt);
        if (!(nt > 0) || !Double.isFinite(nt)) {
            return -1;
        }
        for (int i = 0; i < n1; i++) {
            double tv = w[i] * t[i] / nt;
            uPred[i] = u[i] + h * tv / w[i];
            border[i] = w[i] * tv;
        }
        int iters = correct(uPred, border, uNew);
        if (iters <= 0 || !tangent(uNew, t, tNew)) {
            return -1;
        }
        if (h <= 2 * minStep) {
            return iters;
        }
        double dot = 0;
        double nn = 0;
        double dist = 0;
        for (int i = 0; i < n1; i++) {
            double a = w[i] * tNew[i];
            dot += w[i] * t[i] * a;
            nn += a * a;
            double d = w[i] * (uPred[i] - uNew[i]);
            dist += d * d;
        }
        double cos = dot / (nt * Math.sqrt(nn));
        return cos >= MIN_COS_TURN && Math.sqrt(dist) <= MAX_CORRECTION * h ? iters : -1;
    }

    /** Euclidean distance of the first len entries. */
    static double distance(double[] a, double[] b, int len) {
        double s = 0;
        for (int i = 0; i < len; i++) {
            double d = a[i] - b[i];
            s += d * d;
        }
        return Math.sqrt(s);
    }
}
