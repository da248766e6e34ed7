package org.switchfit.profile;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.switchfit.fit.CurveObjective;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.LocalFit;
import org.switchfit.fit.LocalTaskExecutor;
import org.switchfit.fit.ParameterScale;
import org.switchfit.objective.Objective;
import org.switchfit.objective.ObjectiveException;
import org.switchfit.objective.Prediction;

/** Profiles as parallel tasks, resume, failures, and a practically non-identifiable profile. */
class ProfileRunTest {

    @Test
    void parallelProfilesAreIdenticalToSequentialAndResume() {
        FitProblem p = NonlinearProfileTest.problem();
        LocalFit fit = LevenbergMarquardt.defaults().minimize(p, new double[] {1, 1});
        ProfileLikelihood pl = ProfileLikelihood.defaults();
        List<Profile> seq = pl.profileAll(p, fit.theta(), LocalTaskExecutor.sequential(), null, List.of());
        List<String> reported = Collections.synchronizedList(new ArrayList<>());
        List<Profile> par = pl.profileAll(p, fit.theta(), LocalTaskExecutor.ofThreads(4),
                pr -> reported.add(pr.name()), List.of());
        assertEquals(2, seq.size());
        Collections.sort(reported);
        assertEquals(List.of("A", "k"), reported);
        for (int i = 0; i < seq.size(); i++) {
            assertSameProfile(seq.get(i), par.get(i));
        }
        List<String> again = new ArrayList<>();
        List<Profile> resumed = pl.profileAll(p, fit.theta(), LocalTaskExecutor.ofThreads(2),
                pr -> again.add(pr.name()), List.of(seq.get(1)));
        assertEquals(List.of("A"), again, "only the missing profile runs");
        for (int i = 0; i < seq.size(); i++) {
            assertSameProfile(seq.get(i), resumed.get(i));
        }
    }

    @Test
    void profileWhoseObjectiveFailsAtTheOptimumIsRecorded() {
        FitProblem base = NonlinearProfileTest.problem();
        Objective broken = new Objective() {
            @Override
            public int parameterCount() {
                return 2;
            }

            @Override
            public int residualCount() {
                return base.objective().residualCount();
            }

            @Override
            public double evaluate(double[] theta, double[] residuals, double[] jacobian) {
                throw new ObjectiveException("integration failed at t = 1.5");
            }
        };
        FitProblem p = base.withObjective(broken);
        List<Profile> out = ProfileLikelihood.defaults().profileAll(p, new double[] {2, 0.8},
                LocalTaskExecutor.ofThreads(2), null, List.of());
        assertEquals(2, out.size());
        for (Profile pr : out) {
            assertTrue(pr.hasFailure());
            assertTrue(pr.message().contains("integration failed at t = 1.5"), pr.message());
        }
    }

    /**
     * y = A (1 - exp(-k t)) observed only at t >= 2 with k = 5, θ = (A, log10 k): exp(-10) ~ 5e-5 << σ / A = 0.02,
     * so every k above about 2 fits equally well (open upper side), while small k is ruled out (closed lower
     * side). Raue et al. 2009, Fig. 1, practically non-identifiable case.
     */
    static FitProblem saturated() {
        SplittableRandom rnd = new SplittableRandom(5);
        double[] t = {2, 2.5, 3, 3.5, 4, 4.5, 5, 5.5, 6};
        double[] y = new double[t.length];
        for (int i = 0; i < t.length; i++) {
            y[i] = 1 - Math.exp(-5 * t[i]) + 0.02 * LinearGaussianProfileTest.gaussian(rnd);
        }
        double ln10 = Math.log(10);
        CurveObjective obj = new CurveObjective(t, y, 0.02, 2, (x, b, g) -> {
            double k = Math.pow(10, b[1]);
            double e = Math.exp(-k * x);
            g[0] = 1 - e;
            g[1] = b[0] * x * e * k * ln10;
            return b[0] * (1 - e);
        });
        return FitProblem.of(obj, new String[] {"A", "k"}, new double[] {0.1, -2}, new double[] {10, 2})
                .withScales(ParameterScale.LINEAR, ParameterScale.LOG10);
    }

