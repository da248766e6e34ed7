package org.switchfit.report;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;

/**
 * One panel of a {@link Figure}: a title, two axes and the series drawn in order (later on top). Fluent and
 * mutable while it is being built; not thread-safe. Rendering does not change it.
 */
public final class Plot {
    /** Where the legend box goes, inside the plot area. */
    public enum Legend {
        /** The corner where the box hides the least of what is drawn (default). */
        AUTO,
        /** Top right corner. */
        TOP_RIGHT,
        /** Top left corner. */
        TOP_LEFT,
        /** Bottom right corner. */
        BOTTOM_RIGHT,
        /** Bottom left corner. */
        BOTTOM_LEFT,
        /** No legend. */
        NONE
    }

    private final String title;
    private final Axis x;
    private final Axis y;
    private final List<Series> series = new ArrayList<>();
    private Legend legend = Legend.AUTO;

    /**
     * @param title panel title (may be empty)
     * @param x     horizontal axis
     * @param y     vertical axis
     */
    public Plot(String title, Axis x, Axis y) {
        if (x == null || y == null) {
            throw new IllegalArgumentException("both axes are required");
        }
        this.title = title == null ? "" : title;
        this.x = x;
        this.y = y;
    }

    /** Adds a series on top of those already added; returns this. */
    public Plot add(Series s) {
        if (s == null) {
            throw new IllegalArgumentException("series must not be null");
        }
        series.add(s);
        return this;
    }

    /** Sets the legend position; returns this. */
    public Plot legend(Legend position) {
        this.legend = position == null ? Legend.NONE : position;
        return this;
    }

    /** The title. */
    public String title() {
        return title;
    }

    /** The horizontal axis. */
    public Axis x() {
        return x;
    }

    /** The vertical axis. */
    public Axis y() {
        return y;
    }

    /** The series, unmodifiable, in drawing order. */
    public List<Series> series() {
        return Collections.unmodifiableList(series);
    }

    /** The legend position. */
    public Legend legend() {
        return legend;
    }
}
