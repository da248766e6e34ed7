package org.switchfit.data;

import java.util.Locale;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Builds this package's user errors. String arguments are user text (fields, keys, ids), so they are shown with
 * line breaks and tabs escaped and cut to a readable length, keeping each message on one line.
 */
final class Messages {

    private static final int MAX_SHOWN = 80;

    private Messages() {
    }

    /** A {@link UserInputException} with the template formatted in {@link Locale#ROOT}. */
    static UserInputException error(SourceLocation location, String template, Object... args) {
        return new UserInputException(location, format(template, args));
    }

    /** Same with a chained cause. */
    static UserInputException error(SourceLocation location, Throwable cause, String template, Object... args) {
        return new UserInputException(location, format(template, args), cause);
    }

    private static String format(String template, Object... args) {
        Object[] shown = args.clone();
        for (int i = 0; i < shown.length; i++) {
            if (shown[i] instanceof String) {
                shown[i] = shown((String) shown[i]);
            }
        }
        return String.format(Locale.ROOT, template, shown);
    }

    /** User text made safe for a one-line message. */
    static String shown(String text) {
        String t = text.replace("\r", "\\r").replace("\n", "\\n").replace("\t", "\\t");
        return t.length() <= MAX_SHOWN ? t : t.substring(0, MAX_SHOWN) + "...";
    }
}
