package org.switchfit.fit;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/**
 * Levenberg-Marquardt on NIST StRD nonlinear regression data sets (https://www.itl.nist.gov/div898/strd/nls/
 * nls_main.shtml), started from the official "Start 1" and "Start 2" values; the fit must reproduce the certified
 * parameter values.
 *
 * <p>Provenance: data, start values and certified values below were typed from memory, unverified against the
 * NIST pages (Misra1a.dat, MGH09.dat, DanWood.dat). As a self-check, each test first evaluates the residual sum of
 * squares at the certified parameters and compares it with the certified residual sum of squares to 1e-9
 * relative: a mistyped data value would change that 11-digit number, so a pass there confirms the typed data.
 *
 * <p>Tolerance on parameters: REL_TOL_PARAM = 1e-6 relative. NIST's own guidance is that a good solver reaches
 * 4 to 6 agreeing significant digits on the higher-difficulty problems; we ask for 6 (the certified values have
 * 11), limited by the conditioning of MGH09 (condition number of J about 1e3 at the solution, so a cost accurate
 * to 1e-12 relative pins the parameters to about 1e-7 relative).
 */
class NistStrdTest {

    private static final double REL_TOL_PARAM = 1e-6;
    /** The certified RSS has 11 significant digits; double evaluation of 14 terms is exact to ~1e-15. */
    private static final double REL_TOL_RSS_CHECK = 1e-9;

    private static final LevenbergMarquardt LM = LevenbergMarquardt.defaults()
            .withCostTolerance(1e-15).withStepTolerance(1e-12).withGradientTolerance(1e-14);

    // Misra1a (NIST StRD, lower difficulty): y = b1 * (1 - exp(-b2 * x)); 14 observations.
    // Certified: b1 = 2.3894212918E+02, b2 = 5.5015643181E-04, RSS = 1.2455138894E-01 (from memory, unverified;
    // confirmed indirectly by the RSS self-check).
    private static final double[] MISRA_X = {77.6, 114.9, 141.1, 190.8, 239.9, 289.0, 332.8, 378.4, 434.8, 477.3,
        536.8, 593.1, 689.1, 760.0};
    private static final double[] MISRA_Y = {10.07, 14.73, 17.94, 23.93, 29.61, 35.18, 40.02, 44.82, 50.76, 55.05,
        61.01, 66.40, 75.47, 81.78};

    private static CurveObjective misra1a() {
        return new CurveObjective(MISRA_X, MISRA_Y, 1.0, 2, (x, b, g) -> {
            double e = Math.exp(-b[1] * x);
            g[0] = 1 - e;
            g[1] = b[0] * x * e;
            return b[0] * (1 - e);
        });
    }

    @Test
    void misra1aFromBothStarts() {
        double[] cert = {2.3894212918E+02, 5.5015643181E-04};
        CurveObjective obj = misra1a();
        assertEquals(1.2455138894E-01, obj.residualSumOfSquares(cert), 1.2455138894E-01 * REL_TOL_RSS_CHECK);
        FitProblem p = FitProblem.of(obj, new String[] {"b1", "b2"}, new double[] {-1e6, -1e6},
                new double[] {1e6, 1e6});
        for (double[] start : new double[][] {{500, 1e-4}, {250, 5e-4}}) {
            LocalFit f = LM.minimize(p, start);
            assertTrue(f.termination().converged(), f.termination().toString());
            assertClose(cert, f.theta());
        }
    }

