package org.switchfit.data;

import java.util.ArrayList;
import java.util.Collections;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * A delimited text table as read from a file: a header of column names and rows that remember their line numbers.
 *
 * <p>Immutable and thread-safe. Columns whose header is empty (such as an unnamed index column written by
 * dataframe tools) are dropped when reading. Lookups of missing columns or malformed fields throw
 * {@link UserInputException} naming the file, line and column.
 */
public final class TextTable {

    private final String source;
    private final List<String> columns;
    private final Map<String, Integer> columnIndex;
    private final List<Row> rows;

    TextTable(String source, List<String> columns, List<Integer> lines, List<String[]> fields) {
        this.source = source;
        this.columns = List.copyOf(columns);
        Map<String, Integer> index = new HashMap<>();
        for (int i = 0; i < columns.size(); i++) {
            index.put(columns.get(i), i);
        }
        this.columnIndex = Collections.unmodifiableMap(index);
        List<Row> r = new ArrayList<>(fields.size());
        for (int i = 0; i < fields.size(); i++) {
            r.add(new Row(lines.get(i), fields.get(i)));
        }
        this.rows = Collections.unmodifiableList(r);
    }

    /** The file name used in messages. */
    public String source() {
        return source;
    }

    /** Column names in file order. */
    public List<String> columns() {
        return columns;
    }

    /** Data rows in file order (header, comments and blank lines excluded). */
    public List<Row> rows() {
        return rows;
    }

    /** Whether the table has a column of that exact name. */
    public boolean hasColumn(String name) {
        return columnIndex.containsKey(name);
    }

    /**
     * Throws unless every named column is present.
     *
     * @param what short description of the table for the message, e.g. "measurement table"
     */
    public void requireColumns(String what, String... names) {
        for (String name : names) {
            if (!hasColumn(name)) {
                throw Messages.error(SourceLocation.ofLine(source, 1),
                        "the %s has no column '%s'%s (columns: %s); add the column to the header line",
                        what, name, Spelling.didYouMean(name, columns), String.join(", ", columns));
            }
        }
    }

    /** Location of the header line. */
    public SourceLocation headerLocation() {
        return SourceLocation.ofLine(source, 1);
    }

    /** One data row: its 1-based line number in the file and its fields. */
    public final class Row {
        private final int line;
        private final String[] fields;

        private Row(int line, String[] fields) {
            this.line = line;
            this.fields = fields;
        }

        /** 1-based line in the file where the row starts. */
        public int line() {
            return line;
        }

        /** Location of this row for messages. */
        public SourceLocation location() {
            return SourceLocation.ofLine(source, line);
        }

        /** Location of this row and a column, for messages. */
        public SourceLocation location(String column) {
            Integer c = columnIndex.get(column);
            return new SourceLocation(source, line, c == null ? 0 : c + 1, null);
        }

        /** Raw field of the column, stripped of surrounding blanks; empty when the column is absent. */
        public String text(String column) {
            Integer c = columnIndex.get(column);
            return c == null ? "" : fields[c].strip();
        }

        /** Non-empty field of a required column. */
        public String requireText(String column) {
            String t = text(column);
            if (t.isEmpty()) {
                throw Messages.error(location(column), "column '%s' is empty; give a value", column);
            }
            return t;
        }

        /** Numeric field of a required column (NaN and infinities allowed, see {@link DataNumbers}). */
        public double number(String column) {
            return parse(column, requireText(column));
        }

        /** Numeric field, or {@code fallback} when the column is absent or the field empty. */
        public double number(String column, double fallback) {
            String t = text(column);
            return t.isEmpty() ? fallback : parse(column, t);
        }

        private double parse(String column, String t) {
            try {
                return DataNumbers.parse(t);
            } catch (NumberFormatException e) {
                throw Messages.error(location(column), e, "column '%s': '%s' is not a number; write a decimal"
                        + " number such as 0.25 or 1e-3 (nan and inf are accepted)", column, t);
            }
        }
    }
}
