package org.switchfit.report;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collections;
import java.util.Comparator;
import java.util.List;
import java.util.Locale;

/**
 * A plain data table for {@link HtmlReport}: a caption, column headers and rows of cells. Cells may be strings or
 * numbers; numbers are shown with {@link #formatNumber(Object)} and right-aligned when a whole column is numeric.
 * Fluent and mutable while being built; not thread-safe.
 */
public final class Table {
    private final String caption;
    private final List<String> headers;
    private final List<Object[]> rows = new ArrayList<>();
    private int sortColumn = -1;
    private boolean ascending = true;

    /**
     * @param caption table caption (may be empty)
     * @param headers column headers, at least one
     */
    public Table(String caption, String... headers) {
        if (headers == null || headers.length == 0) {
            throw new IllegalArgumentException("a table needs at least one column");
        }
        this.caption = caption == null ? "" : caption;
        this.headers = List.of(headers.clone());
    }

    /** Adds a row with exactly one cell per column (null cells show empty); returns this. */
    public Table row(Object... cells) {
        if (cells == null || cells.length != headers.size()) {
            throw new IllegalArgumentException("row has " + (cells == null ? 0 : cells.length) + " cells, table has "
                    + headers.size() + " columns");
        }
        rows.add(cells.clone());
        return this;
    }

    /**
     * Sorts the rows by one column (numbers numerically with NaN last, otherwise by text) and marks that header
     * as the sort key; returns this. The sort is stable, so ties keep insertion order.
     */
    public Table sortBy(int column, boolean ascendingOrder) {
        if (column < 0 || column >= headers.size()) {
            throw new IllegalArgumentException("column " + column + " out of range 0.." + (headers.size() - 1));
        }
        this.sortColumn = column;
        this.ascending = ascendingOrder;
        Comparator<Object[]> c = (a, b) -> compareCells(a[column], b[column]);
        rows.sort(ascendingOrder ? c : c.reversed());
        return this;
    }

    private static int compareCells(Object a, Object b) {
        if (a instanceof Number x && b instanceof Number y) {
            return Double.compare(x.doubleValue(), y.doubleValue()); // NaN sorts after everything
        }
        return String.valueOf(a).compareTo(String.valueOf(b));
    }

    /** The caption. */
    public String caption() {
        return caption;
    }

    /** Column headers. */
    public List<String> headers() {
        return headers;
    }

    /** Rows (copies of the cell arrays), in display order. */
    public List<Object[]> rows() {
        List<Object[]> out = new ArrayList<>();
        for (Object[] r : rows) {
            out.add(r.clone());
        }
        return Collections.unmodifiableList(out);
    }

    /**
     * Display form of a cell: null as empty; float and double as {@code %.6g} (Locale.ROOT) with NaN and
     * infinities spelled "NaN", "Inf", "-Inf"; other numbers and objects by {@code toString()}.
     */
    public static String formatNumber(Object cell) {
        if (cell == null) {
            return "";
        }
        if (cell instanceof Double || cell instanceof Float) {
            double v = ((Number) cell).doubleValue();
            if (Double.isNaN(v)) {
                return "NaN";
            }
            if (Double.isInfinite(v)) {
                return v > 0 ? "Inf" : "-Inf";
            }
            return String.format(Locale.ROOT, "%.6g", v);
        }
        return cell.toString();
    }

    boolean numericColumn(int c) {
        boolean any = false;
        for (Object[] r : rows) {
            if (r[c] == null) {
                continue;
            }
            if (!(r[c] instanceof Number)) {
                return false;
            }
            any = true;
        }
        return any;
    }

    void appendHtml(StringBuilder sb) {
        boolean[] numeric = new boolean[headers.size()];
        for (int c = 0; c < numeric.length; c++) {
            numeric[c] = numericColumn(c);
        }
        sb.append("<div class=\"table-wrap\"><table>\n");
        if (!caption.isEmpty()) {
            sb.append("<caption>").append(Svg.esc(caption)).append("</caption>\n");
        }
        sb.append("<thead><tr>");
        for (int c = 0; c < headers.size(); c++) {
            sb.append("<th scope=\"col\"");
            if (numeric[c]) {
                sb.append(" class=\"num\"");
            }
            if (c == sortColumn) {
                sb.append(" aria-sort=\"").append(ascending ? "ascending" : "descending").append('"');
            }
            sb.append('>').append(Svg.esc(headers.get(c)));
            if (c == sortColumn) {
                sb.append(ascending ? " <span class=\"sort\">\u25B2</span>" : " <span class=\"sort\">\u25BC</span>");
            }
            sb.append("</th>");
        }
        sb.append("</tr></thead>\n<tbody>\n");
        for (Object[] r : rows) {
            sb.append("<tr>");
            for (int c = 0; c < r.length; c++) {
                sb.append(numeric[c] ? "<td class=\"num\">" : "<td>").append(Svg.esc(formatNumber(r[c])))
                        .append("</td>");
            }
            sb.append("</tr>\n");
        }
        sb.append("</tbody></table></div>\n");
    }

    @Override
    public String toString() {
        return "Table[" + caption + ", " + headers + ", rows=" + rows.size() + ", sort=" + sortColumn + "]"
                + (rows.isEmpty() ? "" : " first=" + Arrays.toString(rows.get(0)));
    }
}
