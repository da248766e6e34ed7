package org.switchfit.continuation;

import org.hipparchus.linear.Array2DRowRealMatrix;
import org.hipparchus.linear.RealMatrix;
import org.hipparchus.linear.SingularValueDecomposition;
import org.switchfit.ode.OdeSystem;

/**
 * Second-derivative contractions and null vectors used at folds. Second derivatives are central differences of
 * the analytic Jacobian: because D²f is symmetric, {@code Σ_k ∂²f_i/∂y_j∂y_k d_k = d/dε ∂f_i/∂y_j(y + ε d)}, so
 * one directional difference of J gives the whole contraction (truncation O(ε²)). Used only for Newton matrices
 * and the normal-form coefficient, never for residuals, so fold locations keep the accuracy of f and J.
 */
final class FoldMath {
    private FoldMath() {
    }

    /** Writes D_d J = d/dε J(y + ε d, p) into out (n x n) by central differences; scratch arrays of size n, n*n. */
    static void directionalJacobian(OdeSystem sys, double[] y, double[] p, double[] d, double[] out,
                                    double[] yScratch, double[] jScratch) {
        int n = y.length;
        double dn = Math.sqrt(SteadyStateSolver.dot(d, n));
        if (dn == 0) {
            java.util.Arrays.fill(out, 0, n * n, 0);
            return;
        }
        double eps = 1e-5 * (1 + SteadyStateSolver.maxAbs(y, n)) / dn;
        for (int i = 0; i < n; i++) {
            yScratch[i] = y[i] + eps * d[i];
        }
        sys.jacobianY(0, yScratch, p, out);
        for (int i = 0; i < n; i++) {
            yScratch[i] = y[i] - eps * d[i];
        }
        sys.jacobianY(0, yScratch, p, jScratch);
        double inv = 1 / (2 * eps);
        for (int i = 0; i < n * n; i++) {
            out[i] = (out[i] - jScratch[i]) * inv;
        }
    }

    /** Writes ∂J/∂p_k into out by central differences in p_k; scratch arrays of size m and n*n. */
    static void parameterJacobianDerivative(OdeSystem sys, double[] y, double[] p, int k, double[] out,
                                            double[] pScratch, double[] jScratch) {
        int nn = y.length * y.length;
        double eps = 1e-5 * (1 + Math.abs(p[k]));
        System.arraycopy(p, 0, pScratch, 0, p.length);
        pScratch[k] = p[k] + eps;
        sys.jacobianY(0, y, pScratch, out);
        pScratch[k] = p[k] - eps;
        sys.jacobianY(0, y, pScratch, jScratch);
        double inv = 1 / (2 * eps);
        for (int i = 0; i < nn; i++) {
            out[i] = (out[i] - jScratch[i]) * inv;
        }
    }

    /** y = A x for a row-major n x n matrix. */
    static void multiply(double[] a, double[] x, double[] y, int n) {
        for (int i = 0; i < n; i++) {
            double s = 0;
            int r = i * n;
            for (int j = 0; j < n; j++) {
                s += a[r + j] * x[j];
            }
            y[i] = s;
        }
    }

    /**
     * Left null vector w of a (nearly) singular J with right null vector v: solves the bordered system
     * {@code [J v; v^T 0]^T (w, s) = (0, 1)}, which is regular at a simple fold (Govaerts 2000, Numerical Methods
     * for Bifurcations of Dynamical Equilibria, SIAM, sec. 3.2), so J^T w = -s v with s = 0 exactly when J v = 0.
     * Falls back to the last left singular vector (SVD) when the bordered system is singular. Returned with
     * w^T v = 1 when |w^T v| is not tiny, else with |w| = 1.
     */
    static double[] leftNullVector(double[] jac, double[] v, int n) {
        int n1 = n + 1;
        double[] b = new double[n1 * n1];
        for (int i = 0; i < n; i++) {
            System.arraycopy(jac, i * n, b, i * n1, n);
            b[i * n1 + n] = v[i];
            b[n * n1 + i] = v[i];
        }
        LinearSolver lu = LinearSolvers.dense(n1);
        double[] w = new double[n];
        boolean ok = lu.factor(b, n1);
        if (ok) {
            double[] r = new double[n1];
            r[n] = 1;
            lu.solveTransposed(r, r);
            System.arraycopy(r, 0, w, 0, n);
            ok = Double.isFinite(SteadyStateSolver.dot(w, n)) && SteadyStateSolver.dot(w, n) > 0;
        }
        if (!ok) {
            double[][] a = new double[n][n];
            for (int i = 0; i < n; i++) {
                System.arraycopy(jac, i * n, a[i], 0, n);
            }
            RealMatrix u = new SingularValueDecomposition(new Array2DRowRealMatrix(a, false)).getU();
            for (int i = 0; i < n; i++) {
                w[i] = u.getEntry(i, n - 1);
            }
        }
        double wv = 0;
        for (int i = 0; i < n; i++) {
            wv += w[i] * v[i];
        }
        double norm = Math.sqrt(SteadyStateSolver.dot(w, n));
        double scale = Math.abs(wv) > 1e-8 * norm ? 1 / wv : 1 / norm;
        for (int i = 0; i < n; i++) {
            w[i] *= scale;
        }
        return w;
    }

    /** Fold data at (y, p) with right null vector v: w, a = w^T D²f(v,v), w^T f_λ. */
    static Fold foldAt(OdeSystem sys, double[] y, double[] p, int control, double[] v, boolean refined) {
        int n = y.length;
        int m = p.length;
        double[] jac = new double[n * n];
        sys.jacobianY(0, y, p, jac);
        double[] vn = v.clone();
        double vnorm = Math.sqrt(SteadyStateSolver.dot(vn, n));
        for (int i = 0; i < n; i++) {
            vn[i] /= vnorm;
        }
        double[] w = leftNullVector(jac, vn, n);
        double[] dj = new double[n * n];
        directionalJacobian(sys, y, p, vn, dj, new double[n], new double[n * n]);
        double[] bvv = new double[n];
        multiply(dj, vn, bvv, n);
        double[] jp = new double[n * m];
        sys.jacobianP(0, y, p, jp);
        double a = 0;
        double wf = 0;
        for (int i = 0; i < n; i++) {
            a += w[i] * bvv[i];
            wf += w[i] * jp[i * m + control];
        }
        // λ - λ* = -a ξ² / (2 w^T f_λ) near the fold: a maximum of λ when a / (w^T f_λ) > 0.
        Fold.Kind kind = a * wf > 0 ? Fold.Kind.MAXIMUM : Fold.Kind.MINIMUM;
        return new Fold(control, p[control], y, vn, w, a, wf, kind, refined, -1);
    }
}
