package org.switchfit.report;

import java.util.Arrays;

/**
 * One thing drawn in a {@link Plot}. Implementations are immutable records; arrays are copied on construction,
 * so callers may reuse theirs. Create them with the static factories here and adjust with the records' copy
 * methods, e.g. {@code Series.line("fit", t, y).dashed().color(Palette.BLUE)}.
 *
 * <p>Non-finite values (and non-positive values on a log10 axis) are never drawn: they break lines and bands
 * into separate pieces, separate polygon rings and drop markers or error bars. A null colour means "next palette
 * colour" ({@link Palette#color(int)}, counted per plot). A null or empty label keeps the series out of the legend.
 */
public sealed interface Series permits Series.Line, Series.Points, Series.Band, Series.Area, Series.RefLine,
        Series.Note {

    /** Legend label; null or empty for none. */
    String label();

    /** Colour "#rrggbb", or null for automatic. */
    String color();

    /** Line dash pattern. */
    enum Dash {
        /** Solid. */
        SOLID,
        /** Dashed (6 px on, 4 px off). */
        DASHED,
        /** Dotted. */
        DOTTED
    }

    /** Marker shape. */
    enum Marker {
        /** No marker. */
        NONE,
        /** Circle. */
        CIRCLE,
        /** Square. */
        SQUARE,
        /** Upward triangle. */
        TRIANGLE,
        /** Diamond. */
        DIAMOND
    }

    /** A polyline through (x[i], y[i]); requires equal lengths. */
    static Line line(String label, double[] x, double[] y) {
        return new Line(label, x, y, null, Dash.SOLID, 1.8, Marker.NONE);
    }

    /** Markers at (x[i], y[i]) without error bars. */
    static Points points(String label, double[] x, double[] y) {
        return new Points(label, x, y, null, null, null, null, null, Marker.CIRCLE, 7, true);
    }

    /** A shaded band between lower[i] and upper[i] over x[i] (e.g. a prediction band). */
    static Band band(String label, double[] x, double[] lower, double[] upper) {
        return new Band(label, x, lower, upper, null, 0.25);
    }

    /** A filled polygon with vertices (x[i], y[i]); a NaN vertex separates rings (even-odd fill). */
    static Area area(String label, double[] x, double[] y) {
        return new Area(label, x, y, null, 0.3, true);
    }

    /** A vertical reference line at x = value, labelled at its top. */
    static RefLine vertical(String label, double value) {
        return new RefLine(label, true, value, null, Dash.DASHED);
    }

    /** A horizontal reference line at y = value, labelled at its right end. */
    static RefLine horizontal(String label, double value) {
        return new RefLine(label, false, value, null, Dash.DASHED);
    }

    /** A text annotation whose start is at data point (x, y); not in the legend. */
    static Note note(String text, double x, double y) {
        return new Note(text, x, y, null);
    }

    private static double[] copy(double[] a, String what) {
        if (a == null) {
            throw new IllegalArgumentException(what + " must not be null");
        }
        return a.clone();
    }

    private static double[] copyOrNull(double[] a) {
        return a == null ? null : a.clone();
    }

    private static void sameLength(int n, double[] a, String what) {
        if (a != null && a.length != n) {
            throw new IllegalArgumentException(what + " has length " + a.length + ", expected " + n);
        }
    }

    /**
     * A polyline.
     *
     * @param label  legend label
     * @param x      abscissae
     * @param y      ordinates, same length
     * @param color  colour or null
     * @param dash   dash pattern
     * @param width  stroke width in px, positive
     * @param marker marker drawn at each finite point, or NONE
     */
    record Line(String label, double[] x, double[] y, String color, Dash dash, double width, Marker marker)
            implements Series {
        /** Validates and copies. */
        public Line {
            x = copy(x, "x");
            y = copy(y, "y");
            sameLength(x.length, y, "y");
            Palette.check(color);
            if (!(width > 0 && width < 50)) {
                throw new IllegalArgumentException("line width must be in (0, 50) px, got " + width);
            }
        }

        @Override
        public double[] x() {
            return x.clone();
        }

        @Override
        public double[] y() {
            return y.clone();
        }

        /** Copy with colour c. */
        public Line color(String c) {
            return new Line(label, x, y, c, dash, width, marker);
        }

        /** Dashed copy. */
        public Line dashed() {
            return dash(Dash.DASHED);
        }

        /** Copy with dash pattern d. */
        public Line dash(Dash d) {
            return new Line(label, x, y, color, d, width, marker);
        }

        /** Copy with stroke width w px. */
        public Line width(double w) {
            return new Line(label, x, y, color, dash, w, marker);
        }

        /** Copy with marker m at each point. */
        public Line marker(Marker m) {
            return new Line(label, x, y, color, dash, width, m);
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof Line l && Arrays.equals(l.x, x) && Arrays.equals(l.y, y) && l.toString()
                    .equals(toString());
        }

        @Override
        public int hashCode() {
            return Arrays.hashCode(x) * 31 + Arrays.hashCode(y);
        }

        @Override
        public String toString() {
            return "Line[" + label + ", n=" + x.length + ", " + color + ", " + dash + ", " + width + ", " + marker
                    + "]";
        }
    }

    /**
     * Markers with optional error bars.
     *
     * @param label  legend label
     * @param x      abscissae
     * @param y      ordinates
     * @param yLow   lower ends of vertical error bars, or null
     * @param yHigh  upper ends of vertical error bars, or null (both or neither)
     * @param xLow   left ends of horizontal error bars, or null
     * @param xHigh  right ends of horizontal error bars, or null (both or neither)
     * @param color  colour or null
     * @param marker marker shape (NONE draws only the error bars)
     * @param size   marker size in px, positive
     * @param filled filled markers, or hollow (white fill, coloured outline)
     */
    record Points(String label, double[] x, double[] y, double[] yLow, double[] yHigh, double[] xLow,
                  double[] xHigh, String color, Marker marker, double size, boolean filled) implements Series {
        /** Validates and copies. */
        public Points {
            x = copy(x, "x");
            y = copy(y, "y");
            yLow = copyOrNull(yLow);
            yHigh = copyOrNull(yHigh);
            xLow = copyOrNull(xLow);
            xHigh = copyOrNull(xHigh);
            int n = x.length;
            sameLength(n, y, "y");
            sameLength(n, yLow, "yLow");
            sameLength(n, yHigh, "yHigh");
            sameLength(n, xLow, "xLow");
            sameLength(n, xHigh, "xHigh");
            if ((yLow == null) != (yHigh == null) || (xLow == null) != (xHigh == null)) {
                throw new IllegalArgumentException("error bars need both the low and the high ends");
            }
            Palette.check(color);
            if (!(size > 0 && size < 100)) {
                throw new IllegalArgumentException("marker size must be in (0, 100) px, got " + size);
            }
        }

        @Override
        public double[] x() {
            return x.clone();
        }

        @Override
        public double[] y() {
            return y.clone();
        }

        @Override
        public double[] yLow() {
            return copyOrNull(yLow);
        }

        @Override
        public double[] yHigh() {
            return copyOrNull(yHigh);
        }

        @Override
        public double[] xLow() {
            return copyOrNull(xLow);
        }

        @Override
        public double[] xHigh() {
            return copyOrNull(xHigh);
        }

        /** Copy with vertical error bars from low[i] to high[i]. */
        public Points yErrors(double[] low, double[] high) {
            return new Points(label, x, y, low, high, xLow, xHigh, color, marker, size, filled);
        }

        /** Copy with symmetric vertical error bars y[i] -+ sigma[i]. */
        public Points ySigma(double[] sigma) {
            sameLength(x.length, sigma, "sigma");
            double[] lo = new double[x.length];
            double[] hi = new double[x.length];
            for (int i = 0; i < lo.length; i++) {
                lo[i] = y[i] - sigma[i];
                hi[i] = y[i] + sigma[i];
            }
            return yErrors(lo, hi);
        }

        /** Copy with horizontal error bars from low[i] to high[i]. */
        public Points xErrors(double[] low, double[] high) {
            return new Points(label, x, y, yLow, yHigh, low, high, color, marker, size, filled);
        }

        /** Copy with symmetric horizontal error bars x[i] -+ sigma[i]. */
        public Points xSigma(double[] sigma) {
            sameLength(x.length, sigma, "sigma");
            double[] lo = new double[x.length];
            double[] hi = new double[x.length];
            for (int i = 0; i < lo.length; i++) {
                lo[i] = x[i] - sigma[i];
                hi[i] = x[i] + sigma[i];
            }
            return xErrors(lo, hi);
        }

        /** Copy with colour c. */
        public Points color(String c) {
            return new Points(label, x, y, yLow, yHigh, xLow, xHigh, c, marker, size, filled);
        }

        /** Copy with marker shape m. */
        public Points marker(Marker m) {
            return new Points(label, x, y, yLow, yHigh, xLow, xHigh, color, m, size, filled);
        }

        /** Copy with marker size s px. */
        public Points size(double s) {
            return new Points(label, x, y, yLow, yHigh, xLow, xHigh, color, marker, s, filled);
        }

        /** Hollow-marker copy. */
        public Points hollow() {
            return new Points(label, x, y, yLow, yHigh, xLow, xHigh, color, marker, size, false);
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof Points p && Arrays.equals(p.x, x) && Arrays.equals(p.y, y)
                    && Arrays.equals(p.yLow, yLow) && Arrays.equals(p.yHigh, yHigh) && Arrays.equals(p.xLow, xLow)
                    && Arrays.equals(p.xHigh, xHigh) && p.toString().equals(toString());
        }

        @Override
        public int hashCode() {
            return Arrays.hashCode(x) * 31 + Arrays.hashCode(y);
        }

        @Override
        public String toString() {
            return "Points[" + label + ", n=" + x.length + ", " + color + ", " + marker + ", " + size + ", "
                    + filled + "]";
        }
    }

    /**
     * A shaded band.
     *
     * @param label   legend label
     * @param x       abscissae
     * @param lower   lower curve
     * @param upper   upper curve
     * @param color   fill colour or null
     * @param opacity fill opacity in (0, 1]
     */
    record Band(String label, double[] x, double[] lower, double[] upper, String color, double opacity)
            implements Series {
        /** Validates and copies. */
        public Band {
            x = copy(x, "x");
            lower = copy(lower, "lower");
            upper = copy(upper, "upper");
            sameLength(x.length, lower, "lower");
            sameLength(x.length, upper, "upper");
            Palette.check(color);
            checkOpacity(opacity);
        }

        @Override
        public double[] x() {
            return x.clone();
        }

        @Override
        public double[] lower() {
            return lower.clone();
        }

        @Override
        public double[] upper() {
            return upper.clone();
        }

        /** Copy with colour c. */
        public Band color(String c) {
            return new Band(label, x, lower, upper, c, opacity);
        }

        /** Copy with fill opacity a. */
        public Band opacity(double a) {
            return new Band(label, x, lower, upper, color, a);
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof Band b && Arrays.equals(b.x, x) && Arrays.equals(b.lower, lower)
                    && Arrays.equals(b.upper, upper) && b.toString().equals(toString());
        }

        @Override
        public int hashCode() {
            return Arrays.hashCode(x) * 31 + Arrays.hashCode(lower);
        }

        @Override
        public String toString() {
            return "Band[" + label + ", n=" + x.length + ", " + color + ", " + opacity + "]";
        }
    }

    /**
     * A filled polygon (one or more rings separated by NaN vertices).
     *
     * @param label   legend label
     * @param x       vertex abscissae
     * @param y       vertex ordinates
     * @param color   colour or null
     * @param opacity fill opacity in (0, 1]
     * @param outline whether to stroke the outline in the full colour
     */
    record Area(String label, double[] x, double[] y, String color, double opacity, boolean outline)
            implements Series {
        /** Validates and copies. */
        public Area {
            x = copy(x, "x");
            y = copy(y, "y");
            sameLength(x.length, y, "y");
            Palette.check(color);
            checkOpacity(opacity);
        }

        @Override
        public double[] x() {
            return x.clone();
        }

        @Override
        public double[] y() {
            return y.clone();
        }

        /** Copy with colour c. */
        public Area color(String c) {
            return new Area(label, x, y, c, opacity, outline);
        }

        /** Copy with fill opacity a. */
        public Area opacity(double a) {
            return new Area(label, x, y, color, a, outline);
        }

        /** Copy without outline. */
        public Area noOutline() {
            return new Area(label, x, y, color, opacity, false);
        }

        @Override
        public boolean equals(Object o) {
            return o instanceof Area a && Arrays.equals(a.x, x) && Arrays.equals(a.y, y)
                    && a.toString().equals(toString());
        }

        @Override
        public int hashCode() {
            return Arrays.hashCode(x) * 31 + Arrays.hashCode(y);
        }

        @Override
        public String toString() {
            return "Area[" + label + ", n=" + x.length + ", " + color + ", " + opacity + ", " + outline + "]";
        }
    }

    /**
     * A reference line across the whole plot, labelled on the plot (not in the legend).
     *
     * @param label    text drawn next to the line; may be null
     * @param vertical true: x = value; false: y = value
     * @param value    position in data units; a non-drawable value draws nothing
     * @param color    colour or null (grey)
     * @param dash     dash pattern
     */
    record RefLine(String label, boolean vertical, double value, String color, Dash dash) implements Series {
        /** Validates. */
        public RefLine {
            Palette.check(color);
        }

        /** Copy with colour c. */
        public RefLine color(String c) {
            return new RefLine(label, vertical, value, c, dash);
        }

        /** Copy with dash pattern d. */
        public RefLine dash(Dash d) {
            return new RefLine(label, vertical, value, color, d);
        }
    }

    /**
     * A text annotation in data coordinates (not in the legend).
     *
     * @param label text
     * @param x     data abscissa of the text start
     * @param y     data ordinate of the text baseline
     * @param color colour or null (black)
     */
    record Note(String label, double x, double y, String color) implements Series {
        /** Validates. */
        public Note {
            Palette.check(color);
        }

        /** Copy with colour c. */
        public Note color(String c) {
            return new Note(label, x, y, c);
        }
    }

    private static void checkOpacity(double a) {
        if (!(a > 0 && a <= 1)) {
            throw new IllegalArgumentException("opacity must be in (0, 1], got " + a);
        }
    }
}