    // MGH09 (Kowalik and Osborne 1968; NIST StRD, higher difficulty): y = b1 (x² + x b2) / (x² + x b3 + b4);
    // 11 observations. Certified: b1 = 1.9280693458E-01, b2 = 1.9128232873E-01, b3 = 1.2305650693E-01,
    // b4 = 1.3606233068E-01, RSS = 3.0750560385E-04 (from memory, unverified; confirmed by the RSS self-check).
    // Both starts: Start 1 (25, 39, 41.5, 39) is the hard one (far from the solution, through a region where
    // the denominator changes scale); Start 2 (0.25, 0.39, 0.415, 0.39).
    private static final double[] MGH09_X = {4.0, 2.0, 1.0, 0.5, 0.25, 0.167, 0.125, 0.1, 0.0833, 0.0714, 0.0625};
    private static final double[] MGH09_Y = {1.957000E-01, 1.947000E-01, 1.735000E-01, 1.600000E-01, 8.440000E-02,
        6.270000E-02, 4.560000E-02, 3.420000E-02, 3.230000E-02, 2.350000E-02, 2.460000E-02};

    private static CurveObjective mgh09() {
        return new CurveObjective(MGH09_X, MGH09_Y, 1.0, 4, (x, b, g) -> {
            double num = x * x + x * b[1];
            double den = x * x + x * b[2] + b[3];
            g[0] = num / den;
            g[1] = b[0] * x / den;
            g[2] = -b[0] * num * x / (den * den);
            g[3] = -b[0] * num / (den * den);
            return b[0] * num / den;
        });
    }

    @Test
    void mgh09FromBothStarts() {
        double[] cert = {1.9280693458E-01, 1.9128232873E-01, 1.2305650693E-01, 1.3606233068E-01};
        CurveObjective obj = mgh09();
        assertEquals(3.0750560385E-04, obj.residualSumOfSquares(cert), 3.0750560385E-04 * REL_TOL_RSS_CHECK);
        FitProblem p = FitProblem.of(obj, new String[] {"b1", "b2", "b3", "b4"}, new double[] {-1e3, -1e3, -1e3,
            -1e3}, new double[] {1e3, 1e3, 1e3, 1e3});
        for (double[] start : new double[][] {{25, 39, 41.5, 39}, {0.25, 0.39, 0.415, 0.39}}) {
            LocalFit f = LM.minimize(p, start);
            assertTrue(f.termination().converged(), f.termination().toString());
            assertClose(cert, f.theta());
            // The default configuration reaches the same digits (measured: 5e-8 relative from Start 1).
            assertClose(cert, LevenbergMarquardt.defaults().minimize(p, start).theta());
        }
    }

    // DanWood (Daniel and Wood 1980; NIST StRD, lower difficulty): y = b1 * x^b2; 6 observations.
    // Certified: b1 = 7.6886226176E-01, b2 = 3.8604055871E+00, RSS = 4.3173084083E-03 (from memory, unverified;
    // confirmed by the RSS self-check). Starts: (1, 5) and (0.7, 4).
    @Test
    void danWoodFromBothStarts() {
        double[] cert = {7.6886226176E-01, 3.8604055871E+00};
        CurveObjective obj = new CurveObjective(new double[] {1.309, 1.471, 1.490, 1.565, 1.611, 1.680},
                new double[] {2.138, 3.421, 3.597, 4.340, 4.882, 5.660}, 1.0, 2, (x, b, g) -> {
                    double p = Math.pow(x, b[1]);
                    g[0] = p;
                    g[1] = b[0] * p * Math.log(x);
                    return b[0] * p;
                });
        assertEquals(4.3173084083E-03, obj.residualSumOfSquares(cert), 4.3173084083E-03 * REL_TOL_RSS_CHECK);
        FitProblem p = FitProblem.of(obj, new String[] {"b1", "b2"}, new double[] {-100, -100},
                new double[] {100, 100});
        for (double[] start : new double[][] {{1, 5}, {0.7, 4}}) {
            LocalFit f = LM.minimize(p, start);
            assertTrue(f.termination().converged(), f.termination().toString());
            assertClose(cert, f.theta());
        }
    }

