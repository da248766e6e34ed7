package org.switchfit.continuation;

import java.util.SplittableRandom;
import org.hipparchus.complex.Complex;
import org.hipparchus.exception.MathRuntimeException;
import org.hipparchus.linear.Array2DRowRealMatrix;
import org.hipparchus.linear.EigenDecompositionNonSymmetric;
import org.hipparchus.linear.FieldVector;

/**
 * Stability of a large sparse Jacobian without its full spectrum: Arnoldi's method on the Cayley transform
 * {@code C = (J - σI)^-1 (J + σI)}, σ &gt; 0 (Garratt, Moore and Spence 1991, "Two methods for the numerical
 * detection of Hopf bifurcations", in Bifurcation and Chaos: Analysis, Algorithms, Applications, Birkhäuser,
 * pp. 129-133; Lehoucq and Salinger 2001, Int. J. Numer. Meth. Fluids 36:309-327, doi:10.1002/fld.135). Each
 * eigenvalue λ of J becomes {@code μ = (λ + σ) / (λ - σ)}, and |μ| &gt; 1 exactly when Re λ &gt; 0, so the
 * dominant eigenvalues of C, the ones Arnoldi finds first, are the unstable ones if there are any. One LU of
 * {@code J - σI} (sparse when the pattern is) serves every step: {@code C v = v + 2σ (J - σI)^-1 v}.
 *
 * <p>m steps of Arnoldi with full (twice repeated Gram-Schmidt) orthogonalisation, no restart; Ritz values of
 * the m x m Hessenberg matrix H with residual estimates {@code h_{m+1,m} |e_m^T y|} (Saad 2011, Numerical
 * Methods for Large Eigenvalue Problems, 2nd ed., SIAM, sec. 6.2). Start vector from a fixed seed. Per-call
 * workspace.
 */
final class CayleyArnoldi {
    private CayleyArnoldi() {
    }

    /** Ritz values mapped back to eigenvalues of J, with their residual estimates in the μ variable. */
    record Result(double[] re, double[] im, double[] muAbs, double[] residual, int steps) {
    }

    /**
     * Runs m Arnoldi steps on C.
     *
     * @param jac     n x n row-major Jacobian (read only)
     * @param pattern row pattern of jac, or null for dense
     * @param sigma   Cayley parameter &gt; 0 (about the magnitude of the eigenvalues of interest)
     * @param m       Krylov dimension (at most n)
     * @return Ritz values sorted by decreasing |μ|, or null when J - σI is singular or the small eigenproblem
     *         fails
     */
    static Result compute(double[] jac, int n, int[][] pattern, double sigma, int m) {
        if (!(sigma > 0) || m < 1 || m > n) {
            throw new IllegalArgumentException("need sigma > 0 and 1 <= m <= n, got " + sigma + ", " + m);
        }
        double[] a = jac.clone();
        for (int i = 0; i < n; i++) {
            a[i * n + i] -= sigma;
        }
        LinearSolver lu = LinearSolvers.forPattern(n, pattern);
        if (!lu.factor(a, n)) {
            return null;
        }
        double[][] v = new double[m + 1][];
        double[] h = new double[(m + 1) * m];
        SplittableRandom rnd = new SplittableRandom(20261202L);
        double[] v0 = new double[n];
        for (int i = 0; i < n; i++) {
            v0[i] = rnd.nextDouble() - 0.5;
        }
        scale(v0, 1 / norm(v0));
        v[0] = v0;
        double[] w = new double[n];
        int steps = m;
        for (int j = 0; j < m; j++) {
            lu.solve(v[j], w);
            for (int i = 0; i < n; i++) {
                w[i] = v[j][i] + 2 * sigma * w[i];
            }
            for (int pass = 0; pass < 2; pass++) {
                for (int i = 0; i <= j; i++) {
                    double d = dot(v[i], w);
                    h[i * m + j] += d;
                    for (int k = 0; k < n; k++) {
                        w[k] -= d * v[i][k];
                    }
                }
            }
            double beta = norm(w);
            h[(j + 1) * m + j] = beta;
            if (!(beta > 1e-14 * Math.abs(h[j * m + j]) + 1e-300)) {
                steps = j + 1; // invariant subspace found: its Ritz values are exact
                break;
            }
            v[j + 1] = w.clone();
            scale(v[j + 1], 1 / beta);
        }
        double[][] hm = new double[steps][steps];
        for (int i = 0; i < steps; i++) {
            for (int j = 0; j < steps; j++) {
                hm[i][j] = h[i * m + j];
            }
        }
        double hLast = steps < m ? 0 : h[steps * m + steps - 1];
        EigenDecompositionNonSymmetric ed;
        try {
            ed = new EigenDecompositionNonSymmetric(new Array2DRowRealMatrix(hm, false));
        } catch (MathRuntimeException e) {
            return null;
        }
        Complex[] mu = ed.getEigenvalues();
        int k = mu.length;
        Integer[] order = new Integer[k];
        for (int i = 0; i < k; i++) {
            order[i] = i;
        }
        java.util.Arrays.sort(order, (x, y) -> Double.compare(mu[y].norm(), mu[x].norm()));
        double[] re = new double[k];
        double[] im = new double[k];
        double[] abs = new double[k];
        double[] res = new double[k];
        for (int r = 0; r < k; r++) {
            int i = order[r];
            double ar = mu[i].getReal();
            double ai = mu[i].getImaginary();
            double den = (ar - 1) * (ar - 1) + ai * ai;
            re[r] = sigma * (ar * ar - 1 + ai * ai) / den;
            im[r] = -2 * sigma * ai / den;
            abs[r] = mu[i].norm();
            FieldVector<Complex> y = ed.getEigenvector(i);
            double ynorm = 0;
            for (int t = 0; t < steps; t++) {
                ynorm += y.getEntry(t).norm() * y.getEntry(t).norm();
            }
            res[r] = Math.abs(hLast) * y.getEntry(steps - 1).norm() / Math.sqrt(ynorm);
        }
        return new Result(re, im, abs, res, steps);
    }

    private static double dot(double[] x, double[] y) {
        double s = 0;
        for (int i = 0; i < x.length; i++) {
            s += x[i] * y[i];
        }
        return s;
    }

    private static double norm(double[] x) {
        return Math.sqrt(dot(x, x));
    }

    private static void scale(double[] x, double f) {
        for (int i = 0; i < x.length; i++) {
            x[i] *= f;
        }
    }
}
