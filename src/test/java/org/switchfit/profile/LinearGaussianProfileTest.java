package org.switchfit.profile;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.hipparchus.distribution.continuous.NormalDistribution;
import org.junit.jupiter.api.Test;
import org.switchfit.fit.CurveObjective;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.LocalFit;
import org.switchfit.fit.ParameterScale;

/**
 * Linear Gaussian model y = a + b x with known σ: the NLL is exactly quadratic in (a, b), so the profile of each
 * parameter is the parabola {@code ((θ - θ̂)/SE)²} and its 1-dof 95 % interval is θ̂ ± z_{0.975}·SE, with SE² the
 * diagonal of σ²(XᵀX)⁻¹ (derived by hand; common practice for linear regression). The simultaneous interval with
 * 2 dof is θ̂ ± √χ²₂(0.95)·SE for the same reason (the profile of one coordinate of a quadratic is its 1-D
 * parabola whatever the threshold).
 */
class LinearGaussianProfileTest {

    private static final long SEED = 424242L;
    /**
     * 1e-6 absolute on interval ends with SE about 0.05: the crossing is refined until |Δχ² - q| ≤ 1e-9 and the
     * profile NLL is exact to ~1e-13, which puts the end within ~1e-10 of the truth; 1e-6 is the brief's bar.
     */
    private static final double TOL_END = 1e-6;

    static final double SIGMA = 0.3;

