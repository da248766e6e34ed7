package org.switchfit.continuation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;

import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;

/** The region between two separate fold curves, on SYNTHETIC straight curves whose areas follow by hand. */
class BistableRegionBetweenTest {

    private static FoldCurve line(double x0, double y0, double x1, double y1, Branch.EndReason end) {
        List<FoldCurve.Point> pts = new ArrayList<>();
        for (int i = 0; i <= 4; i++) {
            double t = i / 4.0;
            pts.add(new FoldCurve.Point(x0 + t * (x1 - x0), y0 + t * (y1 - y0), new double[] {0}, 1));
        }
        return new FoldCurve(0, 1, pts, List.of(), Branch.EndReason.BOUNDARY, end);
    }

    @Test
    void bandBetweenTwoCurvesWhateverTheirDirections() {
        // box [0, 1] x [0, 2]; curves x = 0.2 and from (0.5, 0) to (0.7, 2): band area by hand
        // 2 * (0.6 - 0.2) = 0.8 (trapezoid), whichever way each curve was traced
        double area = 0.8;
        FoldCurve a = line(0.2, 0, 0.2, 2, Branch.EndReason.BOUNDARY);
        FoldCurve aRev = line(0.2, 2, 0.2, 0, Branch.EndReason.BOUNDARY);
        FoldCurve b = line(0.5, 0, 0.7, 2, Branch.EndReason.BOUNDARY);
        FoldCurve bRev = line(0.7, 2, 0.5, 0, Branch.EndReason.BOUNDARY);
        for (FoldCurve x : List.of(a, aRev)) {
            for (FoldCurve y : List.of(b, bRev)) {
                assertEquals(area, BistableRegion.between(x, y, 0, 1, 0, 2).area(), 1e-12); // rounding only
                assertEquals(area, BistableRegion.between(y, x, 0, 1, 0, 2).area(), 1e-12);
            }
        }
        // a curve from the bottom edge to the right edge: the walk passes the top-right corner
        FoldCurve c = line(0.1, 0, 0.1, 2, Branch.EndReason.BOUNDARY);
        FoldCurve d = line(0.3, 0, 1, 1, Branch.EndReason.BOUNDARY);
        // by hand: rectangle [0.1, 1] x [0, 2] (1.8) minus the triangle below d: (0.3,0) (1,0) (1,1), area 0.35
        assertEquals(1.8 - 0.35, BistableRegion.between(c, d, 0, 1, 0, 2).area(), 1e-12);
        // an end inside the box: no region
        assertNull(BistableRegion.between(a, line(0.5, 0, 0.6, 1, Branch.EndReason.MAX_POINTS), 0, 1, 0, 2));
    }
}
