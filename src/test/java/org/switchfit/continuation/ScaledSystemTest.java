package org.switchfit.continuation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/** {@link ScaledSystem}: derivatives and folds of the scaled cubic normal form against closed forms. */
class ScaledSystemTest {

    @Test
    void derivativesMatchFiniteDifferences() {
        // Scales far from one (1e-3 on the state, 1e-9 on the control), as in large signalling models; the helper's
        // step is relative to |z| (here 1100), i.e. 1.1e-6 in x.
        ScaledSystem sc = new ScaledSystem(TestSystems.CUBIC, new double[] {1e-3}, 0, 1e-9);
        double[] z = sc.scaleState(new double[] {-1.1});
        double[] q = sc.scaleParameters(new double[] {0.2, 1});
        // Central differences with relative step 1e-6: truncation ~1e-12, rounding ~1e-10 relative; 1e-7.
        assertTrue(TestSystems.jacobianYError(sc, z, q) < 1e-7);
        assertTrue(TestSystems.jacobianPError(sc, z, q) < 1e-7);
    }

    @Test
    void foldsOfTheScaledSystemAreTheFoldsOfTheOriginal() {
        // The cubic -x^3 + x + p with x = 1e-3 z and p = 2e-3 mu: folds at p* = -+2/(3 sqrt 3) (closed form), i.e.
        // mu* = p* / 2e-3, z* = x* / 1e-3.
        double pStar = 2 / (3 * Math.sqrt(3));
        ScaledSystem sc = new ScaledSystem(TestSystems.CUBIC, new double[] {1e-3}, 0, 2e-3);
        PseudoArclength pal = new PseudoArclength(ContinuationSettings.of(sc.scaleControl(-1), sc.scaleControl(1)));
        Branch br = pal.trace(sc, sc.scaleState(new double[] {-1.3}), sc.scaleParameters(new double[] {-1, 1}), 0,
                +1);
        List<Fold> folds = br.folds();
        assertEquals(2, folds.size());
        // Refined folds converge to the corrector tolerance 1e-11 relative; 1e-9 relative leaves room for the scaling.
        assertEquals(pStar, sc.unscaleControl(folds.get(0).parameter()), 1e-9 * pStar);
        assertEquals(-pStar, sc.unscaleControl(folds.get(1).parameter()), 1e-9 * pStar);
        assertEquals(-1 / Math.sqrt(3), sc.unscaleState(folds.get(0).state())[0], 1e-8);
    }
}
