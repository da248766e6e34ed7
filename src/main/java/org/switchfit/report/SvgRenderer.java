package org.switchfit.report;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;

/**
 * Lays out and writes one {@link Figure} as SVG. Single use, not thread-safe. Text widths are estimated from the
 * character count (0.6 em per character, a safe upper bound for common sans-serif faces at these sizes), since no
 * font metrics are available without a renderer.
 */
final class SvgRenderer {
    private static final double FONT = 12;
    private static final double SMALL = 11;
    private static final double CHAR_EM = 0.6;
    /** Average advance of mixed-case text, em (DejaVu Sans lower case is about 0.55 em; common practice). */
    private static final double LEGEND_EM = 0.56;
    private static final String INK = "#222222";
    private static final String GRID = "#E6E6E6";
    private static final String FONTS = "DejaVu Sans, Liberation Sans, Arial, Helvetica, sans-serif";
    private static final String HALO = " paint-order=\"stroke\" stroke=\"#ffffff\" stroke-width=\"3\""
            + " stroke-linejoin=\"round\"";

    private final Figure fig;
    private final StringBuilder sb = new StringBuilder(16_384);
    private final String id;

    SvgRenderer(Figure fig) {
        this.fig = fig;
        this.id = fig.id();
    }

    String render() {
        int cols = fig.columnsUsed();
        int n = Math.max(1, fig.panels().size());
        int rows = (n + cols - 1) / cols;
        int w = cols * fig.panelWidth();
        int h = rows * fig.panelHeight();
        sb.append("<svg xmlns=\"http://www.w3.org/2000/svg\" viewBox=\"0 0 ").append(w).append(' ').append(h)
                .append("\" width=\"").append(w).append("\" height=\"").append(h)
                .append("\" role=\"img\" aria-labelledby=\"").append(id).append("-title ").append(id)
                .append("-desc\" data-figure=\"").append(id).append("\" font-family=\"").append(FONTS)
                .append("\" font-size=\"").append((int) FONT).append("\">\n");
        sb.append("<title id=\"").append(id).append("-title\">").append(Svg.esc(fig.title())).append("</title>\n");
        sb.append("<desc id=\"").append(id).append("-desc\">").append(Svg.esc(fig.descriptionText()))
                .append("</desc>\n");
        sb.append("<rect width=\"").append(w).append("\" height=\"").append(h).append("\" fill=\"#ffffff\"/>\n");
        List<Plot> panels = fig.panels();
        for (int i = 0; i < panels.size(); i++) {
            int ox = (i % cols) * fig.panelWidth();
            int oy = (i / cols) * fig.panelHeight();
            sb.append("<g data-panel=\"").append(i).append("\" transform=\"translate(").append(ox).append(',')
                    .append(oy).append(")\">\n");
            new Panel(panels.get(i), i).draw();
            sb.append("</g>\n");
        }
        sb.append("</svg>\n");
        return sb.toString();
    }

    /** Label text split into a base and an optional superscript (for powers of ten). */
    record TickLabel(String base, String sup) {
        double width(double font) {
            return (base.length() * CHAR_EM + sup.length() * CHAR_EM * 0.75) * font;
        }
    }

    static TickLabel tickLabel(double v, Ticks t) {
        if (t.log10()) {
            int e = Ticks.floorLog10(v);
            // One style per axis: plain decimals only when every tick of the axis is within 0.01..1000.
            if (Ticks.floorLog10(t.lo()) >= -2 && Ticks.floorLog10(t.hi()) <= 3) {
                return new TickLabel(e < 0 ? String.format(Locale.ROOT, "%." + (-e) + "f", v)
                        : String.format(Locale.ROOT, "%.0f", v), "");
            }
            return new TickLabel("10", minus(Integer.toString(e)));
        }
        if (v == 0) {
            return new TickLabel("0", "");
        }
        double maxAbs = Math.max(Math.abs(t.lo()), Math.abs(t.hi()));
        if (maxAbs >= 1e5 || t.fractionDigits() > 4) {
            int digits = Math.max(0, Ticks.floorLog10(maxAbs) - Ticks.floorLog10(t.step()));
            String s = String.format(Locale.ROOT, "%." + digits + "e", v);
            int k = s.indexOf('e');
            int exp = Integer.parseInt(s.substring(k + 1));
            return new TickLabel(minus(s.substring(0, k)) + "\u00D710", minus(Integer.toString(exp)));
        }
        return new TickLabel(minus(String.format(Locale.ROOT, "%." + t.fractionDigits() + "f", v)), "");
    }

