package org.switchfit.ode.bdf;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.junit.jupiter.api.Test;
import org.switchfit.linalg.LuSolvers;
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.OdeSystem;
import org.switchfit.ode.SolverSettings;

class BdfLargeSparseTest {

    @Test
    void fiveHundredStateChainMatchesEigenDecomposition() {
        int n = 500;
        OdeSystem sys = TestSystems.chain(n);
        assertTrue(LuSolvers.useSparse(n, sys.jacobianPattern()), "tridiagonal 500 x 500 must take the sparse LU");
        double[] p = {50.0, 0.1};
        double[] y0 = new double[n];
        y0[0] = 1.0;
        y0[n / 2] = 2.0;
        double t = 0.5;
        double rtol = 1e-8;
        double atol = 1e-12;
        IntegrationSession s = new BdfIntegrator(SolverSettings.defaults().withTolerances(rtol, atol))
                .start(sys, 0.0, y0, p, null, new int[] {1}, null);
        double[] y = new double[n];
        double[] sens = new double[n];
        s.advance(t, y, sens);

        // Oracle: y(t) = V diag(exp(lambda t)) V^T y0 for the symmetric A (Commons Math 3.6.1
        // EigenDecomposition); the decay rate d shifts every eigenvalue, so dy/dd = -t y(t) exactly.
        double[] jac = new double[n * n];
        sys.jacobianY(0, y0, p, jac);
        double[][] rows = new double[n][n];
        for (int i = 0; i < n; i++) {
            System.arraycopy(jac, i * n, rows[i], 0, n);
        }
        EigenDecomposition eig = new EigenDecomposition(new Array2DRowRealMatrix(rows, false));
        RealMatrix v = eig.getV();
        double[] lam = eig.getRealEigenvalues();
        double[] c = v.transpose().operate(y0);
        for (int k = 0; k < n; k++) {
            c[k] *= Math.exp(lam[k] * t);
        }
        double[] ex = v.operate(c);
        double worst = 0;
        double worstS = 0;
        for (int i = 0; i < n; i++) {
            worst = Math.max(worst, Math.abs(y[i] - ex[i]));
            worstS = Math.max(worstS, Math.abs(sens[i] + t * ex[i]));
        }
        // 100 x (rtol x max|y| + atol) with max|y| = 2 (common practice global/local factor).
        assertTrue(worst < 100 * (rtol * 2 + atol), "max error " + worst);
        // Sensitivity scale max |dy/dd| <= t max|y| = 1.
        assertTrue(worstS < 100 * (rtol * 1 + atol), "max sensitivity error " + worstS);
        // Total decays as exp(-d t) exactly (the exchange conserves mass).
        double total = 0;
        for (double v0 : y) {
            total += v0;
        }
        assertEquals(3.0 * Math.exp(-p[1] * t), total, 1e-6 * 3);
    }
}
