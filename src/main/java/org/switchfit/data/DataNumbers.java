package org.switchfit.data;

import java.util.Locale;
import java.util.Set;
import java.util.regex.Pattern;

/**
 * Parsing of numbers written in data and table files.
 *
 * <p>Accepted: decimal and scientific notation ({@code 12}, {@code -1.5e-3}, {@code .5}), and the special
 * values {@code nan}, {@code inf}, {@code +inf}, {@code -inf}, {@code infinity}, {@code -infinity} in any letter
 * case, and the YAML forms {@code .nan}, {@code .inf}, {@code -.inf} (the spellings written by common
 * spreadsheet and dataframe tools and by YAML 1.1; common practice). Rejected: Java-only
 * forms that a user would not mean as numbers, such as hexadecimal literals or the {@code d}/{@code f} suffixes
 * {@link Double#parseDouble} accepts. Stateless and thread-safe.
 */
public final class DataNumbers {

    private static final Pattern DECIMAL =
            Pattern.compile("[+-]?(?:\\d+\\.?\\d*|\\.\\d+)(?:[eE][+-]?\\d+)?");

    private static final Set<String> SPECIAL = Set.of("nan", "+nan", "-nan", ".nan", "inf",
            "+inf", "infinity", "+infinity", ".inf", "+.inf", "-inf", "-infinity", "-.inf");

    private DataNumbers() {
    }

    /**
     * Parses one number.
     *
     * @param text the field, surrounding blanks allowed
     * @return the value; NaN or an infinity for the special spellings
     * @throws NumberFormatException when the text is not a number in the accepted syntax
     */
    public static double parse(String text) {
        String t = text.strip();
        if (DECIMAL.matcher(t).matches()) {
            return Double.parseDouble(t);
        }
        String lower = t.toLowerCase(Locale.ROOT);
        switch (lower) {
            case "nan":
            case "+nan":
            case "-nan":
            case ".nan":
                return Double.NaN;
            case "inf":
            case "+inf":
            case "infinity":
            case "+infinity":
            case ".inf":
            case "+.inf":
                return Double.POSITIVE_INFINITY;
            case "-inf":
            case "-infinity":
            case "-.inf":
                return Double.NEGATIVE_INFINITY;
            default:
                throw new NumberFormatException("not a number: '" + text + "'");
        }
    }

    /** Whether {@link #parse(String)} would accept the text (no exception thrown, so cheap for ids). */
    public static boolean isNumber(String text) {
        String t = text.strip();
        if (t.isEmpty()) {
            return false;
        }
        char c = t.charAt(t.length() - 1);
        if ((c >= '0' && c <= '9') || c == '.') {
            return DECIMAL.matcher(t).matches();
        }
        return SPECIAL.contains(t.toLowerCase(Locale.ROOT));
    }

    /**
     * Formats a value so that {@link #parse(String)} returns exactly the same double: shortest round-trip
     * decimal form, {@code nan}, {@code inf} or {@code -inf}.
     */
    public static String format(double value) {
        if (Double.isNaN(value)) {
            return "nan";
        }
        if (Double.isInfinite(value)) {
            return value > 0 ? "inf" : "-inf";
        }
        if (value == Math.rint(value) && Math.abs(value) < 1e15) {
            if (value == 0 && 1 / value < 0) {
                return "-0.0";
            }
            return Long.toString((long) value);
        }
        return Double.toString(value);
    }
}
