package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.LocalFit;
import org.switchfit.objective.LikelihoodObjective;
import org.switchfit.objective.ObservablePrediction;
import org.switchfit.objective.SteadyState;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.profile.Profile;
import org.switchfit.profile.ProfileLikelihood;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;

/**
 * A prediction profile (Kreutz et al. 2012, doi:10.1186/1752-0509-6-120) is the parameter profile of the
 * reparameterised model in which the prediction is a parameter. Here y(t) = x0 e^{-k t} with NORMAL noise of known
 * σ (the profile is not quadratic, so no closed form and no delta method applies); the reparameterised model is
 * X(0) = B e^{k t*}, i.e. B = y(t*). The prediction profile of y(t*) in the first model must give the same
 * interval as the parameter profile of B in the second (exact identity of the two constrained optimisations,
 * derived by hand: the map (k, x0) → (k, B) is a bijection on the bounds' interior).
 *
 * <p>Tolerance 1e-6 relative: both objectives are integrated at rtol 1e-10 (residual errors about 1e-9/σ), the two
 * profiles use different slices (augmented Lagrangian for the prediction, fixed coordinate for B) whose constraint
 * floors are about 1e-9 standard errors; 1e-6 leaves a margin of about 100 over these.
 *
 * <p>Regression: with the prediction slice's stagnation floor at 1e-6 delta-method standard errors this case
 * stalled at a constraint violation of about 5e-8 (above that floor) and ended a side OPEN_AT_BOUND.
 */
class PredictionProfileTest {
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    private static final double[] T = {0, 1, 2, 3, 4, 6};
    private static final double[] M = {2.1, 1.45, 1.12, 0.78, 0.6, 0.33};
    private static final double SIGMA = 0.1;
    private static final double T_STAR = 5.0;

    @TempDir
    Path dir;

    private static FitProblem fitProblem(EstimationProblem p) {
        return FitCommand.fitProblem(p, LikelihoodObjective.of(p, TIGHT));
    }

    @Test
    void predictionProfileEqualsProfileOfReparameterisedModel() {
        EstimationProblem p1 = ProblemLoader.load(PetabFiles.writeDecay(dir.resolve("a"), DecaySbml.MODEL,
                "x0", M, T, SIGMA, "lin"));
        EstimationProblem p2 = ProblemLoader.load(PetabFiles.writeDecay(dir.resolve("b"),
                DecaySbml.reparameterised(T_STAR), "B", M, T, SIGMA, "lin"));
        Profile pred = assertPredictionProfileEqualsParameterProfile(p1, p2);
        double lo = pred.pointwise().lowerLinear();
        double hi = pred.pointwise().upperLinear();
        // Not symmetric around the estimate: the profile is not quadratic (no delta-method shortcut was taken).
        double est = pred.optimumValue();
        assertTrue(Math.abs((hi - est) - (est - lo)) > 1e-3 * (hi - lo), "asymmetric interval expected");
    }

    /**
     * The same identity on a model with an event ({@link DecaySbml#BOLUS}: at t1 = 2, X += d, d = 1.5; k linear and
     * x0 on log10 scale estimated, d and t1 fixed at their SBML values): X(t*) = x0 e^{-k t*} + d e^{-k(t* - t1)}
     * for t* &gt; t1, so the reparameterisation B = X(t*) has X(0) = x0 = (B - d e^{-k(t* - t1)}) e^{k t*} (derived
     * by hand). The prediction now integrates sensitivities across the event; the bolus time does not depend on
     * θ, so the jump is exact and the tolerance argument above applies unchanged.
     */
    @Test
    void predictionProfileOfAModelWithAnEventEqualsProfileOfReparameterisedModel() {
        double[] t = {0, 1, 1.5, 3, 4, 6};
        double[] m = {2.1, 1.45, 1.3, 1.88, 1.46, 0.75};
        String initial = "<apply><times/><apply><minus/><ci>B</ci><apply><times/><ci>d</ci><apply><exp/><apply>"
                + "<times/><apply><minus/><ci>k</ci></apply><apply><minus/><cn>" + T_STAR + "</cn><ci>t1</ci>"
                + "</apply></apply></apply></apply></apply><apply><exp/><apply><times/><ci>k</ci><cn>" + T_STAR
                + "</cn></apply></apply></apply>";
        String reparameterised = DecaySbml.BOLUS
                .replace("<parameter id=\"x0\" value=\"2\" constant=\"true\"/>",
                        "<parameter id=\"B\" value=\"1\" constant=\"true\"/>")
                .replace("<ci>x0</ci>", initial);
        EstimationProblem p1 = ProblemLoader.load(PetabFiles.writeDecay(dir.resolve("a"), DecaySbml.BOLUS, "x0", m, t,
                SIGMA, "lin"));
        EstimationProblem p2 = ProblemLoader.load(PetabFiles.writeDecay(dir.resolve("b"), reparameterised, "B", m, t,
                SIGMA, "lin"));
        assertPredictionProfileEqualsParameterProfile(p1, p2);
    }

    /**
     * Fits both problems, profiles the prediction obs@T_STAR of p1 and the parameter B of p2, and asserts the same
     * optimum NLL (relative 1e-9: integration error only) and the same pointwise and simultaneous intervals
     * (relative 1e-6, see the class comment); returns the prediction profile.
     */
    private static Profile assertPredictionProfileEqualsParameterProfile(EstimationProblem p1, EstimationProblem p2) {
        FitProblem f1 = fitProblem(p1);
        FitProblem f2 = fitProblem(p2);
        LocalFit o1 = LevenbergMarquardt.defaults().minimize(f1, p1.nominalTheta());
        LocalFit o2 = LevenbergMarquardt.defaults().minimize(f2, p2.nominalTheta());
        assertEquals(o1.nll(), o2.nll(), 1e-9 * Math.abs(o1.nll()), "same optimum NLL");
        ProfileLikelihood pl = ProfileLikelihood.defaults();
        ObservablePrediction g = ObservablePrediction.of(p1, TIGHT, SteadyState.defaults(), "obs@" + T_STAR);
        Profile pred = pl.profilePrediction(f1, o1.theta(), g, g.name(), Double.NEGATIVE_INFINITY,
                Double.POSITIVE_INFINITY);
        Profile param = pl.profileParameter(f2, o2.theta(), f2.indexOf("B"));
        assertTrue(pred.pointwise().closed(), pred.lowerSide() + "/" + pred.upperSide() + " " + pred.message());
        assertTrue(param.pointwise().closed(), param.lowerSide() + "/" + param.upperSide() + " " + param.message());
        double lo = param.pointwise().lowerLinear();
        double hi = param.pointwise().upperLinear();
        assertEquals(lo, pred.pointwise().lowerLinear(), 1e-6 * lo, "lower end");
        assertEquals(hi, pred.pointwise().upperLinear(), 1e-6 * hi, "upper end");
        assertEquals(param.simultaneous().lowerLinear(), pred.simultaneous().lowerLinear(), 1e-6 * lo);
        assertEquals(param.simultaneous().upperLinear(), pred.simultaneous().upperLinear(), 1e-6 * hi);
        return pred;
    }
}
