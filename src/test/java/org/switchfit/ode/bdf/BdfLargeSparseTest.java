package org.switchfit.ode.bdf;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;
import org.switchfit.linalg.LuSolvers;
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.OdeSystem;
import org.switchfit.ode.SolverSettings;

class BdfLargeSparseTest {

    @Test
    void fiveHundredStateChainMatchesClosedForm() {
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

        // Closed form: A = -k L - d I with L the Laplacian of the path graph (reflecting ends), whose eigenpairs are
        // the DCT-II basis: lambda_m = 2 - 2 cos(pi m / n), v_m(i) = cos(pi m (i + 1/2) / n), |v_0|^2 = n,
        // |v_m|^2 = n / 2 (Strang, "The discrete cosine transform", SIAM Review 41(1), 1999,
        // doi:10.1137/S0036144598336745). So y(t) = sum_m exp(-(k lambda_m + d) t) (v_m . y0) v_m / |v_m|^2, and
        // since d shifts every eigenvalue, dy/dd = -t y(t) exactly.
        double[] ex = new double[n];
        for (int mode = 0; mode < n; mode++) {
            double lambda = 2 - 2 * Math.cos(Math.PI * mode / n);
            double dot = 0;
            for (int i = 0; i < n; i++) {
                dot += Math.cos(Math.PI * mode * (i + 0.5) / n) * y0[i];
            }
            double coef = dot * Math.exp(-(p[0] * lambda + p[1]) * t) / (mode == 0 ? n : n / 2.0);
            for (int i = 0; i < n; i++) {
                ex[i] += coef * Math.cos(Math.PI * mode * (i + 0.5) / n);
            }
        }
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

    @Test
    void brusselatorSparseAndDensePathsAgree() {
        int points = 100;
        OdeSystem sparse = TestSystems.brusselator(points);
        OdeSystem dense = TestSystems.densePattern(sparse);
        assertTrue(LuSolvers.useSparse(2 * points, sparse.jacobianPattern()));
        double[] p = {1.0, 3.0, 1.0 / 50};
        double[] y0 = TestSystems.brusselatorStart(points);
        double rtol = 1e-7;
        double atol = 1e-9;
        BdfIntegrator bdf = new BdfIntegrator(SolverSettings.defaults().withTolerances(rtol, atol));
        double[] ys = new double[2 * points];
        double[] yd = new double[2 * points];
        double[] ss = new double[2 * points];
        double[] sd = new double[2 * points];
        bdf.start(sparse, 0.0, y0, p, null, new int[] {1}, null).advance(5.0, ys, ss);
        bdf.start(dense, 0.0, y0, p, null, new int[] {1}, null).advance(5.0, yd, sd);
        for (int i = 0; i < 2 * points; i++) {
            // Two LU kernels on the same iteration matrices differ by rounding only (~1e-13 relative), far below
            // the error test, so the step sequences coincide; 1e-3 x rtol absolute bounds rounding growth over
            // the run for these O(1)-O(10) values.
            assertEquals(yd[i], ys[i], 1e-3 * rtol * 10, "y" + i);
            assertEquals(sd[i], ss[i], 1e-3 * rtol * 10 * Math.max(1, Math.abs(sd[i])), "dy/dB " + i);
        }
    }

    @Test
    void brusselatorSensitivityMatchesCentralDifference() {
        int points = 250;
        OdeSystem sys = TestSystems.brusselator(points);
        double[] p = {1.0, 3.0, 1.0 / 50};
        double[] y0 = TestSystems.brusselatorStart(points);
        double t = 2.0;
        IntegrationSession s = new BdfIntegrator(SolverSettings.defaults().withTolerances(1e-8, 1e-10))
                .start(sys, 0.0, y0, p, null, new int[] {1, 2}, null);
        double[] y = new double[2 * points];
        double[] sens = new double[4 * points];
        s.advance(t, y, sens);
        for (int k = 1; k <= 2; k++) {
            double[] fd = BdfSensitivityTest.centralDifference(sys, y0, p, k, t, 1e-11, 1e-13, 1e-4);
            double scale = 0;
            for (double v0 : fd) {
                scale = Math.max(scale, Math.abs(v0));
            }
            double worst = 0;
            for (int i = 0; i < 2 * points; i++) {
                worst = Math.max(worst, Math.abs(fd[i] - sens[(k - 1) * 2 * points + i]));
            }
            // Central differences, relative step 1e-4 at rtol 1e-11: truncation ~1e-8, noise ~1e-7 relative;
            // sensitivities at rtol 1e-8 within 100 x -> 1e-5 relative to the column scale.
            assertTrue(worst < 1e-5 * scale, "param " + k + ": worst " + worst + " scale " + scale);
        }
    }
}