    /** Typographic minus sign (U+2212) for a leading hyphen. */
    private static String minus(String s) {
        return s.startsWith("-") ? "\u2212" + s.substring(1) : s;
    }

    /** One panel being drawn. */
    private final class Panel {
        private final Plot plot;
        private final int index;
        private final Ticks tx;
        private final Ticks ty;
        private final double left;
        private final double top;
        private final double pw;
        private final double ph;
        private final String[] colors;
        private final Occupancy occ;

        Panel(Plot plot, int index) {
            this.plot = plot;
            this.index = index;
            double[] xr = {Double.NaN, Double.NaN};
            double[] yr = {Double.NaN, Double.NaN};
            for (Series s : plot.series()) {
                extend(s, xr, yr);
            }
            tx = plot.x().ticks(xr[0], xr[1]);
            ty = plot.y().ticks(yr[0], yr[1]);
            double yTickW = 0;
            for (double v : ty.major()) {
                yTickW = Math.max(yTickW, tickLabel(v, ty).width(SMALL));
            }
            double yLabelW = plot.y().label().isEmpty() ? 0 : FONT + 8;
            left = 10 + yLabelW + yTickW + 8;
            top = plot.title().isEmpty() ? 12 : 32;
            double bottom = 12 + SMALL + 6 + (plot.x().label().isEmpty() ? 0 : FONT + 8) + 4;
            pw = Math.max(40, fig.panelWidth() - left - 18);
            ph = Math.max(40, fig.panelHeight() - top - bottom);
            occ = new Occupancy(left, top, pw, ph);
            colors = new String[plot.series().size()];
            int auto = 0;
            for (int i = 0; i < colors.length; i++) {
                Series s = plot.series().get(i);
                if (s.color() != null) {
                    colors[i] = s.color();
                } else if (s instanceof Series.RefLine) {
                    colors[i] = Palette.GREY;
                } else if (s instanceof Series.Note) {
                    colors[i] = INK;
                } else {
                    colors[i] = Palette.color(auto++);
                }
            }
        }

        private void extend(Series s, double[] xr, double[] yr) {
            Axis ax = plot.x();
            Axis ay = plot.y();
            if (s instanceof Series.Line l) {
                pairs(l.x(), l.y(), xr, yr);
            } else if (s instanceof Series.Points p) {
                double[] x = p.x();
                double[] y = p.y();
                pairs(x, y, xr, yr);
                if (p.yLow() != null) {
                    pairs(x, p.yLow(), xr, yr);
                    pairs(x, p.yHigh(), xr, yr);
                }
                if (p.xLow() != null) {
                    pairs(p.xLow(), y, xr, yr);
                    pairs(p.xHigh(), y, xr, yr);
                }
            } else if (s instanceof Series.Band b) {
                pairs(b.x(), b.lower(), xr, yr);
                pairs(b.x(), b.upper(), xr, yr);
            } else if (s instanceof Series.Area a) {
                pairs(a.x(), a.y(), xr, yr);
            } else if (s instanceof Series.RefLine r) {
                Axis axis = r.vertical() ? ax : ay;
                if (axis.drawable(r.value())) {
                    one(r.value(), r.vertical() ? xr : yr);
                }
            } else if (s instanceof Series.Note t) {
                pairs(new double[] {t.x()}, new double[] {t.y()}, xr, yr);
            }
        }

