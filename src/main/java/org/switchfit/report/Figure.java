package org.switchfit.report;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import org.switchfit.util.AtomicFiles;

/**
 * A figure: one or more {@link Plot} panels in a grid, rendered to a self-contained SVG string. Fluent and mutable
 * while being built; not thread-safe.
 *
 * <p>The SVG has a viewBox, an accessible {@code <title>} and {@code <desc>} (referenced by {@code aria-labelledby}),
 * a {@code data-figure} attribute carrying the id (the headless-browser check looks for it), generic font families
 * only, and no scripts, style sheets or external references. Element ids inside the SVG are prefixed with the
 * figure id, so several figures can be inlined in one HTML page as long as their ids differ.
 */
public final class Figure {
    private final String id;
    private final String title;
    private final List<Plot> panels = new ArrayList<>();
    private String description = "";
    private int columns = 1;
    private int panelWidth = 520;
    private int panelHeight = 340;

    private Figure(String id, String title) {
        this.id = Svg.safeId(id);
        this.title = title == null ? "" : title;
    }

    /**
     * A new empty figure.
     *
     * @param id    identifier, unique within a report; characters other than letters, digits, '-' and '_' become
     *              '_'
     * @param title accessible title (also used as caption by {@link HtmlReport} when none is given)
     */
    public static Figure of(String id, String title) {
        if (id == null || id.isBlank()) {
            throw new IllegalArgumentException("figure id must not be blank");
        }
        return new Figure(id, title);
    }

    /** Adds a panel (filled row by row); returns this. */
    public Figure add(Plot p) {
        if (p == null) {
            throw new IllegalArgumentException("panel must not be null");
        }
        panels.add(p);
        return this;
    }

    /** Sets the number of panel columns (1..6); returns this. */
    public Figure columns(int c) {
        if (c < 1 || c > 6) {
            throw new IllegalArgumentException("columns must be in 1..6, got " + c);
        }
        this.columns = c;
        return this;
    }

    /** Sets each panel's size in px (width 160..2000, height 120..2000); returns this. */
    public Figure panelSize(int width, int height) {
        if (width < 160 || width > 2000 || height < 120 || height > 2000) {
            throw new IllegalArgumentException("panel size must be within 160..2000 x 120..2000 px, got " + width
                    + " x " + height);
        }
        this.panelWidth = width;
        this.panelHeight = height;
        return this;
    }

    /** Sets the accessible long description; returns this. Default: generated from panel titles and axes. */
    public Figure description(String d) {
        this.description = d == null ? "" : d;
        return this;
    }

    /** The (sanitised) id. */
    public String id() {
        return id;
    }

    /** The title. */
    public String title() {
        return title;
    }

    /** The panels, unmodifiable. */
    public List<Plot> panels() {
        return Collections.unmodifiableList(panels);
    }

    int columnsUsed() {
        return Math.min(columns, Math.max(1, panels.size()));
    }

    int panelWidth() {
        return panelWidth;
    }

    int panelHeight() {
        return panelHeight;
    }

    /** The description given, or one generated from the panels. */
    String descriptionText() {
        if (!description.isEmpty()) {
            return description;
        }
        StringBuilder sb = new StringBuilder();
        sb.append(panels.size()).append(panels.size() == 1 ? " panel" : " panels");
        for (Plot p : panels) {
            sb.append("; ").append(p.title().isEmpty() ? "untitled" : p.title()).append(" (x: ")
                    .append(p.x().label()).append(p.x().scale() == Axis.Scale.LOG10 ? ", log scale" : "")
                    .append("; y: ").append(p.y().label())
                    .append(p.y().scale() == Axis.Scale.LOG10 ? ", log scale" : "").append(')');
        }
        return sb.toString();
    }

    /**
     * Writes the figure as a standalone SVG file (XML prolog plus {@link #toSvg()}, UTF-8) atomically, creating
     * parent directories.
     */
    public void writeSvg(Path file) {
        AtomicFiles.writeString(file, "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n" + toSvg());
    }

    /** Renders the figure as a standalone SVG document fragment (an {@code <svg>} element, no XML prolog). */
    public String toSvg() {
        return new SvgRenderer(this).render();
    }
}
