package org.switchfit.report;

import java.util.Arrays;
import java.util.Locale;

/**
 * Tick positions for one axis: the axis range they span, the major ticks, optional minor ticks and the number of
 * fraction digits that labels need. Immutable; arrays are copied on the way in and out.
 *
 * <p>Linear ticks follow the "loose labeling" algorithm of P. S. Heckbert, "Nice numbers for graph labels", in
 * A. S. Glassner (ed.), Graphics Gems, Academic Press, 1990, pp. 61-63: the step is a nice number
 * (1, 2 or 5 times a power of ten) near {@code range / (n - 1)}, and the axis is widened outwards to whole steps, so
 * the first and last tick are the axis ends and enclose the data. Log10 ticks sit at powers of ten (every k-th
 * decade when there are many), with minor ticks at 2..9 times each power when there are few decades.
 *
 * @param lo             lower axis end (data units; for log axes the value, not its logarithm)
 * @param hi             upper axis end
 * @param step           spacing of major ticks: data units (linear) or decades (log10)
 * @param fractionDigits digits after the decimal point that linear labels need (Heckbert's {@code nfrac})
 * @param major          major tick values, ascending, first = lo, last = hi
 * @param minor          minor tick values (log10 only; empty otherwise)
 * @param log10          whether these are log10 ticks
 */