        private void pairs(double[] x, double[] y, double[] xr, double[] yr) {
            for (int i = 0; i < x.length; i++) {
                if (plot.x().drawable(x[i]) && plot.y().drawable(y[i])) {
                    one(x[i], xr);
                    one(y[i], yr);
                }
            }
        }

        private void one(double v, double[] r) {
            if (Double.isNaN(r[0]) || v < r[0]) {
                r[0] = v;
            }
            if (Double.isNaN(r[1]) || v > r[1]) {
                r[1] = v;
            }
        }

        private double px(double v) {
            return left + plot.x().fraction(v, tx.lo(), tx.hi()) * pw;
        }

        private double py(double v) {
            return top + (1 - plot.y().fraction(v, ty.lo(), ty.hi())) * ph;
        }

        void draw() {
            String clip = id + "-clip" + index;
            sb.append("<defs><clipPath id=\"").append(clip).append("\"><rect x=\"");
            Svg.num(sb, left).append("\" y=\"");
            Svg.num(sb, top).append("\" width=\"");
            Svg.num(sb, pw).append("\" height=\"");
            Svg.num(sb, ph).append("\"/></clipPath></defs>\n");
            grid();
            sb.append("<g clip-path=\"url(#").append(clip).append(")\">\n");
            List<Series> ss = plot.series();
            for (int i = 0; i < ss.size(); i++) {
                series(ss.get(i), colors[i]);
            }
            sb.append("</g>\n");
            frameAndLabels();
            legend();
        }

        private void grid() {
            sb.append("<g stroke=\"").append(GRID).append("\" stroke-width=\"1\" fill=\"none\">");
            for (double v : tx.major()) {
                double x = px(v);
                line(x, top, x, top + ph);
            }
            for (double v : ty.major()) {
                double y = py(v);
                line(left, y, left + pw, y);
            }
            sb.append("</g>\n");
        }

        private void line(double x1, double y1, double x2, double y2) {
            sb.append("<line x1=\"");
            Svg.num(sb, x1).append("\" y1=\"");
            Svg.num(sb, y1).append("\" x2=\"");
            Svg.num(sb, x2).append("\" y2=\"");
            Svg.num(sb, y2).append("\"/>");
        }

        private void frameAndLabels() {
            sb.append("<rect x=\"");
            Svg.num(sb, left).append("\" y=\"");
            Svg.num(sb, top).append("\" width=\"");
            Svg.num(sb, pw).append("\" height=\"");
            Svg.num(sb, ph).append("\" fill=\"none\" stroke=\"").append(INK).append("\" stroke-width=\"1\"/>\n");
            double bottom = top + ph;
            sb.append("<g stroke=\"").append(INK).append("\" stroke-width=\"1\">");
            for (double v : tx.major()) {
                double x = px(v);
                line(x, bottom, x, bottom + 5);
            }
            for (double v : tx.minor()) {
                double x = px(v);
                line(x, bottom, x, bottom + 3);
            }
            for (double v : ty.major()) {
                double y = py(v);
                line(left - 5, y, left, y);
            }
            for (double v : ty.minor()) {
                double y = py(v);
                line(left - 3, y, left, y);
            }
            sb.append("</g>\n<g fill=\"").append(INK).append("\" font-size=\"").append((int) SMALL).append("\">");
            for (double v : tx.major()) {
                text(tickLabel(v, tx), px(v), bottom + 7 + SMALL, "middle");
            }
            for (double v : ty.major()) {
                text(tickLabel(v, ty), left - 8, py(v) + SMALL * 0.35, "end");
            }
            sb.append("</g>\n");
            if (!plot.x().label().isEmpty()) {
                sb.append("<text x=\"");
                Svg.num(sb, left + pw / 2).append("\" y=\"");
                Svg.num(sb, bottom + 7 + SMALL + 8 + FONT).append("\" text-anchor=\"middle\" fill=\"").append(INK)
                        .append("\">").append(Svg.esc(plot.x().label())).append("</text>\n");
            }
            if (!plot.y().label().isEmpty()) {
                double cx = 10 + FONT * 0.8;
                double cy = top + ph / 2;
                sb.append("<text transform=\"translate(");
                Svg.num(sb, cx).append(',');
                Svg.num(sb, cy).append(") rotate(-90)\" text-anchor=\"middle\" fill=\"").append(INK).append("\">")
                        .append(Svg.esc(plot.y().label())).append("</text>\n");
            }
            if (!plot.title().isEmpty()) {
                sb.append("<text x=\"");
                Svg.num(sb, left + pw / 2).append("\" y=\"20\" text-anchor=\"middle\" font-weight=\"bold\" fill=\"")
                        .append(INK).append("\">").append(Svg.esc(plot.title())).append("</text>\n");
            }
        }

