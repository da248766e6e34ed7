package org.switchfit.profile;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.switchfit.fit.CurveObjective;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.LocalFit;
import org.switchfit.fit.ParameterScale;

/**
 * y = A exp(-k1 k2 t) with θ = (A, log10 k1, log10 k2): the data depend on k1 and k2 only through k1·k2, so both
 * log-rate profiles are flat (structurally non-identifiable, Raue et al. 2009, Fig. 1) and log10 k2 moves with
 * slope exactly -1 along the log10 k1 profile (log10 k1 + log10 k2 = const; derived by hand). The Jacobian
 * columns of log10 k1 and log10 k2 are identical, so J has rank 2 of 3 everywhere, with null direction
 * (0, 1, -1)/√2 (derived by hand).
 */
class StructuralNonidentifiabilityTest {

    private static final long SEED = 99L;

    private static CurveObjective objective() {
        SplittableRandom rnd = new SplittableRandom(SEED);
        int n = 12;
        double[] t = new double[n];
        double[] y = new double[n];
        for (int i = 0; i < n; i++) {
            t[i] = 0.25 * i;
            y[i] = 3.0 * Math.exp(-2.0 * 0.5 * t[i]) + 0.05 * LinearGaussianProfileTest.gaussian(rnd);
        }
        double ln10 = Math.log(10);
        return new CurveObjective(t, y, 0.05, 3, (x, b, g) -> {
            double kk = Math.pow(10, b[1] + b[2]);
            double e = Math.exp(-kk * x);
            g[0] = e;
            g[1] = -b[0] * x * e * kk * ln10;
            g[2] = g[1];
            return b[0] * e;
        });
    }

    /**
     * The bounds of log10 k2 are centred on the fitted log10(k1 k2) = c so that exact compensation stays feasible
     * over the whole range of log10 k1 ([-1.5, 1.5]) and vice versa; otherwise a profile would rise where the
     * compensating parameter hits its bound (then correctly not flat).
     */
    private static FitProblem problem(double c) {
        return FitProblem.of(objective(), new String[] {"A", "k1", "k2"}, new double[] {0.1, -1.5, c - 1.5},
                new double[] {10, 1.5, c + 1.5}).withScales(ParameterScale.LINEAR, ParameterScale.LOG10,
                ParameterScale.LOG10);
    }

    @Test
    void bothProfilesFlatAndProductNamed() {
        // Fit with k2 fixed at 1 (log10 k2 = 0) to get c = log10(k1 k2), then fit the full problem.
        FitProblem pre = problem(0).withFixed(2, true);
        LocalFit pf = LevenbergMarquardt.defaults().minimize(pre, new double[] {1, 0, 0});
        double c = pf.theta()[1];
        FitProblem p = problem(c);
        LocalFit fit = LevenbergMarquardt.defaults().minimize(p, new double[] {1, 0.2, c - 0.2});
        ProfileLikelihood pl = ProfileLikelihood.defaults();
        for (int idx = 1; idx <= 2; idx++) {
            Profile prof = pl.profileParameter(p, fit.theta(), idx);
            assertEquals(Identifiability.STRUCTURALLY_NONIDENTIFIABLE, prof.identifiability(), prof.name());
            assertEquals(SideStatus.OPEN_AT_BOUND, prof.lowerSide());
            assertEquals(SideStatus.OPEN_AT_BOUND, prof.upperSide());
            assertTrue(prof.maxDeltaChi2() <= 1e-5, "max delta chi2 " + prof.maxDeltaChi2());
            assertEquals(Double.NEGATIVE_INFINITY, prof.pointwise().lower());
            assertEquals(Double.POSITIVE_INFINITY, prof.pointwise().upper());
            Compensation top = prof.compensations().get(0);
            assertEquals(idx == 1 ? "k2" : "k1", top.parameterId());
            // Slope -1 exactly by construction; 1e-6 absolute covers the LM's convergence along the flat valley.
            assertEquals(-1.0, top.slope(), 1e-6);
        }
        Profile a = pl.profileParameter(p, fit.theta(), 0);
        assertEquals(Identifiability.IDENTIFIABLE, a.identifiability(), "A stays identifiable");

        JacobianRankCheck rc = JacobianRankCheck.defaults();
        RankReport atOpt = rc.atPoint(p, fit.theta());
        assertEquals(2, atOpt.rank());
        assertEquals(3, atOpt.freeCount());
        assertEquals(1, atOpt.nullSpace().size());
        NullDirection nd = atOpt.nullSpace().get(0);
        double s = Math.sqrt(0.5);
        // Tolerance 1e-10: the two Jacobian columns are bitwise identical, so the SVD returns the exact direction
        // up to rounding (~1e-15).
        assertEquals(0.0, nd.coefficients()[0], 1e-10);
        assertEquals(s, Math.abs(nd.coefficients()[1]), 1e-10);
        assertEquals(-nd.coefficients()[1], nd.coefficients()[2], 1e-10);
        assertTrue(nd.description().contains("invariant: k1 * k2"), nd.description());
        // Random points within a factor ~3 of the optimum's rates: far outside, exp(-k1 k2 t) vanishes for t > 0
        // and the rate columns become numerically zero (rank 1, a genuine loss of sensitivity, not this test).
        FitProblem near = FitProblem.of(objective(), p.ids(), new double[] {1, -0.5, c - 0.5},
                new double[] {5, 0.5, c + 0.5}).withScales(ParameterScale.LINEAR, ParameterScale.LOG10,
                ParameterScale.LOG10);
        List<RankReport> random = rc.atRandomPoints(near, fit.theta(), 5, SEED);
        for (RankReport r : random) {
            assertEquals(2, r.rank(), "rank at random point");
        }
    }

    @Test
    void fullRankWhenIdentifiable() {
        FitProblem p = NonlinearProfileTest.problem();
        LocalFit fit = LevenbergMarquardt.defaults().minimize(p, new double[] {1, 1});
        RankReport r = JacobianRankCheck.defaults().atPoint(p, fit.theta());
        assertTrue(r.fullRank());
        assertTrue(r.nullSpace().isEmpty());
    }
}
