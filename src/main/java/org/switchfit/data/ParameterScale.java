package org.switchfit.data;

import java.util.Locale;

/**
 * The scale on which a parameter is estimated (or an observable is transformed): linear, natural log or log10.
 * Bounds and start values are always written on the linear scale.
 */
public enum ParameterScale {
    /** Identity. */
    LIN("lin"),
    /** Natural logarithm. */
    LOG("log"),
    /** Decimal logarithm. */
    LOG10("log10");

    private final String token;

    ParameterScale(String token) {
        this.token = token;
    }

    /** The spelling in files: {@code lin}, {@code log} or {@code log10}. */
    public String token() {
        return token;
    }

    /** The scale written as {@code token} (letter case ignored), or null when unknown. */
    public static ParameterScale fromToken(String token) {
        String t = token.strip().toLowerCase(Locale.ROOT);
        for (ParameterScale s : values()) {
            if (s.token.equals(t)) {
                return s;
            }
        }
        return null;
    }

    /** Whether only positive values can be represented. */
    public boolean needsPositive() {
        return this != LIN;
    }

    /** Maps a linear value to this scale. */
    public double toScale(double linear) {
        switch (this) {
            case LOG:
                return Math.log(linear);
            case LOG10:
                return Math.log10(linear);
            default:
                return linear;
        }
    }

    /** Maps a value on this scale back to the linear scale. */
    public double toLinear(double scaled) {
        switch (this) {
            case LOG:
                return Math.exp(scaled);
            case LOG10:
                return Math.pow(10.0, scaled);
            default:
                return scaled;
        }
    }
}