        private void text(TickLabel t, double x, double y, String anchor) {
            sb.append("<text x=\"");
            Svg.num(sb, x).append("\" y=\"");
            Svg.num(sb, y).append("\" text-anchor=\"").append(anchor).append("\">").append(Svg.esc(t.base()));
            if (!t.sup().isEmpty()) {
                sb.append("<tspan dy=\"-0.45em\" font-size=\"0.75em\">").append(Svg.esc(t.sup())).append("</tspan>");
            }
            sb.append("</text>");
        }

        private void series(Series s, String color) {
            occ.weight(s instanceof Series.Points || s instanceof Series.Note ? 8 : 1);
            sb.append("<g data-series=\"").append(Svg.esc(s.label())).append("\">");
            if (s instanceof Series.Band b) {
                band(b, color);
            } else if (s instanceof Series.Area a) {
                area(a, color);
            } else if (s instanceof Series.Line l) {
                polyline(l.x(), l.y(), color, l.width(), l.dash());
                if (l.marker() != Series.Marker.NONE) {
                    occ.weight(3);
                    markers(l.x(), l.y(), l.marker(), 3 + 2 * l.width(), color, true);
                }
            } else if (s instanceof Series.Points p) {
                points(p, color);
            } else if (s instanceof Series.RefLine r) {
                refLine(r, color);
            } else if (s instanceof Series.Note t) {
                note(t, color);
            }
            sb.append("</g>\n");
        }

        private String dashAttr(Series.Dash d) {
            return switch (d) {
                case SOLID -> "";
                case DASHED -> " stroke-dasharray=\"6 4\"";
                case DOTTED -> " stroke-dasharray=\"1.5 3\" stroke-linecap=\"round\"";
            };
        }

        /** Path through drawable points; a non-drawable point ends the current piece. */
        private void polyline(double[] x, double[] y, String color, double width, Series.Dash dash) {
            StringBuilder d = new StringBuilder();
            boolean pen = false;
            double pa = 0;
            double pb = 0;
            for (int i = 0; i < x.length; i++) {
                double a = px(x[i]);
                double b = py(y[i]);
                if (Double.isNaN(a) || Double.isNaN(b)) {
                    pen = false;
                    continue;
                }
                if (pen) {
                    occ.segment(pa, pb, a, b);
                } else {
                    occ.point(a, b);
                }
                pa = a;
                pb = b;
                d.append(pen ? 'L' : 'M');
                Svg.num(d, a).append(' ');
                Svg.num(d, b);
                pen = true;
            }
            if (d.length() == 0) {
                return;
            }
            sb.append("<path d=\"").append(d).append("\" fill=\"none\" stroke=\"").append(color)
                    .append("\" stroke-width=\"");
            Svg.num(sb, width).append("\" stroke-linejoin=\"round\"").append(dashAttr(dash)).append("/>");
        }

