package org.switchfit.continuation;

import java.util.Arrays;
import org.switchfit.ode.OdeSystem;

/**
 * Locates a fold exactly by Newton's method on the minimally augmented system {@code (f(y, λ), g(y, λ)) = 0} in
 * n + 1 unknowns, where g is the last component of the solution of the bordered system
 * {@code [J b; c^T 0] (v, g) = (0, 1)}: g = 0 exactly when J is singular with null vector v (Govaerts 2000,
 * Numerical Methods for Bifurcations of Dynamical Equilibria, SIAM, ch. 4; Kuznetsov 2004, Elements of Applied
 * Bifurcation Theory, 3rd ed., sec. 10.2.1, "bordering"). It is equivalent to the standard extended system
 * {@code (f, J v, c^T v - 1) = 0} (same solutions) but needs only (n + 1)-order solves. With the adjoint
 * solution {@code [J b; c^T 0]^T (w, h) = (0, 1)}, the derivatives are {@code g_z = -w^T (∂J/∂z) v}; because
 * D²f is symmetric, {@code g_y = -(D_v J)^T w}, a single directional difference of the analytic Jacobian (see
 * {@link FoldMath}). Residuals use the analytic f and J, so the converged fold is exact to rounding. The borders
 * b, c are reset to the latest w, v each iteration. Per-call workspace.
 */
final class FoldRefiner {
    private FoldRefiner() {
    }

    /**
     * Refines from guesses: the minimally augmented system first, the standard extended system as fallback;
     * returns null when neither converges.
     *
     * @param p parameters with p[control] = λ guess (not modified)
     */
    static Fold refine(OdeSystem sys, double[] yGuess, double[] p, int control, double[] vGuess, double tol,
                       int maxIter) {
        Fold f = refineBordered(sys, yGuess, p, control, vGuess, tol, maxIter);
        return f != null ? f : refineExtended(sys, yGuess, p, control, vGuess, tol, maxIter);
    }

