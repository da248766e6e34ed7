package org.switchfit.continuation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

class FoldCurvesTest {
    /** Fold-curve points are corrected to a relative Newton step of 1e-11; 1e-9 absolute on O(1) values. */
    private static final double ABS_TOL_CURVE = 1e-9;

    /**
     * Cubic x' = -x^3 + q x + p (parameters p = index 0, q = index 1). Closed form, derived by hand: f = 0 and
     * f_x = q - 3x^2 = 0 give q = 3x^2, p = -2x^3, i.e. 27 p^2 = 4 q^3, a cusp at (0, 0) where
     * a = f_xx = -6x changes sign. Bistable region {0 < q <= Q, |p| < 2 (q/3)^{3/2}} has area
     * ∫_0^Q 4 (q/3)^{3/2} dq = (8/5) 3^{-3/2} Q^{5/2}.
     */
    @Test
    void cubicCuspAndBistableRegion() {
        double q0 = 0.75;
        double[] p = {-1, q0};
        PseudoArclength pal = new PseudoArclength(ContinuationSettings.of(-1, 1));
        Branch br = pal.trace(TestSystems.CUBIC, new double[] {-1.2}, p, 0, +1);
        Fold start = br.folds().get(0);
        ContinuationSettings s = ContinuationSettings.of(-1, 1).withSteps(0.01, 1e-9, 0.02);
        FoldCurves fc = new FoldCurves(s, -0.5, 1.0);
        FoldCurve curve = fc.trace(TestSystems.CUBIC, start, p, 1);
        assertEquals(Branch.EndReason.BOUNDARY, curve.startEnd());
        assertEquals(Branch.EndReason.BOUNDARY, curve.finishEnd());
        for (FoldCurve.Point pt : curve.points()) {
            assertEquals(0, 27 * pt.p1() * pt.p1() - 4 * pt.p2() * pt.p2() * pt.p2(), ABS_TOL_CURVE);
            double x = pt.state()[0];
            assertEquals(3 * x * x, pt.p2(), ABS_TOL_CURVE);
        }
        assertEquals(1, curve.cusps().size());
        FoldCurve.Cusp cusp = curve.cusps().get(0);
        // At the cusp the curve is singular only in its projection; the secant on a locates x = 0 to ~1e-12,
        // so p = -2x^3 and q = 3x^2 are below 1e-10.
        assertEquals(0, cusp.p1(), 1e-10);
        assertEquals(0, cusp.p2(), 1e-10);
        // x enters p and q as x^3 and x^2, so x itself is only determined to ~sqrt(1e-12): 1e-6 absolute.
        assertEquals(0, cusp.state()[0], 1e-6);

        BistableRegion region = BistableRegion.of(curve, -1, 1, -0.5, 1.0);
        assertFalse(region.closedByChord());
        double exact = 1.6 / Math.pow(3, 1.5);
        // Chords of length <= 0.02 along a curve with curvature <= ~10 near the cusp under-resolve the area by
        // O(h^2) per unit length: allow 1e-3 relative.
        assertEquals(exact, region.area(), 1e-3 * exact);
        assertTrue(region.contains(0, 0.5));
        assertTrue(region.contains(0.1, 0.5)); // 27*0.01 = 0.27 < 4*0.125 = 0.5
        assertFalse(region.contains(0.2, 0.5)); // 27*0.04 = 1.08 > 0.5
        assertFalse(region.contains(0, -0.2));
    }

    @Test
    void regionClosedAlongTheBoxCorners() {
        // Same cubic in the box p in [-0.2, 0.2], q in [-0.5, 1]: the fold curve leaves through the side edges
        // at q = (27 * 0.04 / 4)^{1/3} = 0.646, so the region is closed over the two top corners. Closed form:
        // area = 0.4 - 2 ∫_0^0.2 (27/4)^{1/3} p^{2/3} dp = 0.4 - 2 (27/4)^{1/3} (3/5) 0.2^{5/3}.
        double[] p = {-0.2, 0.5}; // folds at ±2 (1/6)^{3/2} = ±0.136, inside the box
        Branch br = new PseudoArclength(ContinuationSettings.of(-0.2, 0.2)).trace(TestSystems.CUBIC,
                new double[] {-1.2}, p, 0, +1);
        Fold start = br.folds().get(0);
        FoldCurves fc = new FoldCurves(ContinuationSettings.of(-0.2, 0.2).withSteps(0.01, 1e-9, 0.02), -0.5, 1.0);
        FoldCurve curve = fc.trace(TestSystems.CUBIC, start, p, 1);
        BistableRegion region = BistableRegion.of(curve, -0.2, 0.2, -0.5, 1.0);
        assertFalse(region.closedByChord());
        double exact = 0.4 - 2 * Math.cbrt(27.0 / 4) * 0.6 * Math.pow(0.2, 5.0 / 3);
        // Chord error as in the test above: 1e-3 relative.
        assertEquals(exact, region.area(), 1e-3 * exact);
        assertTrue(region.contains(0.15, 0.9));
        assertFalse(region.contains(0.15, 0.5));
    }
}
