package org.switchfit.util;

import java.util.Locale;

/**
 * A failure caused by user input (a model, data or problem file, a command-line value) rather than by a bug.
 * The message is one line: what is wrong, where, and what to do. The CLI prints it without a stack trace and
 * exits with code 2.
 */
public class UserInputException extends RuntimeException {
    private static final long serialVersionUID = 1L;

    private final transient SourceLocation location;

    /**
     * @param location where the problem is; may be null
     * @param message  one line: what is wrong and what to do (the location is prepended)
     */
    public UserInputException(SourceLocation location, String message) {
        super(compose(location, message));
        this.location = location;
    }

    /** Same as {@link #UserInputException(SourceLocation, String)} with a chained cause. */
    public UserInputException(SourceLocation location, String message, Throwable cause) {
        super(compose(location, message), cause);
        this.location = location;
    }

    /** Formats {@code template} with {@link Locale#ROOT}. */
    public static UserInputException of(SourceLocation location, String template, Object... args) {
        return new UserInputException(location, String.format(Locale.ROOT, template, args));
    }

    /** Where the problem is; may be null. */
    public SourceLocation location() {
        return location;
    }

    private static String compose(SourceLocation location, String message) {
        if (location == null) {
            return message;
        }
        String where = location.toString();
        return where.isEmpty() ? message : where + ": " + message;
    }
}