    @Test
    void saturatedRateIsPracticallyNonIdentifiable() {
        FitProblem p = saturated();
        LocalFit fit = LevenbergMarquardt.defaults().minimize(p, new double[] {1, 0.5});
        Profile pk = ProfileLikelihood.defaults().profileParameter(p, fit.theta(), 1);
        assertEquals(Identifiability.PRACTICALLY_NONIDENTIFIABLE, pk.identifiability());
        assertEquals(SideStatus.CLOSED, pk.lowerSide());
        assertEquals(SideStatus.OPEN_AT_BOUND, pk.upperSide());
        assertTrue(Double.isFinite(pk.pointwise().lower()));
        assertEquals(Double.POSITIVE_INFINITY, pk.pointwise().upper());
        assertEquals(Math.pow(10, pk.pointwise().lower()), pk.pointwise().lowerLinear(), 0.0);
        Profile pa = ProfileLikelihood.defaults().profileParameter(p, fit.theta(), 0);
        assertEquals(Identifiability.IDENTIFIABLE, pa.identifiability());
    }

    @Test
    void predictionOutOfReachInsideBoundsEndsTheSideAtTheBound() {
        // g = log10 k in the saturated model: values above the parameter's upper bound 2 cannot be attained, so
        // the prediction profile's upper side must end open at the bound, while its lower end equals the
        // parameter profile's (same quantity; 1e-6 absolute as in the other prediction tests).
        FitProblem p = saturated();
        LocalFit fit = LevenbergMarquardt.defaults().minimize(p, new double[] {1, 0.5});
        Prediction logK = new Prediction() {
            @Override
            public int parameterCount() {
                return 2;
            }

            @Override
            public double evaluate(double[] theta, double[] gradient) {
                if (gradient != null) {
                    gradient[0] = 0;
                    gradient[1] = 1;
                }
                return theta[1];
            }
        };
        ProfileLikelihood pl = ProfileLikelihood.defaults();
        Profile pg = pl.profilePrediction(p, fit.theta(), logK, "log10 k", Double.NEGATIVE_INFINITY,
                Double.POSITIVE_INFINITY);
        Profile pk = pl.profileParameter(p, fit.theta(), 1);
        assertEquals(SideStatus.OPEN_AT_BOUND, pg.upperSide(), pg.message());
        assertTrue(pg.message().contains("not reached inside the parameter bounds"), pg.message());
        assertEquals(Identifiability.PRACTICALLY_NONIDENTIFIABLE, pg.identifiability());
        assertEquals(pk.pointwise().lower(), pg.pointwise().lower(), 1e-6);
        assertEquals(Double.POSITIVE_INFINITY, pg.pointwise().upper());
    }

    @Test
    void optimumOnABoundGivesASideOpenAtThatBound() {
        // Straight line through exact data y = 1 + 2x with b <= 1.5: the optimum sits on b's upper bound
        // (see BoundedLevenbergMarquardtTest), so b's profile is open there and closes below, and a's profile,
        // re-optimising b under its bound, stays identifiable.
        CurveObjective line = new CurveObjective(new double[] {0, 1, 2, 3, 4}, new double[] {1, 3, 5, 7, 9}, 0.5,
                2, (x, b, g) -> {
                    g[0] = 1;
                    g[1] = x;
                    return b[0] + b[1] * x;
                });
        FitProblem p = FitProblem.of(line, new String[] {"a", "b"}, new double[] {-10, -10},
                new double[] {10, 1.5});
        LocalFit fit = LevenbergMarquardt.defaults().minimize(p, new double[] {0, 0});
        Profile pb = ProfileLikelihood.defaults().profileParameter(p, fit.theta(), 1);
        assertEquals(SideStatus.OPEN_AT_BOUND, pb.upperSide());
        assertEquals(SideStatus.CLOSED, pb.lowerSide());
        assertEquals(Double.POSITIVE_INFINITY, pb.pointwise().upper());
        assertEquals(Identifiability.PRACTICALLY_NONIDENTIFIABLE, pb.identifiability());
        assertTrue(pb.pointwise().lower() < 1.5);
        Profile pa = ProfileLikelihood.defaults().profileParameter(p, fit.theta(), 0);
        assertEquals(Identifiability.IDENTIFIABLE, pa.identifiability());
        for (ProfilePoint pt : pa.points()) {
            assertTrue(pt.theta()[1] <= 1.5, "b respects its bound along a's profile");
        }
    }

    static void assertSameProfile(Profile a, Profile b) {
        assertEquals(a.name(), b.name());
        assertEquals(a.points().size(), b.points().size());
        for (int i = 0; i < a.points().size(); i++) {
            assertEquals(a.points().get(i).value(), b.points().get(i).value(), 0.0);
            assertEquals(a.points().get(i).nll(), b.points().get(i).nll(), 0.0);
            assertArrayEquals(a.points().get(i).theta(), b.points().get(i).theta(), 0.0);
        }
        assertEquals(a.pointwise(), b.pointwise());
        assertEquals(a.simultaneous(), b.simultaneous());
        assertEquals(a.identifiability(), b.identifiability());
        assertEquals(a.solves(), b.solves());
    }
}
