package org.switchfit.report;

import java.util.List;

/**
 * Colours for series: the eight colours of the colour-universal-design palette of M. Okabe and K. Ito, "Color
 * Universal Design (CUD): how to make figures and presentations that are friendly to colorblind people" (2008),
 * ordered for white backgrounds, with the low-contrast yellow last. Colours are "#rrggbb" strings.
 */
public final class Palette {
    private Palette() {
    }

    /** Blue. */
    public static final String BLUE = "#0072B2";
    /** Vermillion. */
    public static final String VERMILLION = "#D55E00";
    /** Bluish green. */
    public static final String GREEN = "#009E73";
    /** Reddish purple. */
    public static final String PURPLE = "#CC79A7";
    /** Orange. */
    public static final String ORANGE = "#E69F00";
    /** Sky blue. */
    public static final String SKY = "#56B4E9";
    /** Yellow (low contrast on white; use for fills). */
    public static final String YELLOW = "#F0E442";
    /** Black. */
    public static final String BLACK = "#000000";
    /** Mid grey for reference lines and annotations (not part of the palette proper). */
    public static final String GREY = "#5A5A5A";

    private static final List<String> ORDER = List.of(BLUE, VERMILLION, GREEN, PURPLE, ORANGE, SKY, BLACK, YELLOW);

    /** The i-th series colour, cycling through the eight palette colours; i &ge; 0. */
    public static String color(int i) {
        if (i < 0) {
            throw new IllegalArgumentException("colour index must be >= 0, got " + i);
        }
        return ORDER.get(i % ORDER.size());
    }

    /** Number of distinct colours before {@link #color(int)} repeats. */
    public static int size() {
        return ORDER.size();
    }

    /** Whether {@code c} is a colour this package accepts: "#rrggbb" (hex digits, either case). */
    static boolean isColor(String c) {
        return c != null && c.matches("#[0-9a-fA-F]{6}");
    }

    static String check(String c) {
        if (c != null && !isColor(c)) {
            throw new IllegalArgumentException("colour must be \"#rrggbb\", got \"" + c + "\"");
        }
        return c;
    }
}
