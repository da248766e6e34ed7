package org.switchfit.data;

import java.util.List;

/**
 * Formats tables in the syntax {@link DelimitedReader} reads: fields are quoted only when they contain the
 * delimiter, a quote, a line break, start with {@code #} or have surrounding blanks; numbers are written by
 * {@link DataNumbers#format(double)} so that reading gives back the same doubles. Lines end with LF.
 * Stateless and thread-safe.
 */
public final class DelimitedWriter {

    private DelimitedWriter() {
    }

    /**
     * Formats a header and rows.
     *
     * @param columns   column names
     * @param rows      rows of the same length as {@code columns}; elements are written with {@code toString()}
     *                  except {@link Double}s, which use {@link DataNumbers#format(double)}; null is an empty field
     * @param delimiter field delimiter
     */
    public static String format(List<String> columns, List<List<?>> rows, char delimiter) {
        StringBuilder sb = new StringBuilder();
        appendRow(sb, columns, delimiter, columns.size());
        for (List<?> row : rows) {
            appendRow(sb, row, delimiter, columns.size());
        }
        return sb.toString();
    }

    private static void appendRow(StringBuilder sb, List<?> row, char delimiter, int width) {
        if (row.size() != width) {
            throw new IllegalArgumentException("row has " + row.size() + " fields, header " + width + ": " + row);
        }
        for (int i = 0; i < row.size(); i++) {
            if (i > 0) {
                sb.append(delimiter);
            }
            Object v = row.get(i);
            String text = v == null ? "" : v instanceof Double ? DataNumbers.format((Double) v) : v.toString();
            sb.append(quoteIfNeeded(text, delimiter));
        }
        sb.append('\n');
    }

    /** The field as written: quoted (with inner quotes doubled) when needed, else unchanged. */
    public static String quoteIfNeeded(String text, char delimiter) {
        boolean quote = text.indexOf(delimiter) >= 0 || text.indexOf('"') >= 0 || text.indexOf('\n') >= 0
                || text.indexOf('\r') >= 0 || text.startsWith("#") || !text.equals(text.strip());
        return quote ? '"' + text.replace("\"", "\"\"") + '"' : text;
    }
}
