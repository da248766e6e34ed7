package org.switchfit.profile;

import org.hipparchus.linear.Array2DRowRealMatrix;
import org.hipparchus.linear.RealMatrix;
import org.hipparchus.linear.SingularValueDecomposition;
import org.switchfit.fit.FitProblem;

/**
 * The Gauss-Newton curvature at a point: J of the free parameters, its singular value decomposition
 * J = U S Vᵀ, and the pseudo-inverse of the Fisher information H = JᵀJ, {@code H⁺ = V S⁻² Vᵀ}, keeping singular
 * values above {@code relTol · s_max}. Used for initial profile steps and predictors, where a rough but finite
 * answer is all that is needed, and for the rank check. Package-private.
 */
final class LocalCurvature {

    final int n;
    final int[] free;
    final double[] singularValues;
    /** Right singular vectors as columns over free parameters: v[f][c]. */
    final double[][] rightVectors;
    /** H⁺ over all parameters (zeros for fixed ones), row-major n × n. */
    final double[] covariance;
    final int rank;

    LocalCurvature(FitProblem problem, double[] theta, double relTol) {
        n = problem.parameterCount();
        int m = problem.objective().residualCount();
        int nf = problem.freeCount();
        free = new int[nf];
        int c = 0;
        for (int k = 0; k < n; k++) {
            if (!problem.isFixed(k)) {
                free[c++] = k;
            }
        }
        double[] r = new double[m];
        double[] jac = new double[m * n];
        problem.objective().evaluate(theta, r, jac);
        covariance = new double[n * n];
        if (nf == 0) {
            singularValues = new double[0];
            rightVectors = new double[0][0];
            rank = 0;
            return;
        }
        // Pad with zero rows so the decomposition sees at least as many rows as columns.
        int rows = Math.max(m, nf);
        double[][] a = new double[rows][nf];
        for (int i = 0; i < m; i++) {
            for (int f = 0; f < nf; f++) {
                a[i][f] = jac[i * n + free[f]];
            }
        }
        RealMatrix jm = new Array2DRowRealMatrix(a, false);
        SingularValueDecomposition svd = new SingularValueDecomposition(jm);
        double[] s = svd.getSingularValues();
        RealMatrix v = svd.getV();
        int p = s.length;
        singularValues = s.clone();
        rightVectors = v.getData();
        double smax = p > 0 ? s[0] : 0;
        int rk = 0;
        for (int q = 0; q < p; q++) {
            if (s[q] > relTol * smax && s[q] > 0) {
                rk++;
                double w = 1.0 / (s[q] * s[q]);
                for (int f1 = 0; f1 < nf; f1++) {
                    double a1 = v.getEntry(f1, q) * w;
                    for (int f2 = 0; f2 < nf; f2++) {
                        covariance[free[f1] * n + free[f2]] += a1 * v.getEntry(f2, q);
                    }
                }
            }
        }
        rank = rk;
    }

    /** H⁺ g (length n). */
    double[] covarianceTimes(double[] g) {
        double[] out = new double[n];
        for (int i = 0; i < n; i++) {
            double sum = 0;
            for (int j = 0; j < n; j++) {
                sum += covariance[i * n + j] * g[j];
            }
            out[i] = sum;
        }
        return out;
    }
}
