package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;

/**
 * Tick algorithms. Expected values are derived by hand from the formulas of P. S. Heckbert, "Nice numbers for graph
 * labels", Graphics Gems (Academic Press, 1990), pp. 61-63 (loose labeling: range = nicenum(max - min, false),
 * d = nicenum(range / (n - 1), true), graphmin = floor(min / d) d, graphmax = ceil(max / d) d,
 * nfrac = max(-floor(log10 d), 0)); each derivation is written beside the check.
 */
class TicksTest {
    /** Tick values are k * step computed in double; equality with the decimal value within 1e-12 relative. */
    private static final double REL_TOL = 1e-12;

    private static void assertTicks(double[] expected, Ticks t) {
        double[] got = t.major();
        assertEquals(expected.length, got.length, t.toString());
        for (int i = 0; i < expected.length; i++) {
            assertEquals(expected[i], got[i], REL_TOL * Math.max(1, Math.abs(expected[i])), t.toString());
        }
    }

    @Test
    void niceNumberFollowsHeckbertThresholds() {
        // round = true: mantissa < 1.5 -> 1, < 3 -> 2, < 7 -> 5, else 10.
        assertEquals(1e2, Ticks.niceNumber(125, true));
        assertEquals(2e-3, Ticks.niceNumber(2.9e-3, true));
        assertEquals(5, Ticks.niceNumber(3.0, true));
        assertEquals(10, Ticks.niceNumber(7.0, true));
        // round = false: mantissa <= 1 -> 1, <= 2 -> 2, <= 5 -> 5, else 10.
        assertEquals(500, Ticks.niceNumber(438, false));
        assertEquals(2, Ticks.niceNumber(2.0, false));
        assertEquals(5, Ticks.niceNumber(2.1, false));
        assertEquals(10, Ticks.niceNumber(5.0001, false));
        assertThrows(IllegalArgumentException.class, () -> Ticks.niceNumber(0, true));
        assertThrows(IllegalArgumentException.class, () -> Ticks.niceNumber(Double.NaN, true));
    }

    @Test
    void heckbertWorkedExamples() {
        // [105, 543], n = 5: range = nicenum(438, false) = 500; d = nicenum(125, true) = 100;
        // graphmin = 100, graphmax = 600, nfrac = 0.
        Ticks a = Ticks.linear(105, 543, 5);
        assertTicks(new double[] {100, 200, 300, 400, 500, 600}, a);
        assertEquals(100, a.step());
        assertEquals(0, a.fractionDigits());
        // [0, 1], n = 5: range = 1; d = nicenum(0.25, true) = 0.2; ticks 0..1, nfrac = 1.
        Ticks b = Ticks.linear(0, 1, 5);
        assertTicks(new double[] {0, 0.2, 0.4, 0.6, 0.8, 1.0}, b);
        assertEquals(1, b.fractionDigits());
        // [-0.0123, 0.0456], n = 6: range = nicenum(0.0579, false) = 0.1; d = nicenum(0.02, true) = 0.02;
        // graphmin = floor(-0.615) * 0.02 = -0.02; graphmax = ceil(2.28) * 0.02 = 0.06; nfrac = 2.
        Ticks c = Ticks.linear(-0.0123, 0.0456, 6);
        assertTicks(new double[] {-0.02, 0, 0.02, 0.04, 0.06}, c);
        assertEquals(2, c.fractionDigits());
        // Degenerate [3, 3] is widened to [1.5, 4.5]: range = nicenum(3, false) = 5; d = nicenum(1, true) = 1.
        assertTicks(new double[] {1, 2, 3, 4, 5}, Ticks.linear(3, 3, 5));
    }

    @Test
    void linearTicksAreNiceAndCoverTheRange() {
        SplittableRandom rnd = new SplittableRandom(1202);
        for (int trial = 0; trial < 2000; trial++) {
            double scale = Math.pow(10, rnd.nextInt(-8, 9));
            double a = (rnd.nextDouble() * 2 - 1) * scale;
            double b = a + rnd.nextDouble() * scale * rnd.nextInt(1, 50);
            int n = rnd.nextInt(2, 12);
            Ticks t = trial % 2 == 0 ? Ticks.linear(a, b, n) : Ticks.linearTight(a, b, n);
            double[] m = t.major();
            assertTrue(m[0] <= a && m[m.length - 1] >= b, "ticks must enclose the data: " + t + " for [" + a
                    + ", " + b + "]");
            // Loose labeling: each end is the nearest multiple of the step outside the data.
            assertTrue(m[0] > a - t.step() && m[m.length - 1] < b + t.step(), t.toString());
            double mant = t.step() / Math.pow(10, Math.floor(Math.log10(t.step())));
            assertTrue(Math.abs(mant - 1) < 1e-9 || Math.abs(mant - 2) < 1e-9 || Math.abs(mant - 5) < 1e-9
                    || Math.abs(mant - 10) < 1e-9, "step " + t.step() + " is not 1, 2 or 5 x 10^k");
            for (int i = 1; i < m.length; i++) {
                assertEquals(t.step(), m[i] - m[i - 1], 1e-9 * t.step());
            }
        }
    }