    /** The minimally augmented Newton iteration described in the class comment; null when it fails. */
    static Fold refineBordered(OdeSystem sys, double[] yGuess, double[] p, int control, double[] vGuess,
                               double tol, int maxIter) {
        int n = yGuess.length;
        int m = p.length;
        int n1 = n + 1;
        double[] y = yGuess.clone();
        double[] q = p.clone();
        double[] b = vGuess.clone();
        normalize(b, n);
        double[] c = b.clone();
        double[] f = new double[n];
        double[] jac = new double[n * n];
        double[] jp = new double[n * m];
        double[] dj = new double[n * n];
        double[] js = new double[n * n];
        double[] ys = new double[n];
        double[] ps = new double[m];
        double[] bord = new double[n1 * n1];
        double[] bordT = new double[n1 * n1];
        double[] newton = new double[n1 * n1];
        double[] v = new double[n1];
        double[] w = new double[n1];
        double[] r = new double[n1];
        double[] tmp = new double[n];
        int[][] jpat = sys.jacobianPattern();
        boolean sparse = LinearSolvers.isSparse(n, jpat);
        LinearSolver luB;
        LinearSolver luBT;
        LinearSolver luN;
        if (sparse) {
            int[][] pat = new int[n1][];
            int[][] patT = new int[n1][];
            int[] colCount = new int[n];
            for (int i = 0; i < n; i++) {
                for (int j : jpat[i]) {
                    colCount[j]++;
                }
            }
            int[][] cols = new int[n][];
            for (int j = 0; j < n; j++) {
                cols[j] = new int[colCount[j]];
                colCount[j] = 0;
            }
            for (int i = 0; i < n; i++) {
                pat[i] = LinearSolvers.union(jpat[i], 0, null, 0, n);
                for (int j : jpat[i]) {
                    cols[j][colCount[j]++] = i;
                }
            }
            for (int j = 0; j < n; j++) {
                patT[j] = LinearSolvers.union(cols[j], 0, null, 0, n);
            }
            pat[n] = LinearSolvers.denseRow(0, n1);
            patT[n] = LinearSolvers.denseRow(0, n1);
            luB = LinearSolvers.forPattern(n1, pat);
            luBT = LinearSolvers.forPattern(n1, patT);
            luN = LinearSolvers.forPattern(n1, pat);
        } else {
            luB = LinearSolvers.dense(n1);
            luBT = null;
            luN = LinearSolvers.dense(n1);
        }
        for (int it = 0; it < maxIter; it++) {
            sys.rhs(0, y, q, f);
            sys.jacobianY(0, y, q, jac);
            sys.jacobianP(0, y, q, jp);
            Arrays.fill(bord, 0);
            for (int i = 0; i < n; i++) {
                System.arraycopy(jac, i * n, bord, i * n1, n);
                bord[i * n1 + n] = b[i];
                bord[n * n1 + i] = c[i];
            }
            if (!luB.factor(bord, n1)) {
                return null;
            }
            if (luBT != null) {
                for (int i = 0; i < n1; i++) {
                    for (int j = 0; j < n1; j++) {
                        bordT[j * n1 + i] = bord[i * n1 + j];
                    }
                }
                if (!luBT.factor(bordT, n1)) {
                    return null;
                }
            }
            Arrays.fill(v, 0);
            v[n] = 1;
            luB.solve(v, v);
            Arrays.fill(w, 0);
            w[n] = 1;
            if (luBT != null) {
                luBT.solve(w, w);
            } else {
                luB.solveTransposed(w, w);
            }
            double g = v[n];
            FoldMath.directionalJacobian(sys, y, q, v, dj, ys, js);
            FoldMath.parameterJacobianDerivative(sys, y, q, control, js, ps, newton);
            // newton was used as scratch above; assemble it now: [J f_λ; g_y^T g_λ].
            Arrays.fill(newton, 0);
            double gl = 0;
            for (int i = 0; i < n; i++) {
                System.arraycopy(jac, i * n, newton, i * n1, n);
                newton[i * n1 + n] = jp[i * m + control];
                double s = 0;
                for (int k = 0; k < n; k++) {
                    s += js[i * n + k] * v[k];
                }
                gl -= w[i] * s;
            }
            for (int j = 0; j < n; j++) {
                double s = 0;
                for (int i = 0; i < n; i++) {
                    s += dj[i * n + j] * w[i];
                }
                newton[n * n1 + j] = -s;
            }
            newton[n * n1 + n] = gl;
            if (!luN.factor(newton, n1)) {
                return null;
            }
            System.arraycopy(f, 0, r, 0, n);
            r[n] = g;
            luN.solve(r, r);
            double step = SteadyStateSolver.maxAbs(r, n1);
            if (!Double.isFinite(step)) {
                return null;
            }
            for (int i = 0; i < n; i++) {
                y[i] -= r[i];
            }
            q[control] -= r[n];
            System.arraycopy(w, 0, b, 0, n);
            normalize(b, n);
            System.arraycopy(v, 0, c, 0, n);
            normalize(c, n);
            double scale = 1 + Math.max(SteadyStateSolver.maxAbs(y, n), Math.abs(q[control]));
            if (step <= tol * scale) {
                System.arraycopy(v, 0, tmp, 0, n);
                return FoldMath.foldAt(sys, y, q, control, tmp, true);
            }
        }
        return null;
    }