        private void band(Series.Band b, String color) {
            double[] x = b.x();
            double[] lo = b.lower();
            double[] hi = b.upper();
            StringBuilder d = new StringBuilder();
            int i = 0;
            while (i < x.length) {
                int start = i;
                while (i < x.length && ok(x[i], lo[i], hi[i])) {
                    i++;
                }
                if (i - start >= 2) {
                    int m = i - start;
                    double[] rx = new double[2 * m];
                    double[] ry = new double[2 * m];
                    for (int k = 0; k < m; k++) {
                        rx[k] = px(x[start + k]);
                        ry[k] = py(hi[start + k]);
                        rx[2 * m - 1 - k] = rx[k];
                        ry[2 * m - 1 - k] = py(lo[start + k]);
                    }
                    ring(rx, ry);
                    for (int k = start; k < i; k++) {
                        d.append(k == start ? 'M' : 'L');
                        Svg.num(d, px(x[k])).append(' ');
                        Svg.num(d, py(hi[k]));
                    }
                    for (int k = i - 1; k >= start; k--) {
                        d.append('L');
                        Svg.num(d, px(x[k])).append(' ');
                        Svg.num(d, py(lo[k]));
                    }
                    d.append('Z');
                }
                i++;
            }
            if (d.length() > 0) {
                sb.append("<path d=\"").append(d).append("\" fill=\"").append(color).append("\" fill-opacity=\"")
                        .append(b.opacity()).append("\" stroke=\"none\"/>");
            }
        }

        private double[][] pixels(double[] x, double[] y, int from, int to) {
            double[][] r = new double[2][to - from];
            for (int i = from; i < to; i++) {
                r[0][i - from] = px(x[i]);
                r[1][i - from] = py(y[i]);
            }
            return r;
        }

        private void ring(double[] rx, double[] ry) {
            occ.fill(new double[][] {rx}, new double[][] {ry});
            outline(rx, ry);
        }

        private void outline(double[] rx, double[] ry) {
            for (int k = 0; k < rx.length; k++) {
                int j = (k + 1) % rx.length;
                occ.segment(rx[k], ry[k], rx[j], ry[j]);
            }
        }

        private void box(double x, double y, double w, double h) {
            for (double yy = y; yy <= y + h; yy += Occupancy.CELL / 2) {
                occ.segment(x, yy, x + w, yy);
            }
        }

        private boolean ok(double x, double lo, double hi) {
            return plot.x().drawable(x) && plot.y().drawable(lo) && plot.y().drawable(hi);
        }

        private void area(Series.Area a, String color) {
            double[] x = a.x();
            double[] y = a.y();
            StringBuilder d = new StringBuilder();
            boolean pen = false;
            List<double[][]> rings = new ArrayList<>();
            int ringStart = 0;
            for (int i = 0; i <= x.length; i++) {
                boolean good = i < x.length && !Double.isNaN(px(x[i])) && !Double.isNaN(py(y[i]));
                if (!good) {
                    if (pen) {
                        d.append('Z');
                        rings.add(pixels(x, y, ringStart, i));
                    }
                    pen = false;
                    continue;
                }
                if (!pen) {
                    ringStart = i;
                }
                d.append(pen ? 'L' : 'M');
                Svg.num(d, px(x[i])).append(' ');
                Svg.num(d, py(y[i]));
                pen = true;
            }
            double[][] rxs = new double[rings.size()][];
            double[][] rys = new double[rings.size()][];
            for (int r = 0; r < rxs.length; r++) {
                rxs[r] = rings.get(r)[0];
                rys[r] = rings.get(r)[1];
                outline(rxs[r], rys[r]);
            }
            occ.fill(rxs, rys);
            if (d.length() > 0) {
                sb.append("<path d=\"").append(d).append("\" fill=\"").append(color).append("\" fill-opacity=\"")
                        .append(a.opacity()).append("\" fill-rule=\"evenodd\" stroke=\"")
                        .append(a.outline() ? color : "none").append("\" stroke-width=\"1.5\"/>");
            }
        }

