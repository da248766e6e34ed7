package org.switchfit.util;

import java.util.Locale;

/**
 * Where a piece of user input came from: a file, optionally a line and column, optionally the id of a model
 * element. Immutable value; any field may be absent (null or a non-positive line).
 */
public record SourceLocation(String file, int line, int column, String elementId) {

    /** A location naming only a file. */
    public static SourceLocation ofFile(String file) {
        return new SourceLocation(file, 0, 0, null);
    }

    /** A location naming a file and a 1-based line. */
    public static SourceLocation ofLine(String file, int line) {
        return new SourceLocation(file, line, 0, null);
    }

    /** A location naming a model element by id, optionally within a file. */
    public static SourceLocation ofElement(String file, String elementId) {
        return new SourceLocation(file, 0, 0, elementId);
    }

    /** Returns a copy naming the given element id. */
    public SourceLocation withElement(String id) {
        return new SourceLocation(file, line, column, id);
    }

    /** Human-readable form such as {@code models/a.xml, line 12} or {@code element 'r3' (models/a.xml)}. */
    @Override
    public String toString() {
        StringBuilder sb = new StringBuilder();
        if (elementId != null) {
            sb.append('\'').append(elementId).append('\'');
        }
        String where = file == null ? "" : file;
        if (line > 0) {
            where = where + (where.isEmpty() ? "" : ", ") + String.format(Locale.ROOT, "line %d", line);
            if (column > 0) {
                where = where + String.format(Locale.ROOT, ", column %d", column);
            }
        }
        if (!where.isEmpty()) {
            if (sb.length() > 0) {
                sb.append(" (").append(where).append(')');
            } else {
                sb.append(where);
            }
        }
        return sb.toString();
    }
}
