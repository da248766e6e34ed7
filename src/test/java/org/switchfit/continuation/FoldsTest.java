package org.switchfit.continuation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;

import org.junit.jupiter.api.Test;
import org.switchfit.ode.OdeSystem;

class FoldsTest {
    /**
     * Central differences with relative step 1e-4 have truncation error ~1e-8 relative for these smooth fold
     * functions, and the re-located folds are exact to ~1e-13, i.e. ~1e-9 after division by the step: 1e-6
     * relative (the brief's requirement) is met with margin.
     */
    private static final double REL_TOL_FD = 1e-6;
    private static final double FD_STEP = 1e-4;

    private static void checkAgainstDifferences(OdeSystem sys, Fold fold, double[] p) {
        double[] g = Folds.parameterGradient(sys, fold, p);
        double norm = 0;
        for (double v : g) {
            norm = Math.max(norm, Math.abs(v));
        }
        for (int k = 0; k < p.length; k++) {
            if (k == fold.control()) {
                assertEquals(0.0, g[k], 0.0);
                continue;
            }
            double h = FD_STEP * Math.max(Math.abs(p[k]), 1e-3);
            double[] pp = p.clone();
            double[] pm = p.clone();
            pp[k] += h;
            pm[k] -= h;
            Fold fp = Folds.locate(sys, fold, pp, 1e-13);
            Fold fm = Folds.locate(sys, fold, pm, 1e-13);
            assertNotNull(fp);
            assertNotNull(fm);
            double fd = (fp.parameter() - fm.parameter()) / (2 * h);
            assertEquals(fd, g[k], REL_TOL_FD * Math.max(Math.abs(fd), 1e-3 * norm), "parameter " + k);
        }
    }

    @Test
    void feedbackFoldSensitivitiesEqualFiniteDifferences() {
        double[] p = {0.0, 1.0, 1.0, 0.52};
        Branch br = new PseudoArclength(ContinuationSettings.of(0, 0.2)).trace(TestSystems.FEEDBACK,
                new double[] {0}, p, 0, +1);
        assertEquals(2, br.folds().size());
        for (Fold f : br.folds()) {
            checkAgainstDifferences(TestSystems.FEEDBACK, f, p);
        }
    }

    @Test
    void conservedTotalIsAParameterOfTheSensitivity() {
        ReducedSystem red = ConservationLaws.of(TestSystems.PHOSPHO_STOICH).reduce(TestSystems.PHOSPHO_FEEDBACK);
        double[] p = {0.0, 1.0, 0.5, 2.0};
        double[] q = red.parameters(p, new double[] {2.3, 0});
        Branch br = new PseudoArclength(ContinuationSettings.of(0, 0.2)).trace(red,
                red.reducedState(new double[] {2.3, 0}), q, 0, +1);
        assertEquals(2, br.folds().size());
        for (Fold f : br.folds()) {
            checkAgainstDifferences(red, f, q);
        }
    }

    @Test
    void cubicFoldSensitivityToQMatchesClosedForm() {
        // Closed form: folds of -x^3 + q x + p at p* = ∓2 (q/3)^{3/2}, so dp*/dq = ∓sqrt(q/3).
        double q = 1.5;
        Branch br = new PseudoArclength(ContinuationSettings.of(-2, 2)).trace(TestSystems.CUBIC,
                new double[] {-1.5}, new double[] {-2, q}, 0, +1);
        Fold max = br.folds().get(0);
        double[] g = Folds.parameterGradient(TestSystems.CUBIC, max, new double[] {0, q});
        // The formula is exact (null vectors of a 1x1 J); 1e-12 absolute covers rounding of the refined fold.
        assertEquals(Math.sqrt(q / 3), g[1], 1e-12);
    }

    @Test
    void borderedAndExtendedSystemsLocateTheSameFold() {
        // Two independent Newton formulations (minimally augmented n + 1 vs. standard extended 2n + 1) from the
        // same rough guess must agree to their tolerance (1e-13 relative step): 1e-11 absolute on O(1) values.
        ReducedSystem red = ConservationLaws.of(TestSystems.PHOSPHO_STOICH).reduce(TestSystems.PHOSPHO_FEEDBACK);
        double[] q = red.parameters(new double[] {0.0, 1.0, 0.5, 2.0}, new double[] {2.3, 0});
        Branch br = new PseudoArclength(ContinuationSettings.of(0, 0.2)).trace(red,
                red.reducedState(new double[] {2.3, 0}), q, 0, +1);
        for (Fold f : br.folds()) {
            double[] guess = f.state();
            guess[0] *= 1.01;
            double[] qg = q.clone();
            qg[0] = f.parameter() * 1.01;
            Fold a = FoldRefiner.refineBordered(red, guess, qg, 0, f.rightNull(), 1e-13, 40);
            Fold b = FoldRefiner.refineExtended(red, guess, qg, 0, f.rightNull(), 1e-13, 40);
            assertNotNull(a);
            assertNotNull(b);
            assertEquals(a.parameter(), b.parameter(), 1e-11);
            assertEquals(a.state()[0], b.state()[0], 1e-11);
            assertEquals(f.parameter(), a.parameter(), 1e-11);
        }
    }

    @Test
    void enzymeComplexCycleSensitivitiesIncludingTotals() {
        // Six species, three laws (see PseudoArclengthTest.enzymeComplexCycleContinuesInKinaseTotal); gradient
        // over the 8 rate parameters and the two other totals (S + Sp + ES + FSp, F + FSp).
        ConservationLaws laws = ConservationLaws.of(TestSystems.GK_STOICH);
        ReducedSystem red = laws.reduce(TestSystems.GK_FEEDBACK);
        int lawE = -1;
        for (int c = 0; c < laws.lawCount(); c++) {
            if (laws.dependentSpecies()[c] == 2) {
                lawE = c;
            }
        }
        int control = red.totalIndex(lawE);
        double[] y = {1, 0, 0.001, 0.1, 0, 0};
        double[] q = red.parameters(new double[] {10, 1, 1, 10, 1, 1, 20, 0.2}, y);
        Branch br = new PseudoArclength(ContinuationSettings.of(0.001, 0.05)).trace(red, red.reducedState(y), q,
                control, +1);
        assertEquals(2, br.folds().size());
        for (Fold f : br.folds()) {
            checkAgainstDifferences(red, f, q);
        }
    }
}