        private void points(Series.Points p, String color) {
            double[] x = p.x();
            double[] y = p.y();
            sb.append("<g stroke=\"").append(color).append("\" stroke-width=\"1.3\">");
            if (p.yLow() != null) {
                double[] lo = p.yLow();
                double[] hi = p.yHigh();
                for (int i = 0; i < x.length; i++) {
                    double a = px(x[i]);
                    double b1 = py(lo[i]);
                    double b2 = py(hi[i]);
                    if (!Double.isNaN(a) && !Double.isNaN(b1) && !Double.isNaN(b2)) {
                        occ.segment(a, b1, a, b2);
                        line(a, b1, a, b2);
                        line(a - 3, b1, a + 3, b1);
                        line(a - 3, b2, a + 3, b2);
                    }
                }
            }
            if (p.xLow() != null) {
                double[] lo = p.xLow();
                double[] hi = p.xHigh();
                for (int i = 0; i < x.length; i++) {
                    double b = py(y[i]);
                    double a1 = px(lo[i]);
                    double a2 = px(hi[i]);
                    if (!Double.isNaN(b) && !Double.isNaN(a1) && !Double.isNaN(a2)) {
                        occ.segment(a1, b, a2, b);
                        line(a1, b, a2, b);
                        line(a1, b - 3, a1, b + 3);
                        line(a2, b - 3, a2, b + 3);
                    }
                }
            }
            sb.append("</g>");
            markers(x, y, p.marker(), p.size(), color, p.filled());
        }

        private void markers(double[] x, double[] y, Series.Marker m, double size, String color, boolean filled) {
            if (m == Series.Marker.NONE) {
                return;
            }
            sb.append("<g fill=\"").append(filled ? color : "#ffffff").append("\" stroke=\"")
                    .append(filled ? "#ffffff" : color).append("\" stroke-width=\"").append(filled ? "0.8" : "1.5")
                    .append("\">");
            for (int i = 0; i < x.length; i++) {
                double a = px(x[i]);
                double b = py(y[i]);
                if (!Double.isNaN(a) && !Double.isNaN(b)) {
                    box(a - size / 2, b - size / 2, size, size);
                    marker(sb, m, a, b, size);
                }
            }
            sb.append("</g>");
        }

        private void refLine(Series.RefLine r, String color) {
            Axis axis = r.vertical() ? plot.x() : plot.y();
            if (!axis.drawable(r.value())) {
                return;
            }
            double v = r.vertical() ? px(r.value()) : py(r.value());
            sb.append("<g stroke=\"").append(color).append("\" stroke-width=\"1.3\"").append(dashAttr(r.dash()))
                    .append('>');
            if (r.vertical()) {
                occ.segment(v, top, v, top + ph);
                line(v, top, v, top + ph);
            } else {
                occ.segment(left, v, left + pw, v);
                line(left, v, left + pw, v);
            }
            sb.append("</g>");
            if (r.label() != null && !r.label().isEmpty()) {
                occ.weight(8);
                sb.append("<text x=\"");
                double tw = r.label().length() * CHAR_EM * SMALL;
                if (r.vertical()) {
                    box(v + 4, top + 2, tw, SMALL + 2);
                    Svg.num(sb, v + 4).append("\" y=\"");
                    Svg.num(sb, top + SMALL + 3).append("\"");
                } else {
                    box(left + pw - 4 - tw, v - 4 - SMALL, tw, SMALL + 2);
                    Svg.num(sb, left + pw - 4).append("\" y=\"");
                    Svg.num(sb, v - 4).append("\" text-anchor=\"end\"");
                }
                sb.append(" font-size=\"").append((int) SMALL).append("\" fill=\"").append(color).append('"')
                        .append(HALO).append('>').append(Svg.esc(r.label())).append("</text>");
            }
        }