    /**
     * Refines by Newton on the standard extended system {@code G(y, λ, v) = (f, J v, c^T v - 1) = 0} in 2n + 1
     * unknowns (Kuznetsov 2004, sec. 10.2.1; Moore and Spence 1980, SIAM J. Numer. Anal. 17:567-576), c the
     * starting guess of v; second-derivative blocks by differences of the analytic Jacobian. Same solutions as
     * {@link #refine}, twice the order: used as fallback and as an independent cross-check in the tests.
     * Returns null when Newton does not converge.
     *
     * @param p parameters with p[control] = λ guess (not modified)
     */
    static Fold refineExtended(OdeSystem sys, double[] yGuess, double[] p, int control, double[] vGuess, double tol,
                       int maxIter) {
        int n = yGuess.length;
        int m = p.length;
        int nz = 2 * n + 1;
        double[] y = yGuess.clone();
        double[] q = p.clone();
        double[] v = vGuess.clone();
        double vn = Math.sqrt(SteadyStateSolver.dot(v, n));
        for (int i = 0; i < n; i++) {
            v[i] /= vn;
        }
        double[] c = v.clone();
        double[] jac = new double[n * n];
        double[] jp = new double[n * m];
        double[] dj = new double[n * n];
        double[] djp = new double[n * n];
        double[] ys = new double[n];
        double[] js = new double[n * n];
        double[] ps = new double[m];
        double[] big = new double[nz * nz];
        double[] r = new double[nz];
        double[] tmp = new double[n];
        int[][] jpat = sys.jacobianPattern();
        int[][] pat = new int[nz][];
        LinearSolver lu;
        if (LinearSolvers.isSparse(n, jpat)) {
            for (int i = 0; i < n; i++) {
                pat[i] = LinearSolvers.union(jpat[i], 0, null, 0, n);
                pat[n + i] = LinearSolvers.union(jpat[i], 0, jpat[i], n + 1, n);
            }
            pat[2 * n] = LinearSolvers.denseRow(n + 1, 2 * n + 1);
            lu = LinearSolvers.forPattern(nz, pat);
        } else {
            lu = LinearSolvers.dense(nz);
        }
        for (int it = 0; it < maxIter; it++) {
            sys.rhs(0, y, q, tmp);
            System.arraycopy(tmp, 0, r, 0, n);
            sys.jacobianY(0, y, q, jac);
            FoldMath.multiply(jac, v, tmp, n);
            System.arraycopy(tmp, 0, r, n, n);
            double cv = -1;
            for (int i = 0; i < n; i++) {
                cv += c[i] * v[i];
            }
            r[2 * n] = cv;
            sys.jacobianP(0, y, q, jp);
            FoldMath.directionalJacobian(sys, y, q, v, dj, ys, js);
            FoldMath.parameterJacobianDerivative(sys, y, q, control, djp, ps, js);
            java.util.Arrays.fill(big, 0);
            for (int i = 0; i < n; i++) {
                int r1 = i * nz;
                int r2 = (n + i) * nz;
                double djpv = 0;
                for (int j = 0; j < n; j++) {
                    big[r1 + j] = jac[i * n + j];
                    // ∂(J v)_i/∂y_j = Σ_k f_i,jk v_k = (D_v J)_ij (symmetry of D²f).
                    big[r2 + j] = dj[i * n + j];
                    big[r2 + n + 1 + j] = jac[i * n + j];
                    djpv += djp[i * n + j] * v[j];
                }
                big[r1 + n] = jp[i * m + control];
                big[r2 + n] = djpv;
                big[2 * n * nz + n + 1 + i] = c[i];
            }
            if (!lu.factor(big, nz)) {
                return null;
            }
            lu.solve(r, r);
            double step = SteadyStateSolver.maxAbs(r, nz);
            for (int i = 0; i < n; i++) {
                y[i] -= r[i];
                v[i] -= r[n + 1 + i];
            }
            q[control] -= r[n];
            if (!Double.isFinite(step)) {
                return null;
            }
            double scale = 1 + Math.max(SteadyStateSolver.maxAbs(y, n), Math.abs(q[control]));
            if (step <= tol * scale) {
                return FoldMath.foldAt(sys, y, q, control, v, true);
            }
        }
        return null;
    }

    private static void normalize(double[] x, int n) {
        double s = Math.sqrt(SteadyStateSolver.dot(x, n));
        if (s > 0) {
            for (int i = 0; i < n; i++) {
                x[i] /= s;
            }
        }
    }
}
