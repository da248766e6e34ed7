package org.switchfit.report;

import java.nio.file.Path;
import java.util.List;
import org.switchfit.util.AtomicFiles;

/**
 * A CSV table with fixed formatting, built row by row and written atomically. Fluent and mutable while being
 * built; not thread-safe.
 *
 * <p>Format: comma separator, "\n" line ends, one header line. Fields are quoted as in RFC 4180 (IETF, 2005) when
 * they contain a comma, a double quote, CR or LF, or start or end with a space; quotes inside are doubled.
 * {@code double} and {@code float} cells are written with {@link Double#toString(double)}, which reads back to the
 * identical double with {@link Double#parseDouble} (on Java 17 it is occasionally one digit longer than the
 * shortest such string); non-finite values are written "NaN", "Infinity", "-Infinity", which Java, R and NumPy
 * parse back. Other cells use {@code toString()}; null is an empty field.
 */
public final class Csv {
    private final int columns;
    private final StringBuilder sb = new StringBuilder(4096);

    /** A table with the given header names (at least one). */
    public Csv(String... headers) {
        if (headers == null || headers.length == 0) {
            throw new IllegalArgumentException("a CSV table needs at least one column");
        }
        this.columns = headers.length;
        appendRow(headers);
    }

    /** A table from the given headers and equally long columns of numbers. */
    public static Csv ofColumns(List<String> headers, double[]... columns) {
        if (columns.length != headers.size()) {
            throw new IllegalArgumentException(columns.length + " columns but " + headers.size() + " headers");
        }
        Csv csv = new Csv(headers.toArray(new String[0]));
        int n = columns.length == 0 ? 0 : columns[0].length;
        for (double[] c : columns) {
            if (c.length != n) {
                throw new IllegalArgumentException("columns differ in length: " + c.length + " vs " + n);
            }
        }
        Object[] row = new Object[columns.length];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < columns.length; j++) {
                row[j] = columns[j][i];
            }
            csv.row(row);
        }
        return csv;
    }

    /** Appends a row with exactly one cell per column; returns this. */
    public Csv row(Object... cells) {
        if (cells == null || cells.length != columns) {
            throw new IllegalArgumentException("row has " + (cells == null ? 0 : cells.length) + " cells, table has "
                    + columns + " columns");
        }
        appendRow(cells);
        return this;
    }

    private void appendRow(Object[] cells) {
        for (int i = 0; i < cells.length; i++) {
            if (i > 0) {
                sb.append(',');
            }
            sb.append(field(cells[i]));
        }
        sb.append('\n');
    }

    /** The text of one field as written (number formatting and quoting applied). */
    public static String field(Object cell) {
        if (cell == null) {
            return "";
        }
        String s;
        if (cell instanceof Double || cell instanceof Float) {
            s = Double.toString(((Number) cell).doubleValue());
        } else {
            s = cell.toString();
        }
        boolean quote = s.indexOf(',') >= 0 || s.indexOf('"') >= 0 || s.indexOf('\n') >= 0 || s.indexOf('\r') >= 0
                || (!s.isEmpty() && (s.charAt(0) == ' ' || s.charAt(s.length() - 1) == ' '));
        return quote ? '"' + s.replace("\"", "\"\"") + '"' : s;
    }

    /** The CSV text so far. */
    @Override
    public String toString() {
        return sb.toString();
    }

    /** Writes the table to {@code file} atomically (UTF-8), creating parent directories. */
    public void write(Path file) {
        AtomicFiles.writeString(file, sb.toString());
    }
}
