package org.switchfit.continuation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;

import org.junit.jupiter.api.Test;
import org.switchfit.ode.OdeSystem;

class ThresholdsTest {
    /** Fold thresholds are refined folds: see PseudoArclengthTest (1e-8 relative). */
    private static final double REL_TOL_FOLD = 1e-8;
    /**
     * Steepest-response thresholds: g = c^T z' carries ~1e-10 relative error from the difference-quotient second
     * derivatives, and g has a simple root, so the located λ is good to ~1e-9 relative.
     */
    private static final double REL_TOL_STEEPEST = 1e-8;
    /**
     * Steepest-response gradients come from five-point differences (relative step 1e-5) of g, whose own error is
     * ~1e-10: about 1e-6 relative; allow 1e-5.
     */
    private static final double REL_TOL_STEEPEST_GRAD = 1e-5;

    @Test
    void bistableFeedbackThresholdsAreTheFolds() {
        // Fold values from sympy 1.14, see PseudoArclengthTest.positiveFeedbackFoldsMatchSympy.
        double aOn = 0.0735327755849075545441212157569;
        double aOff = 0.0195996658068329993060820207277;
        double[] p = {0.0, 1.0, 1.0, 0.52};
        Thresholds th = new Thresholds(ContinuationSettings.of(0, 0.3));
        Threshold on = th.switchOn(TestSystems.FEEDBACK, new double[] {0}, p, 0, new double[] {1});
        Threshold off = th.switchOff(TestSystems.FEEDBACK, new double[] {0}, p, 0, new double[] {1});
        assertEquals(Threshold.Kind.FOLD, on.kind());
        assertEquals(aOn, on.value(), REL_TOL_FOLD * aOn);
        assertEquals(Fold.Kind.MAXIMUM, on.fold().kind());
        assertEquals(Threshold.Kind.FOLD, off.kind());
        assertEquals(aOff, off.value(), REL_TOL_FOLD * aOff);
    }

    @Test
    void monostableFeedbackSteepestPointMatchesClosedForm() {
        // Closed form, derived by hand: on the branch a(x) = d x - b x^2/(K^2+x^2), dx/da = 1/a'(x) is largest
        // where a'(x) = d - 2 b K^2 x/(K^2+x^2)^2 is smallest: (K^2+x^2) = 4x^2, x* = K/sqrt(3), so
        // a* = d K/sqrt(3) - b/4, da*/db = -1/4, da*/dK = d/sqrt(3), da*/dd = K/sqrt(3). Monostable iff
        // d > 9 b / (8 sqrt(3) K) = 0.6495 for b = K = 1.
        double b = 1.0;
        double k = 1.0;
        double d = 0.7;
        double[] p = {0.0, b, k, d};
        Thresholds th = new Thresholds(ContinuationSettings.of(0, 0.5));
        Threshold on = th.switchOn(TestSystems.FEEDBACK, new double[] {0}, p, 0, new double[] {1});
        Threshold off = th.switchOff(TestSystems.FEEDBACK, new double[] {0}, p, 0, new double[] {1});
        double aStar = d * k / Math.sqrt(3) - b / 4;
        assertEquals(Threshold.Kind.STEEPEST_RESPONSE, on.kind());
        assertNull(on.fold());
        assertEquals(aStar, on.value(), REL_TOL_STEEPEST * aStar);
        assertEquals(aStar, off.value(), REL_TOL_STEEPEST * aStar);
        // State at the steepest point follows λ* (1e-9 relative) through dx/dλ ~ 20: 1e-7 absolute.
        assertEquals(k / Math.sqrt(3), on.state()[0], 1e-7);
        double[] g = on.gradient();
        assertEquals(0.0, g[0], 0.0);
        assertEquals(-0.25, g[1], REL_TOL_STEEPEST_GRAD * 0.25);
        assertEquals(d / Math.sqrt(3), g[2], REL_TOL_STEEPEST_GRAD);
        assertEquals(k / Math.sqrt(3), g[3], REL_TOL_STEEPEST_GRAD);
    }

