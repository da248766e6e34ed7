package org.switchfit.continuation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class HysteresisSweepTest {

    @Test
    void jumpsApproachTheFoldsAsTheRampSlows() {
        // Cubic -x^3 + x + p: folds at ±2/(3 sqrt 3) (closed form, see PseudoArclengthTest). Slow passage
        // through a saddle-node delays the jump by c·rate^{2/3} (Haberman 1979), so each tenfold slower ramp
        // should cut the delay by 10^{2/3} = 4.64 (exponent from the scaling x ~ rate^{1/3}, p - p* ~ rate^{2/3} of
        // the Riccati equation x' = p(t) - x^2 near the fold; derived by hand). Measured delays (RK4, h = 0.01,
        // 20001 samples): 0.0913, 0.0199, 0.00427 for rates 1e-2, 1e-3, 1e-4: ratios 4.59, 4.66.
        double pStar = 2 / (3 * Math.sqrt(3));
        double[] rates = {1e-2, 1e-3, 1e-4};
        double[] upErr = new double[3];
        double[] downErr = new double[3];
        // RK4 with h = 0.01 on a problem with |J| <= 5: local error ~1e-10, far below the delays measured.
        HysteresisSweep sweep = new HysteresisSweep(new Rk4Integrator(0.01), 20001);
        for (int k = 0; k < 3; k++) {
            SweepResult up = sweep.run(TestSystems.CUBIC, new double[] {-1.3}, new double[] {0, 1}, 0, -1, 1,
                    rates[k], new double[] {1});
            SweepResult down = sweep.run(TestSystems.CUBIC, new double[] {1.3}, new double[] {0, 1}, 0, 1, -1,
                    rates[k], new double[] {1});
            upErr[k] = up.jumpParameter() - pStar;
            downErr[k] = -pStar - down.jumpParameter();
        }
        for (int k = 0; k < 3; k++) {
            assertTrue(upErr[k] > 0 && downErr[k] > 0, "jumps are delayed past the folds");
            // Exact symmetry of the problem; 2e-4 absolute = two sample spacings in λ (2/20000) after interpolation.
            assertEquals(upErr[k], downErr[k], 1e-3 * upErr[k] + 2e-4, "symmetry p -> -p, x -> -x");
        }
        for (int k = 0; k < 2; k++) {
            double ratio = upErr[k] / upErr[k + 1];
            // 10^{2/3} = 4.64; the asymptotic regime and the sample spacing (1e-4 in λ) allow 3.5 .. 6.
            assertTrue(ratio > 3.5 && ratio < 6, "delay ratio " + ratio + " errors " + java.util.Arrays.toString(upErr));
        }
        assertTrue(upErr[2] < 0.01, "slowest ramp within 0.01 of the fold: " + upErr[2]);
    }

    @Test
    void sweepAndContinuationAgreeOnPositiveFeedback() {
        // Folds from sympy 1.14 (see PseudoArclengthTest.positiveFeedbackFoldsMatchSympy).
        double aOn = 0.0735327755849075545441212157569;
        double aOff = 0.0195996658068329993060820207277;
        double[] p = {0.0, 1.0, 1.0, 0.52};
        HysteresisSweep sweep = new HysteresisSweep(new Rk4Integrator(0.05), 4001);
        double[] errUp = new double[2];
        double[] errDown = new double[2];
        double[] rates = {1e-4, 1e-5};
        for (int k = 0; k < 2; k++) {
            SweepResult up = sweep.run(TestSystems.FEEDBACK, new double[] {0}, p, 0, 0, 0.12, rates[k],
                    new double[] {1});
            SweepResult down = sweep.run(TestSystems.FEEDBACK, new double[] {2}, p, 0, 0.12, 0, rates[k],
                    new double[] {1});
            errUp[k] = up.jumpParameter() - aOn;
            errDown[k] = aOff - down.jumpParameter();
        }
        assertTrue(errUp[1] > 0 && errUp[1] < errUp[0], java.util.Arrays.toString(errUp));
        assertTrue(errDown[1] > 0 && errDown[1] < errDown[0], java.util.Arrays.toString(errDown));
        assertTrue(errUp[1] < 0.01 && errDown[1] < 0.01);
    }

    @Test
    void projectBdfIntegratorGivesTheSameJumpAsTestRk4() {
        // The sweep only needs the Integrator contract: the project's BDF at rtol 1e-10 and the test RK4 must find
        // the same jump (delay 0.0199 at rate 1e-3, see above). 1e-4 absolute: the sample spacing in λ is 1e-4.
        HysteresisSweep rk4 = new HysteresisSweep(new Rk4Integrator(0.01), 20001);
        HysteresisSweep bdf = new HysteresisSweep(new org.switchfit.ode.bdf.BdfIntegrator(
                org.switchfit.ode.SolverSettings.defaults().withTolerances(1e-10, 1e-12)), 20001);
        double a = rk4.run(TestSystems.CUBIC, new double[] {-1.3}, new double[] {0, 1}, 0, -1, 1, 1e-3,
                new double[] {1}).jumpParameter();
        double b = bdf.run(TestSystems.CUBIC, new double[] {-1.3}, new double[] {0, 1}, 0, -1, 1, 1e-3,
                new double[] {1}).jumpParameter();
        assertEquals(a, b, 1e-4);
    }

    @Test
    void aFlatOrEvenRampHasNoJumpAndAnOscillatingOneSaysSo() {
        int m = 401;
        double[] lam = new double[m];
        double[] flat = new double[m];
        double[] line = new double[m];
        double[] wave = new double[m];
        double[] step = new double[m];
        for (int k = 0; k < m; k++) {
            lam[k] = k * 0.01;
            flat[k] = 0.676258; // a conserved readout: constant (SYNTHETIC values)
            line[k] = 2 * lam[k];
            wave[k] = 1 + Math.sin(lam[k] * 2 * Math.PI / 0.06); // period of 6 samples, like a limit cycle
            step[k] = lam[k] < 2.005 ? 0.1 * lam[k] : 1 + 0.1 * lam[k]; // one step of 1 between samples 200, 201
        }
        assertEquals(SweepResult.Response.NO_JUMP, HysteresisSweep.classify(0.01, lam, flat).response());
        assertTrue(Double.isNaN(HysteresisSweep.classify(0.01, lam, flat).jumpParameter()));
        assertEquals(SweepResult.Response.NO_JUMP, HysteresisSweep.classify(0.01, lam, line).response());
        assertEquals(SweepResult.Response.OSCILLATION, HysteresisSweep.classify(0.01, lam, wave).response());
        SweepResult j = HysteresisSweep.classify(0.01, lam, step);
        assertEquals(SweepResult.Response.JUMP, j.response());
        assertEquals(200, j.jumpIndex());
        assertEquals(2.005, j.jumpParameter(), 1e-12); // middle of the interval [2.00, 2.01]
    }
}