    // Rat42 (Ratkowsky 1983; NIST StRD, higher difficulty): y = b1 / (1 + exp(b2 - b3 x)); 9 observations.
    // Certified: b1 = 7.2462237576E+01, b2 = 2.6180768402E+00, b3 = 6.7359200066E-02, RSS = 8.0565229338E+00
    // (from memory, unverified; confirmed by the RSS self-check). Starts: (100, 1, 0.1) and (75, 2.5, 0.07).
    @Test
    void rat42FromBothStarts() {
        double[] cert = {7.2462237576E+01, 2.6180768402E+00, 6.7359200066E-02};
        CurveObjective obj = new CurveObjective(new double[] {9, 14, 21, 28, 42, 57, 63, 70, 79},
                new double[] {8.93, 10.8, 18.59, 22.33, 39.35, 56.11, 61.73, 64.62, 67.08}, 1.0, 3, (x, b, g) -> {
                    double e = Math.exp(b[1] - b[2] * x);
                    double d = 1 + e;
                    g[0] = 1 / d;
                    g[1] = -b[0] * e / (d * d);
                    g[2] = b[0] * x * e / (d * d);
                    return b[0] / d;
                });
        assertEquals(8.0565229338E+00, obj.residualSumOfSquares(cert), 8.0565229338E+00 * REL_TOL_RSS_CHECK);
        FitProblem p = FitProblem.of(obj, new String[] {"b1", "b2", "b3"}, new double[] {-1e4, -1e4, -1e4},
                new double[] {1e4, 1e4, 1e4});
        for (double[] start : new double[][] {{100, 1, 0.1}, {75, 2.5, 0.07}}) {
            LocalFit f = LM.minimize(p, start);
            assertTrue(f.termination().converged(), f.termination().toString());
            assertClose(cert, f.theta());
        }
    }

    // BoxBOD (Box et al. 1978; NIST StRD, higher difficulty): y = b1 (1 - exp(-b2 x)); 6 observations.
    // Certified: b1 = 2.1380940889E+02, b2 = 5.4723748542E-01, RSS = 1.1680088766E+03 (from memory, unverified;
    // confirmed by the RSS self-check). Starts: (1, 1) and (100, 0.75). Unbounded, Start 1 runs onto the plateau
    // b2 -> large where exp(-b2 x) vanishes and the gradient in b2 with it (a stationary point of the data fit,
    // y = mean); with the physically sensible bound 0 <= b2 <= 10 the bounded LM reaches the certified values from
    // Start 1 as well.
    @Test
    void boxBodWithAndWithoutBounds() {
        double[] cert = {2.1380940889E+02, 5.4723748542E-01};
        CurveObjective obj = new CurveObjective(new double[] {1, 2, 3, 5, 7, 10},
                new double[] {109, 149, 149, 191, 213, 224}, 1.0, 2, (x, b, g) -> {
                    double e = Math.exp(-b[1] * x);
                    g[0] = 1 - e;
                    g[1] = b[0] * x * e;
                    return b[0] * (1 - e);
                });
        assertEquals(1.1680088766E+03, obj.residualSumOfSquares(cert), 1.1680088766E+03 * REL_TOL_RSS_CHECK);
        FitProblem free = FitProblem.of(obj, new String[] {"b1", "b2"}, new double[] {-1e4, -1e4},
                new double[] {1e4, 1e4});
        LocalFit f2 = LM.minimize(free, new double[] {100, 0.75});
        assertTrue(f2.termination().converged(), f2.termination().toString());
        assertClose(cert, f2.theta());
        FitProblem bounded = FitProblem.of(obj, new String[] {"b1", "b2"}, new double[] {0, 0},
                new double[] {1000, 10});
        LocalFit f1 = LM.minimize(bounded, new double[] {1, 1});
        assertTrue(f1.termination().converged(), f1.termination().toString());
        assertClose(cert, f1.theta());
    }

    private static void assertClose(double[] expected, double[] actual) {
        for (int k = 0; k < expected.length; k++) {
            assertEquals(expected[k], actual[k], Math.abs(expected[k]) * REL_TOL_PARAM, "parameter b" + (k + 1));
        }
    }
}