public record Ticks(double lo, double hi, double step, int fractionDigits, double[] major, double[] minor,
                    boolean log10) {

    /** Copies the arrays. */
    public Ticks {
        major = major.clone();
        minor = minor.clone();
    }

    @Override
    public double[] major() {
        return major.clone();
    }

    @Override
    public double[] minor() {
        return minor.clone();
    }

    /**
     * A nice number near {@code x}: 1, 2, 5 or 10 times a power of ten (Heckbert 1990, {@code nicenum}).
     *
     * @param x     a positive finite number
     * @param round true: nearest nice number (thresholds 1.5, 3, 7 on the mantissa); false: smallest nice number
     *              not below x
     * @return the nice number
     * @throws IllegalArgumentException if x is not positive and finite
     */
    public static double niceNumber(double x, boolean round) {
        if (!(x > 0 && x < Double.POSITIVE_INFINITY)) {
            throw new IllegalArgumentException("niceNumber needs a positive finite number, got " + x);
        }
        int exp = (int) Math.floor(Math.log10(x));
        double pow = Math.pow(10, exp);
        double f = x / pow;
        double nf;
        if (round) {
            nf = f < 1.5 ? 1 : f < 3 ? 2 : f < 7 ? 5 : 10;
        } else {
            nf = f <= 1 ? 1 : f <= 2 ? 2 : f <= 5 ? 5 : 10;
        }
        return nf * pow;
    }

    /**
     * Linear ticks by Heckbert's loose labeling for data in [min, max].
     *
     * <p>range = nicenum(max - min, false); step = nicenum(range / (n - 1), true); lo = floor(min / step) * step;
     * hi = ceil(max / step) * step; fractionDigits = max(-floor(log10 step), 0). A degenerate range (min == max) is
     * widened to [x - |x|/2, x + |x|/2], or [-1, 1] when x = 0. Tick values are computed as k * step (no running
     * sum), so rounding errors do not accumulate.
     *
     * @param min         lower end of the data, finite
     * @param max         upper end of the data, finite, at least min
     * @param targetCount desired number of ticks, at least 2 (the result may have somewhat more or fewer)
     * @return the ticks
     * @throws IllegalArgumentException for non-finite bounds, max &lt; min or targetCount &lt; 2
     */
    public static Ticks linear(double min, double max, int targetCount) {
        checkRange(min, max);
        if (targetCount < 2) {
            throw new IllegalArgumentException("targetCount must be at least 2, got " + targetCount);
        }
        if (min == max) {
            double half = min == 0 ? 1 : Math.abs(min) / 2;
            min -= half;
            max += half;
        }
        double range = niceNumber(max - min, false);
        double step = niceNumber(range / (targetCount - 1), true);
        long kLo = (long) Math.floor(min / step);
        long kHi = (long) Math.ceil(max / step);
        double[] major = new double[(int) (kHi - kLo + 1)];
        for (int i = 0; i < major.length; i++) {
            major[i] = (kLo + i) * step;
        }
        int digits = Math.max(-(int) Math.floor(Math.log10(step)), 0);
        return new Ticks(major[0], major[major.length - 1], step, digits, major, new double[0], false);
    }

    /**
     * Linear ticks that waste the least axis length: Heckbert's loose labeling ({@link #linear}) run with tick
     * targets {@code targetCount - 1 .. targetCount + 2}, keeping results with at most {@code targetCount + 3}
     * ticks, choosing the narrowest axis (ties: tick count nearest the target, then the smaller target). Each
     * candidate is a plain Heckbert result; only the choice among them is ours.
     *
     * @param min         lower end of the data, finite
     * @param max         upper end of the data, finite, at least min
     * @param targetCount desired number of ticks, at least 2
     * @return the chosen ticks
     */
    public static Ticks linearTight(double min, double max, int targetCount) {
        Ticks best = linear(min, max, targetCount);
        for (int n = Math.max(2, targetCount - 1); n <= targetCount + 2; n++) {
            Ticks t = linear(min, max, n);
            if (t.major.length > targetCount + 3) {
                continue;
            }
            double span = t.hi - t.lo;
            double bestSpan = best.hi - best.lo;
            if (span < bestSpan || (span == bestSpan && Math.abs(t.major.length - targetCount)
                    < Math.abs(best.major.length - targetCount))) {
                best = t;
            }
        }
        return best;
    }

    /**
     * Log10 ticks for positive data in [min, max]: the axis runs from the power of ten at or below min to the power
     * of ten at or above max (widened by one decade on each side when min == max is itself a power of ten). Major
     * ticks are at every k-th decade, k = 1 while there are at most {@code targetCount} decades, else a nice
     * number of decades; minor ticks at 2..9 times each power when k = 1 and there are at most 6 decades.
     *
     * @param min         lower end of the data, positive finite
     * @param max         upper end of the data, finite, at least min
     * @param targetCount desired number of major ticks, at least 2
     * @return the ticks
     * @throws IllegalArgumentException for non-positive or non-finite bounds, max &lt; min or targetCount &lt; 2
     */
    public static Ticks log10(double min, double max, int targetCount) {
        checkRange(min, max);
        if (!(min > 0)) {
            throw new IllegalArgumentException("log10 ticks need positive data, got min = " + min);
        }
        if (targetCount < 2) {
            throw new IllegalArgumentException("targetCount must be at least 2, got " + targetCount);
        }
        int eLo = floorLog10(min);
        int eHi = ceilLog10(max);
        if (eLo == eHi) {
            eLo--;
            eHi++;
        }
        int decades = eHi - eLo;
        int k = 1;
        if (decades > targetCount) {
            k = (int) Math.round(niceNumber((double) decades / (targetCount - 1), true));
            eLo = Math.floorDiv(eLo, k) * k;
            eHi = -Math.floorDiv(-eHi, k) * k;
        }
        int n = (eHi - eLo) / k + 1;
        double[] major = new double[n];
        for (int i = 0; i < n; i++) {
            major[i] = pow10(eLo + i * k);
        }
        double[] minor = new double[0];
        if (k == 1 && decades <= 6) {
            minor = new double[8 * decades];
            int m = 0;
            for (int e = eLo; e < eHi; e++) {
                for (int j = 2; j <= 9; j++) {
                    minor[m++] = j * pow10(e);
                }
            }
        }
        return new Ticks(major[0], major[n - 1], k, 0, major, minor, true);
    }

    /** 10^e exactly representable where possible: parsing "1e" + e gives the double nearest to the power. */
    static double pow10(int e) {
        return Double.parseDouble("1e" + e);
    }

    /** floor(log10 x) without the rounding errors of Math.log10 near powers of ten. */
    static int floorLog10(double x) {
        int e = (int) Math.floor(Math.log10(x));
        if (pow10(e) > x) {
            e--;
        } else if (pow10(e + 1) <= x) {
            e++;
        }
        return e;
    }

    /** ceil(log10 x), exact at powers of ten. */
    static int ceilLog10(double x) {
        int e = floorLog10(x);
        return pow10(e) == x ? e : e + 1;
    }

    private static void checkRange(double min, double max) {
        if (!(Double.isFinite(min) && Double.isFinite(max) && min <= max)) {
            throw new IllegalArgumentException("tick range must be finite with min <= max, got [" + min + ", "
                    + max + "]");
        }
    }

    /** Debug form listing the major ticks. */
    @Override
    public String toString() {
        return String.format(Locale.ROOT, "Ticks[%s, step=%s, log10=%b]", Arrays.toString(major), step, log10);
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof Ticks t && t.lo == lo && t.hi == hi && t.step == step
                && t.fractionDigits == fractionDigits && Arrays.equals(t.major, major)
                && Arrays.equals(t.minor, minor) && t.log10 == log10;
    }

    @Override
    public int hashCode() {
        return 31 * Arrays.hashCode(major) + Arrays.hashCode(minor) + (log10 ? 1 : 0);
    }
}