    static double[][] data() {
        SplittableRandom rnd = new SplittableRandom(SEED);
        int n = 25;
        double[] x = new double[n];
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            x[i] = -1 + 0.2 * i;
            y[i] = 0.7 - 1.3 * x[i] + SIGMA * gaussian(rnd);
        }
        return new double[][] {x, y};
    }

    static double gaussian(SplittableRandom rnd) {
        // Box-Muller transform (common practice).
        double u = 1 - rnd.nextDouble();
        double v = rnd.nextDouble();
        return Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
    }

    static FitProblem problem() {
        double[][] d = data();
        CurveObjective obj = new CurveObjective(d[0], d[1], SIGMA, 2, (x, b, g) -> {
            g[0] = 1;
            g[1] = x;
            return b[0] + b[1] * x;
        });
        return FitProblem.of(obj, new String[] {"a", "b"}, new double[] {-10, -10}, new double[] {10, 10});
    }

    /** Closed-form estimate and standard errors: [â, b̂, SE_a, SE_b]. */
    static double[] closedForm() {
        double[][] d = data();
        double[] x = d[0];
        double[] y = d[1];
        int n = x.length;
        double sx = 0;
        double sxx = 0;
        double sy = 0;
        double sxy = 0;
        for (int i = 0; i < n; i++) {
            sx += x[i];
            sxx += x[i] * x[i];
            sy += y[i];
            sxy += x[i] * y[i];
        }
        double det = n * sxx - sx * sx;
        double b = (n * sxy - sx * sy) / det;
        double a = (sy - b * sx) / n;
        double varA = SIGMA * SIGMA * sxx / det;
        double varB = SIGMA * SIGMA * n / det;
        return new double[] {a, b, Math.sqrt(varA), Math.sqrt(varB)};
    }

    @Test
    void intervalsAreEstimatePlusMinusZTimesStandardError() {
        FitProblem p = problem();
        double[] cf = closedForm();
        LocalFit fit = LevenbergMarquardt.defaults().minimize(p, new double[] {0, 0});
        ProfileLikelihood pl = ProfileLikelihood.defaults();
        // Common practice: z_{0.975} = 1.95996...; computed with Hipparchus, not typed in.
        double z = new NormalDistribution(0, 1).inverseCumulativeProbability(0.975);
        double zSim = Math.sqrt(pl.threshold(2));
        for (int k = 0; k < 2; k++) {
            Profile prof = pl.profileParameter(p, fit.theta(), k);
            double est = cf[k];
            double se = cf[2 + k];
            assertEquals(Identifiability.IDENTIFIABLE, prof.identifiability());
            assertEquals(SideStatus.CLOSED, prof.lowerSide());
            assertEquals(SideStatus.CLOSED, prof.upperSide());
            assertEquals(est - z * se, prof.pointwise().lower(), TOL_END, "pointwise lower " + k);
            assertEquals(est + z * se, prof.pointwise().upper(), TOL_END, "pointwise upper " + k);
            assertEquals(est - zSim * se, prof.simultaneous().lower(), TOL_END, "simultaneous lower " + k);
            assertEquals(est + zSim * se, prof.simultaneous().upper(), TOL_END, "simultaneous upper " + k);
            assertEquals(0.95, prof.pointwise().level(), 0.0);
            assertEquals(2, prof.simultaneous().degreesOfFreedom());
            assertFalse(prof.betterOptimumFound());
            // Every traced point lies on the parabola; 1e-8 in Δχ² units is the LM's NLL accuracy (relative cost
            // tolerance 1e-14 at cost ~12) with a wide margin.
            for (ProfilePoint pt : prof.points()) {
                double u = (pt.value() - est) / se;
                assertEquals(u * u, pt.deltaChi2(prof.optimumNll()), 1e-8, "parabola at " + pt.value());
            }
            // The other parameter compensates along the profile (a and b are correlated since mean(x) != 0).
            assertEquals(1, prof.compensations().size());
        }
    }

    @Test
    void betterOptimumIsFlaggedAndTheProfileRestarts() {
        FitProblem p = problem();
        double[] cf = closedForm();
        // Give the profiler a point that is optimal in a but 0.5 SE off in b: profiling a re-optimises b and
        // finds a lower NLL (by 0.125 NLL units, > the 1e-4 tolerance).
        double[] off = {cf[0], cf[1] + 0.5 * cf[3]};
        Profile prof = ProfileLikelihood.defaults().profileParameter(p, off, 0);
        assertTrue(prof.betterOptimumFound());
        assertTrue(prof.restarts() >= 1);
        double z = new NormalDistribution(0, 1).inverseCumulativeProbability(0.975);
        assertEquals(cf[0] - z * cf[2], prof.pointwise().lower(), TOL_END);
        assertEquals(cf[0] + z * cf[2], prof.pointwise().upper(), TOL_END);
        assertEquals(cf[1], prof.optimumTheta()[1], 1e-8);
    }

    @Test
    void pointwiseOnlyModeGivesTheSamePointwiseIntervalWithFewerSolves() {
        FitProblem p = problem();
        LocalFit fit = LevenbergMarquardt.defaults().minimize(p, new double[] {0, 0});
        Profile both = ProfileLikelihood.defaults().profileParameter(p, fit.theta(), 1);
        Profile only = ProfileLikelihood.defaults().withSimultaneousIntervals(false).profileParameter(p,
                fit.theta(), 1);
        // Same crossing, refined independently: 1e-9 absolute (both within ~1e-12 of the exact end here).
        assertEquals(both.pointwise().lower(), only.pointwise().lower(), 1e-9);
        assertEquals(both.pointwise().upper(), only.pointwise().upper(), 1e-9);
        assertTrue(Double.isNaN(only.simultaneous().lower()) && !only.simultaneous().closed());
        assertTrue(only.solves() < both.solves(), only.solves() + " vs " + both.solves());
    }

    @Test
    void linearScaleEndsUseTheScaleDescriptor() {
        FitProblem p = problem().withScales(ParameterScale.LOG10, ParameterScale.LN);
        LocalFit fit = LevenbergMarquardt.defaults().minimize(p, new double[] {0, 0});
        Profile prof = ProfileLikelihood.defaults().profileParameter(p, fit.theta(), 0);
        assertEquals(Math.pow(10, prof.pointwise().lower()), prof.pointwise().lowerLinear(), 0.0);
        Profile profB = ProfileLikelihood.defaults().profileParameter(p, fit.theta(), 1);
        assertEquals(Math.exp(profB.pointwise().upper()), profB.pointwise().upperLinear(), 0.0);
    }
}