    @Test
    void thresholdIsContinuousThroughTheCusp() {
        // Cubic -x^3 + q x + p, readout x (closed form): for q < 0 the branch p(x) = x^3 - q x is steepest in
        // x at x = 0, so the threshold is p = 0; for q > 0 switch-on is the fold at 2 (q/3)^{3/2}, which tends to
        // 0 as q -> 0+.
        // Default steps (max 0.1): for q = 0.01 the S-shaped part spans only 0.12 in x, so this also checks that
        // the corrector-distance limit stops the predictor from jumping across it.
        Thresholds th = new Thresholds(ContinuationSettings.of(-1, 1));
        for (double q : new double[] {-0.1, -0.01}) {
            Threshold t = th.switchOn(TestSystems.CUBIC, new double[] {-1}, new double[] {0, q}, 0,
                    new double[] {1});
            assertEquals(Threshold.Kind.STEEPEST_RESPONSE, t.kind());
            // By symmetry g(0) = 0 exactly; the secant stops within 1e-13 relative of the bracket: 1e-10 absolute.
            assertEquals(0.0, t.value(), 1e-10);
        }
        for (double q : new double[] {0.0001, 0.01, 0.1}) {
            Threshold t = th.switchOn(TestSystems.CUBIC, new double[] {-1}, new double[] {0, q}, 0,
                    new double[] {1});
            assertEquals(Threshold.Kind.FOLD, t.kind());
            double expected = 2 * Math.pow(q / 3, 1.5);
            assertEquals(expected, t.value(), REL_TOL_FOLD * expected);
        }
    }

    @Test
    void steepestGradientMatchesDifferencesOfRecomputedThresholds() {
        // Property test (no outside number): phosphorylation cycle with conserved total, monostable in k0 at
        // total 2 and k2 = 2 (a grid scan of k0(x) = k2 x/(T-x) - x^2/(K^2+x^2) shows no turning point).
        ReducedSystem red = ConservationLaws.of(TestSystems.PHOSPHO_STOICH).reduce(TestSystems.PHOSPHO_FEEDBACK);
        double[] y = {2.0, 0.0};
        double[] q = red.parameters(new double[] {0.0, 1.0, 0.5, 2.0}, y);
        Thresholds th = new Thresholds(ContinuationSettings.of(0, 1));
        OdeSystem sys = red;
        double[] x0 = red.reducedState(y);
        double[] c = {1};
        Threshold t = th.switchOn(sys, x0, q, 0, c);
        assertEquals(Threshold.Kind.STEEPEST_RESPONSE, t.kind());
        double[] g = t.gradient();
        for (int k = 1; k < q.length; k++) {
            // Five-point central difference, relative step 1e-3: truncation O(h^4) ~ 1e-9 relative, threshold
            // noise ~1e-11 absolute / 1e-3 ~ 1e-8.
            double h = 1e-3 * Math.abs(q[k]);
            double[] v = new double[4];
            double[] offs = {h, -h, 2 * h, -2 * h};
            for (int j = 0; j < 4; j++) {
                double[] qs = q.clone();
                qs[k] += offs[j];
                v[j] = th.switchOn(sys, x0, qs, 0, c).value();
            }
            double fd = (8 * (v[0] - v[1]) - (v[2] - v[3])) / (12 * h);
            assertEquals(fd, g[k], REL_TOL_STEEPEST_GRAD * Math.abs(fd) + 1e-9, "parameter " + k);
        }
    }

    @Test
    void responseSteepestAtBoundIsReported() {
        // Range [0.3, 0.5] lies above the steepest point 0.154 (closed form above): no threshold inside.
        Thresholds th = new Thresholds(ContinuationSettings.of(0.3, 0.5));
        ContinuationException e = assertThrows(ContinuationException.class, () -> th.switchOn(
                TestSystems.FEEDBACK, new double[] {1}, new double[] {0, 1, 1, 0.7}, 0, new double[] {1}));
        assertEquals(true, e.getMessage().contains("no switching threshold"), e.getMessage());
    }
}