        private void note(Series.Note t, String color) {
            double a = px(t.x());
            double b = py(t.y());
            if (Double.isNaN(a) || Double.isNaN(b) || t.label() == null) {
                return;
            }
            box(a, b - SMALL, t.label().length() * CHAR_EM * SMALL, SMALL + 2);
            sb.append("<text x=\"");
            Svg.num(sb, a).append("\" y=\"");
            Svg.num(sb, b).append("\" font-size=\"").append((int) SMALL).append("\" fill=\"").append(color)
                    .append('"').append(HALO).append('>').append(Svg.esc(t.label())).append("</text>");
        }

        private double legendX(Plot.Legend c, double bw) {
            return c == Plot.Legend.TOP_RIGHT || c == Plot.Legend.BOTTOM_RIGHT ? left + pw - 8 - bw : left + 8;
        }

        private double legendY(Plot.Legend c, double bh) {
            return c == Plot.Legend.TOP_RIGHT || c == Plot.Legend.TOP_LEFT ? top + 8 : top + ph - 8 - bh;
        }

        private void legend() {
            if (plot.legend() == Plot.Legend.NONE) {
                return;
            }
            List<Integer> entries = new ArrayList<>();
            double textW = 0;
            List<Series> ss = plot.series();
            for (int i = 0; i < ss.size(); i++) {
                Series s = ss.get(i);
                if (s.label() != null && !s.label().isEmpty() && !(s instanceof Series.RefLine)
                        && !(s instanceof Series.Note)) {
                    entries.add(i);
                    textW = Math.max(textW, s.label().length() * LEGEND_EM * SMALL);
                }
            }
            if (entries.isEmpty()) {
                return;
            }
            double rowH = SMALL + 7;
            double bw = 8 + 26 + 6 + textW + 8;
            double bh = entries.size() * rowH + 8;
            double bx;
            double by;
            if (plot.legend() == Plot.Legend.AUTO) {
                // Candidate anchors as fractions of the free space (x: 1 right, 0 left; y: 0 top, 1 bottom), in
                // order of preference; the first one hiding the fewest occupied cells wins.
                double[][] anchors = {{1, 0}, {0, 0}, {1, 1}, {0, 1}, {0.5, 0}, {0.5, 1}, {1, 0.5}, {0, 0.5}};
                int best = Integer.MAX_VALUE;
                bx = left + 8;
                by = top + 8;
                for (double[] a : anchors) {
                    double cx = left + 8 + a[0] * Math.max(0, pw - 16 - bw);
                    double cy = top + 8 + a[1] * Math.max(0, ph - 16 - bh);
                    int hidden = occ.count(cx, cy, bw, bh);
                    if (hidden < best) {
                        best = hidden;
                        bx = cx;
                        by = cy;
                    }
                }
            } else {
                bx = legendX(plot.legend(), bw);
                by = legendY(plot.legend(), bh);
            }
            sb.append("<g data-legend=\"").append(index).append("\"><rect x=\"");
            Svg.num(sb, bx).append("\" y=\"");
            Svg.num(sb, by).append("\" width=\"");
            Svg.num(sb, bw).append("\" height=\"");
            Svg.num(sb, bh).append("\" rx=\"3\" fill=\"#ffffff\" fill-opacity=\"0.88\" stroke=\"#BBBBBB\"/>");
            for (int k = 0; k < entries.size(); k++) {
                int i = entries.get(k);
                Series s = ss.get(i);
                String c = colors[i];
                double cy = by + 4 + rowH * k + rowH / 2;
                double x0 = bx + 8;
                double x1 = x0 + 26;
                if (s instanceof Series.Line l) {
                    sb.append("<g stroke=\"").append(c).append("\" stroke-width=\"");
                    Svg.num(sb, l.width()).append('"').append(dashAttr(l.dash())).append('>');
                    line(x0, cy, x1, cy);
                    sb.append("</g>");
                    if (l.marker() != Series.Marker.NONE) {
                        sb.append("<g fill=\"").append(c).append("\" stroke=\"#ffffff\" stroke-width=\"0.8\">");
                        marker(sb, l.marker(), (x0 + x1) / 2, cy, 3 + 2 * l.width());
                        sb.append("</g>");
                    }
                } else if (s instanceof Series.Points p) {
                    if (p.yLow() != null || p.xLow() != null) {
                        sb.append("<g stroke=\"").append(c).append("\" stroke-width=\"1.3\">");
                        if (p.yLow() != null) {
                            line((x0 + x1) / 2, cy - 6, (x0 + x1) / 2, cy + 6);
                        } else {
                            line(x0 + 4, cy, x1 - 4, cy);
                        }
                        sb.append("</g>");
                    }
                    if (p.marker() != Series.Marker.NONE) {
                        sb.append("<g fill=\"").append(p.filled() ? c : "#ffffff").append("\" stroke=\"")
                                .append(p.filled() ? "#ffffff" : c).append("\" stroke-width=\"")
                                .append(p.filled() ? "0.8" : "1.5").append("\">");
                        marker(sb, p.marker(), (x0 + x1) / 2, cy, Math.min(p.size(), 10));
                        sb.append("</g>");
                    }
                } else {
                    double opacity = s instanceof Series.Band b ? b.opacity() : ((Series.Area) s).opacity();
                    sb.append("<rect x=\"");
                    Svg.num(sb, x0).append("\" y=\"");
                    Svg.num(sb, cy - 5).append("\" width=\"26\" height=\"10\" fill=\"").append(c)
                            .append("\" fill-opacity=\"").append(Math.max(opacity, 0.25)).append("\"/>");
                }
                sb.append("<text x=\"");
                Svg.num(sb, x1 + 6).append("\" y=\"");
                Svg.num(sb, cy + SMALL * 0.35).append("\" font-size=\"").append((int) SMALL).append("\" fill=\"")
                        .append(INK).append("\">").append(Svg.esc(s.label())).append("</text>");
            }
            sb.append("</g>\n");
        }
    }

