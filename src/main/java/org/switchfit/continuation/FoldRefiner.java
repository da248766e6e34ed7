package org.switchfit.continuation;

import org.switchfit.ode.OdeSystem;

/**
 * Locates a fold exactly by Newton's method on the standard extended system
 * {@code G(y, λ, v) = (f(y, λ), J(y, λ) v, c^T v - 1) = 0} in 2n + 1 unknowns (Kuznetsov 2004, Elements of
 * Applied Bifurcation Theory, 3rd ed., sec. 10.2.1; Moore and Spence 1980, SIAM J. Numer. Anal. 17:567-576,
 * doi:10.1137/0717048). c is the starting guess of v. The Newton matrix uses finite-difference second derivatives
 * (see {@link FoldMath}); the residual uses the analytic f and J, so the converged fold is exact to rounding.
 * Per-call workspace.
 */
final class FoldRefiner {
    private FoldRefiner() {
    }

    /**
     * Refines from guesses; returns null when Newton does not converge.
     *
     * @param p parameters with p[control] = λ guess (not modified)
     */
    static Fold refine(OdeSystem sys, double[] yGuess, double[] p, int control, double[] vGuess, double tol,
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
        for (int i = 0; i < n; i++) {
            pat[i] = LinearSolvers.union(jpat[i], 0, null, 0, n);
            pat[n + i] = LinearSolvers.union(jpat[i], 0, jpat[i], n + 1, n);
        }
        pat[2 * n] = LinearSolvers.denseRow(n + 1, 2 * n + 1);
        LinearSolver lu = LinearSolvers.forPattern(nz, pat);
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
}