    @Test
    void tightChoiceIsOneOfHeckbertsCandidatesAndNeverWider() {
        // [0, 12], n = 6: plain Heckbert gives d = nicenum(4, true) = 5 -> [0, 15]; with n = 8,
        // d = nicenum(20 / 7 = 2.86, true) = 2 -> [0, 12] (7 ticks <= 6 + 3).
        Ticks t = Ticks.linearTight(0, 12, 6);
        assertTicks(new double[] {0, 2, 4, 6, 8, 10, 12}, t);
        assertEquals(Ticks.linear(0, 12, 8), t);
        SplittableRandom rnd = new SplittableRandom(7);
        for (int trial = 0; trial < 500; trial++) {
            double a = rnd.nextDouble() * 100 - 50;
            double b = a + rnd.nextDouble() * 100;
            Ticks tight = Ticks.linearTight(a, b, 6);
            Ticks plain = Ticks.linear(a, b, 6);
            assertTrue(tight.hi() - tight.lo() <= plain.hi() - plain.lo());
            boolean found = false;
            for (int n = 5; n <= 8; n++) {
                found |= Ticks.linear(a, b, n).equals(tight);
            }
            assertTrue(found || tight.equals(plain), "not a Heckbert candidate: " + tight);
        }
    }

    @Test
    void logTicksSitAtPowersOfTen() {
        // [0.03, 420]: floor(log10 0.03) = -2, ceil(log10 420) = 3 -> 1e-2 .. 1e3, 5 decades, minor 2..9 x 10^k.
        Ticks t = Ticks.log10(0.03, 420, 6);
        assertArrayEquals(new double[] {1e-2, 1e-1, 1e0, 1e1, 1e2, 1e3}, t.major());
        assertEquals(40, t.minor().length);
        assertEquals(0.02, t.minor()[0]);
        assertEquals(900, t.minor()[39], 1e-12);
        // Exact powers are their own ends: [1, 1000] -> 1..1000.
        assertArrayEquals(new double[] {1, 10, 100, 1000}, Ticks.log10(1, 1000, 6).major());
        // A single value that is a power of ten is widened by a decade each way.
        assertArrayEquals(new double[] {1, 10, 100}, Ticks.log10(10, 10, 6).major());
        // [1e-12, 1e6]: 18 decades > 6, k = round(nicenum(18 / 5 = 3.6, true)) = 5; ends floored/ceiled to
        // multiples of 5: 1e-15 .. 1e10; no minor ticks.
        Ticks w = Ticks.log10(1e-12, 1e6, 6);
        assertArrayEquals(new double[] {1e-15, 1e-10, 1e-5, 1e0, 1e5, 1e10}, w.major());
        assertEquals(0, w.minor().length);
        assertThrows(IllegalArgumentException.class, () -> Ticks.log10(0, 1, 6));
        assertThrows(IllegalArgumentException.class, () -> Ticks.log10(-1, 1, 6));
    }

    @Test
    void logTickEndsEncloseRandomData() {
        SplittableRandom rnd = new SplittableRandom(99);
        for (int trial = 0; trial < 2000; trial++) {
            double a = Math.pow(10, rnd.nextDouble() * 40 - 20);
            double b = a * Math.pow(10, rnd.nextDouble() * 10);
            Ticks t = Ticks.log10(a, b, 6);
            double[] m = t.major();
            assertTrue(m[0] <= a && m[m.length - 1] >= b, t + " for [" + a + ", " + b + "]");
            for (double v : m) {
                // Each major tick is the double nearest to an integer power of ten.
                assertEquals(Double.parseDouble("1e" + Ticks.floorLog10(v)), v);
            }
        }
    }

    @Test
    void floorLog10IsExactAtPowerBoundaries() {
        for (int e = -300; e <= 300; e++) {
            double p = Ticks.pow10(e);
            assertEquals(e, Ticks.floorLog10(p), "10^" + e);
            assertEquals(e - 1, Ticks.floorLog10(Math.nextDown(p)), "just below 10^" + e);
            assertEquals(e, Ticks.ceilLog10(p));
            assertEquals(e + 1, Ticks.ceilLog10(Math.nextUp(p)));
        }
    }

    @Test
    void rejectsBadRanges() {
        assertThrows(IllegalArgumentException.class, () -> Ticks.linear(Double.NaN, 1, 5));
        assertThrows(IllegalArgumentException.class, () -> Ticks.linear(2, 1, 5));
        assertThrows(IllegalArgumentException.class, () -> Ticks.linear(0, Double.POSITIVE_INFINITY, 5));
        assertThrows(IllegalArgumentException.class, () -> Ticks.linear(0, 1, 1));
    }
}