    /** Appends one marker centred at (x, y) with overall size s px; fill and stroke come from the enclosing group. */
    static void marker(StringBuilder sb, Series.Marker m, double x, double y, double s) {
        double r = s / 2;
        switch (m) {
            case CIRCLE -> {
                sb.append("<circle cx=\"");
                Svg.num(sb, x).append("\" cy=\"");
                Svg.num(sb, y).append("\" r=\"");
                Svg.num(sb, r).append("\"/>");
            }
            case SQUARE -> {
                sb.append("<rect x=\"");
                Svg.num(sb, x - r * 0.9).append("\" y=\"");
                Svg.num(sb, y - r * 0.9).append("\" width=\"");
                Svg.num(sb, 1.8 * r).append("\" height=\"");
                Svg.num(sb, 1.8 * r).append("\"/>");
            }
            case TRIANGLE -> {
                sb.append("<path d=\"M");
                Svg.num(sb, x).append(' ');
                Svg.num(sb, y - 1.15 * r).append('L');
                Svg.num(sb, x + r).append(' ');
                Svg.num(sb, y + 0.75 * r).append('L');
                Svg.num(sb, x - r).append(' ');
                Svg.num(sb, y + 0.75 * r).append("Z\"/>");
            }
            case DIAMOND -> {
                sb.append("<path d=\"M");
                Svg.num(sb, x).append(' ');
                Svg.num(sb, y - 1.2 * r).append('L');
                Svg.num(sb, x + r).append(' ');
                Svg.num(sb, y).append('L');
                Svg.num(sb, x).append(' ');
                Svg.num(sb, y + 1.2 * r).append('L');
                Svg.num(sb, x - r).append(' ');
                Svg.num(sb, y).append("Z\"/>");
            }
            case NONE -> {
                // nothing
            }
        }
    }
}
