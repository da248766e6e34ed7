package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/** Ready-made panels: sorting, splitting and labelling rules stated in the javadoc. */
class ChartsTest {

    @Test
    void branchSplitsByStabilityWithoutGaps() {
        double[] p = {0, 1, 2, 3, 4, 5};
        double[] x = {10, 11, 12, 13, 14, 15};
        boolean[] st = {true, true, false, false, true, true};
        List<Series> pieces = Charts.branch("b", p, x, st, Palette.BLUE);
        assertEquals(3, pieces.size());
        Series.Line a = (Series.Line) pieces.get(0);
        Series.Line b = (Series.Line) pieces.get(1);
        Series.Line c = (Series.Line) pieces.get(2);
        assertArrayEquals(new double[] {0, 1, 2}, a.x(), "stable run 0-1 extended to the first unstable point");
        assertArrayEquals(new double[] {2, 3, 4}, b.x());
        assertArrayEquals(new double[] {4, 5}, c.x());
        assertEquals(Series.Dash.SOLID, a.dash());
        assertEquals(Series.Dash.DASHED, b.dash());
        assertEquals(Series.Dash.SOLID, c.dash());
        assertEquals("b (stable)", a.label());
        assertEquals("b (unstable)", b.label());
        assertNull(c.label(), "only the first piece of each kind is labelled");
        assertEquals(Palette.BLUE, c.color());
        // A trailing single point of new stability still draws its connecting segment from the previous run.
        List<Series> t = Charts.branch(null, new double[] {0, 1, 2}, new double[] {0, 1, 2},
                new boolean[] {true, true, false}, null);
        assertEquals(1, t.size());
        assertArrayEquals(new double[] {0, 1, 2}, ((Series.Line) t.get(0)).x());
        assertThrows(IllegalArgumentException.class, () -> Charts.branch("x", new double[2], new double[2],
                new boolean[3], null));
    }

    @Test
    void waterfallSortsAndDropsFailedStarts() {
        Plot p = Charts.waterfall(new double[] {5, Double.NaN, -1, 3, Double.POSITIVE_INFINITY}, 1.92);
        Series.Line l = (Series.Line) p.series().get(0);
        assertArrayEquals(new double[] {-1, 3, 5}, l.y());
        assertArrayEquals(new double[] {1, 2, 3}, l.x());
        Series.RefLine r = (Series.RefLine) p.series().get(1);
        assertEquals(-1 + 1.92, r.value());
        assertTrue(p.title().contains("5 starts") && p.title().contains("2 failed"), p.title());
    }

    @Test
    void profilePanelHasThresholdAndEstimate() throws Exception {
        Plot p = Charts.profile("k", new double[] {0.1, 1, 10}, new double[] {4, 0, Double.NaN}, 3.84, 1, true);
        assertEquals(Axis.Scale.LOG10, p.x().scale());
        assertEquals(3, p.series().size());
        SampleReportTest.parse(Figure.of("p", "p").add(p).toSvg());
    }

    @Test
    void timecourseAndHysteresisPanels() throws Exception {
        double[] t = {0, 1, 2};
        Plot withBand = Charts.timecourse("GFP", "t [h]", "GFP", t, t, t, t, t, t, new double[] {1, 1, 1},
                Palette.BLUE);
        assertEquals(3, withBand.series().size());
        Series.Points d = (Series.Points) withBand.series().get(2);
        assertArrayEquals(new double[] {-1, 0, 1}, d.yLow(), "y - sigma");
        Plot bare = Charts.timecourse("GFP", "t", "y", t, t, null, null, t, t, null, Palette.BLUE);
        assertEquals(2, bare.series().size());
        assertNull(((Series.Points) bare.series().get(1)).yLow());
        Plot h = Charts.hysteresis(t, t, t, t, "p", "x");
        assertEquals(Series.Dash.DASHED, ((Series.Line) h.series().get(1)).dash());
        SampleReportTest.parse(Figure.of("h", "h").add(h).add(withBand).toSvg());
    }
}
