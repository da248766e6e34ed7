package org.switchfit.report;

/**
 * One plot axis: label, scale (linear or log10), optional fixed range and the desired tick count. Immutable;
 * {@code withX} methods return changed copies.
 *
 * <p>With no fixed range the axis spans the data of all series, widened outwards to nice ticks (see
 * {@link Ticks#linearTight} and {@link Ticks#log10}). On a log10 axis non-positive values cannot be drawn and are treated like NaN (gaps).
 */
public final class Axis {
    /** Axis scale. */
    public enum Scale {
        /** Linear. */
        LINEAR,
        /** Base-10 logarithmic; only positive values are drawn. */
        LOG10
    }

    private final String label;
    private final Scale scale;
    private final double min;
    private final double max;
    private final int tickTarget;

    private Axis(String label, Scale scale, double min, double max, int tickTarget) {
        this.label = label == null ? "" : label;
        this.scale = scale;
        this.min = min;
        this.max = max;
        this.tickTarget = tickTarget;
    }

    /** A linear axis with automatic range. */
    public static Axis linear(String label) {
        return new Axis(label, Scale.LINEAR, Double.NaN, Double.NaN, 6);
    }

    /** A log10 axis with automatic range. */
    public static Axis log10(String label) {
        return new Axis(label, Scale.LOG10, Double.NaN, Double.NaN, 6);
    }

    /**
     * Fixes the range to [min, max]; ticks are the nice ticks inside it.
     *
     * @throws IllegalArgumentException unless min &lt; max, both finite (and positive on a log10 axis)
     */
    public Axis withRange(double min, double max) {
        if (!(Double.isFinite(min) && Double.isFinite(max) && min < max) || (scale == Scale.LOG10 && !(min > 0))) {
            throw new IllegalArgumentException("axis range must satisfy min < max (min > 0 on log10), got [" + min
                    + ", " + max + "]");
        }
        return new Axis(label, scale, min, max, tickTarget);
    }

    /** Sets the desired number of major ticks (2..20; default 6). */
    public Axis withTickTarget(int n) {
        if (n < 2 || n > 20) {
            throw new IllegalArgumentException("tick target must be in 2..20, got " + n);
        }
        return new Axis(label, scale, min, max, n);
    }

    /** The axis label (never null). */
    public String label() {
        return label;
    }

    /** The scale. */
    public Scale scale() {
        return scale;
    }

    /** Whether the range is fixed by {@link #withRange}. */
    public boolean hasFixedRange() {
        return !Double.isNaN(min);
    }

    /** Whether {@code v} can be drawn on this axis (finite, and positive on log10). */
    boolean drawable(double v) {
        return Double.isFinite(v) && (scale == Scale.LINEAR || v > 0);
    }

    /**
     * Ticks for data spanning [dataMin, dataMax] (NaN if there is no drawable data).
     */
    Ticks ticks(double dataMin, double dataMax) {
        if (hasFixedRange()) {
            Ticks t = scale == Scale.LOG10 ? Ticks.log10(min, max, tickTarget) : Ticks.linear(min, max, tickTarget);
            return new Ticks(min, max, t.step(), t.fractionDigits(), inside(t.major()), inside(t.minor()),
                    t.log10());
        }
        if (Double.isNaN(dataMin)) {
            return scale == Scale.LOG10 ? Ticks.log10(1, 10, tickTarget) : Ticks.linear(0, 1, tickTarget);
        }
        return scale == Scale.LOG10 ? Ticks.log10(dataMin, dataMax, tickTarget)
                : Ticks.linearTight(dataMin, dataMax, tickTarget);
    }

    private double[] inside(double[] v) {
        double eps = (max - min) * 1e-9;
        return java.util.Arrays.stream(v).filter(x -> x >= min - eps && x <= max + eps).toArray();
    }

    /** Fraction 0..1 of the way from lo to hi (log10-aware); NaN if v is not drawable. */
    double fraction(double v, double lo, double hi) {
        if (!drawable(v)) {
            return Double.NaN;
        }
        if (scale == Scale.LOG10) {
            return (Math.log10(v) - Math.log10(lo)) / (Math.log10(hi) - Math.log10(lo));
        }
        return (v - lo) / (hi - lo);
    }
}
