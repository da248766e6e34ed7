package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import java.util.stream.Stream;
import javax.xml.parsers.DocumentBuilderFactory;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.Node;
import org.w3c.dom.NodeList;

/** SVG output: well-formed XML (parsed with the JDK's DocumentBuilder), escaping, NaN gaps, projections. */
class FigureTest {
    private static final String NS = "http://www.w3.org/2000/svg";
    /** Pixel coordinates are written with two decimals: half a hundredth of a pixel. */
    private static final double PX_TOL = 0.005 + 1e-9;
    private static final String NASTY = "a<b & \"c\" 'd'> \u0001 \uD83D\uDE00 \u00B5M";

    private static Document svg(Figure f) throws Exception {
        return SampleReportTest.parse(f.toSvg());
    }

    private static Element series(Document d, String label) {
        NodeList g = d.getElementsByTagNameNS(NS, "g");
        for (int i = 0; i < g.getLength(); i++) {
            Element e = (Element) g.item(i);
            if (label.equals(e.getAttribute("data-series")) && e.hasAttribute("data-series")) {
                return e;
            }
        }
        throw new AssertionError("no series " + label);
    }

    private static List<Element> all(Element root, String tag) {
        NodeList n = root.getElementsByTagNameNS(NS, tag);
        List<Element> out = new ArrayList<>();
        for (int i = 0; i < n.getLength(); i++) {
            out.add((Element) n.item(i));
        }
        return out;
    }

    private static int count(String s, char c) {
        return (int) s.chars().filter(x -> x == c).count();
    }

    @Test
    void svgIsWellFormedAndAccessible() throws Exception {
        Figure f = Figure.of("fig one", "A title").add(new Plot("p", Axis.linear("x"), Axis.linear("y"))
                .add(Series.line("l", new double[] {0, 1}, new double[] {0, 1})));
        Document d = svg(f);
        Element root = d.getDocumentElement();
        assertEquals("svg", root.getLocalName());
        assertEquals(NS, root.getNamespaceURI());
        assertEquals("fig_one", root.getAttribute("data-figure"));
        assertTrue(root.getAttribute("viewBox").matches("0 0 \\d+ \\d+"));
        assertEquals("img", root.getAttribute("role"));
        Set<String> ids = new HashSet<>();
        for (Element e : all(root, "*")) {
            if (e.hasAttribute("id")) {
                ids.add(e.getAttribute("id"));
            }
        }
        for (String ref : root.getAttribute("aria-labelledby").split(" ")) {
            assertTrue(ids.contains(ref), "aria-labelledby refers to missing id " + ref);
        }
        assertEquals("A title", all(root, "title").get(0).getTextContent());
        String s = f.toSvg();
        assertFalse(s.contains("<script") || s.contains("href") || s.contains("@import"),
                "no scripts or external references");
        assertEquals(1, s.split("http", -1).length - 1, "only the namespace URI mentions http");
    }

    @Test
    void labelsAreEscapedAndSurviveParsing() throws Exception {
        Plot p = new Plot(NASTY, Axis.linear(NASTY), Axis.log10(NASTY));
        p.add(Series.line(NASTY, new double[] {1, 2}, new double[] {1, 10}));
        p.add(Series.vertical(NASTY, 1.5));
        p.add(Series.note(NASTY, 1.2, 5));
        Figure f = Figure.of("esc", NASTY).description(NASTY).add(p);
        Document d = svg(f);
        // The control character U+0001 is not allowed in XML 1.0 and is replaced by U+FFFD; all else survives.
        String expected = NASTY.replace('\u0001', '\uFFFD');
        Element root = d.getDocumentElement();
        assertEquals(expected, all(root, "title").get(0).getTextContent());
        assertEquals(expected, all(root, "desc").get(0).getTextContent());
        int found = 0;
        for (Element t : all(root, "text")) {
            if (t.getTextContent().equals(expected)) {
                found++;
            }
        }
        // panel title, x label, y label, reference-line label, note, legend entry
        assertEquals(6, found);
        assertEquals(expected, series(d, expected).getAttribute("data-series"));
    }

    @Test
    void nanBreaksLinesIntoPieces() throws Exception {
        double nan = Double.NaN;
        Plot p = new Plot("", Axis.linear("x"), Axis.linear("y"));
        p.add(Series.line("gap", new double[] {0, 1, 2, 3, 4, 5}, new double[] {0, 1, nan, 3, 4, 5}));
        p.add(Series.line("xgap", new double[] {0, Double.POSITIVE_INFINITY, 2, 3}, new double[] {1, 1, 1, 1}));
        p.add(Series.line("allnan", new double[] {nan, nan}, new double[] {nan, nan}));
        p.add(Series.band("band", new double[] {0, 1, 2, 3, 4}, new double[] {0, 0, nan, 0, 0},
                new double[] {1, 1, 1, 1, 1}));
        p.add(Series.area("rings", new double[] {0, 1, 1, nan, 2, 3, 3}, new double[] {0, 0, 1, nan, 0, 0, 1}));
        p.add(Series.points("pts", new double[] {0, nan, 2}, new double[] {1, 1, 1})
                .ySigma(new double[] {0.1, 0.1, nan}));
        Document d = svg(Figure.of("nan", "NaN").add(p));
        String gap = all(series(d, "gap"), "path").get(0).getAttribute("d");
        assertEquals(2, count(gap, 'M'), gap);
        assertEquals(3, count(gap, 'L'), "points 0-1 and 3-4-5: one + two segments: " + gap);
        String xgap = all(series(d, "xgap"), "path").get(0).getAttribute("d");
        assertEquals(2, count(xgap, 'M'), xgap);
        assertTrue(all(series(d, "allnan"), "path").isEmpty(), "an all-NaN line draws nothing");
        String band = all(series(d, "band"), "path").get(0).getAttribute("d");
        assertEquals(2, count(band, 'Z'), "band splits into two closed pieces: " + band);
        String rings = all(series(d, "rings"), "path").get(0).getAttribute("d");
        assertEquals(2, count(rings, 'Z'), rings);
        assertFalse(rings.contains("NaN") || gap.contains("NaN") || band.contains("NaN"));
        Element pts = series(d, "pts");
        assertEquals(2, all(pts, "circle").size(), "the NaN point has no marker");
        // Error bars: point 0 has one (bar + two caps = 3 lines); point 2 has a NaN sigma and none.
        assertEquals(3, all(pts, "line").size());
    }

    @Test
    void logAxisDropsNonPositiveValuesAndLabelsPowers() throws Exception {
        Plot p = new Plot("", Axis.log10("dose"), Axis.log10("response"));
        p.add(Series.line("l", new double[] {1e-6, 1e-5, 0, 1e-3, -1, 1e-1}, new double[] {1, 2, 3, 4, 5, 6}));
        Document d = svg(Figure.of("log", "log").add(p));
        String path = all(series(d, "l"), "path").get(0).getAttribute("d");
        assertEquals(3, count(path, 'M'), path);
        // Axis from 1e-6 to 1e-1: powers outside -2..3 are written 10 with a superscript exponent.
        List<String> sups = new ArrayList<>();
        for (Element t : all(d.getDocumentElement(), "tspan")) {
            sups.add(t.getTextContent());
        }
        assertTrue(sups.contains("\u22126") && sups.contains("\u22123"), sups.toString());
    }

    @Test
    void dataMapOntoTheTickGridLines() throws Exception {
        // Points placed exactly at tick values must land on the grid lines drawn for those ticks.
        Plot p = new Plot("", Axis.linear("x"), Axis.log10("y"));
        p.add(Series.points("pts", new double[] {105, 200, 543}, new double[] {1, 10, 100}));
        Document d = svg(Figure.of("grid", "grid").add(p));
        List<Element> circles = all(series(d, "pts"), "circle");
        Element gridGroup = null;
        for (Element g : all(d.getDocumentElement(), "g")) {
            if ("#E6E6E6".equals(g.getAttribute("stroke"))) {
                gridGroup = g;
            }
        }
        assertNotNull(gridGroup);
        List<Double> vx = new ArrayList<>();
        List<Double> hy = new ArrayList<>();
        for (Element l : all(gridGroup, "line")) {
            if (l.getAttribute("x1").equals(l.getAttribute("x2"))) {
                vx.add(Double.parseDouble(l.getAttribute("x1")));
            } else {
                hy.add(Double.parseDouble(l.getAttribute("y1")));
            }
        }
        // x ticks by Ticks.linearTight(105, 543, 6) start at 100 with step 100 (Heckbert candidates, TicksTest);
        // the tick 200 is the second vertical grid line.
        Ticks tx = Ticks.linearTight(105, 543, 6);
        int k200 = (int) Math.round((200 - tx.lo()) / tx.step());
        assertEquals(Double.parseDouble(circles.get(1).getAttribute("cx")), vx.get(k200), PX_TOL);
        // y: log axis 1..100, grid at 1, 10, 100 (top to bottom order reversed); 10 is the middle line.
        assertEquals(3, hy.size());
        assertEquals(Double.parseDouble(circles.get(1).getAttribute("cy")), hy.get(1), PX_TOL);
        assertEquals((hy.get(0) + hy.get(2)) / 2, hy.get(1), PX_TOL);
    }

    @Test
    void panelsAndFiguresHaveDistinctIds() throws Exception {
        Figure a = Figure.of("a", "A").columns(2);
        for (int i = 0; i < 3; i++) {
            a.add(new Plot("p" + i, Axis.linear("x"), Axis.linear("y"))
                    .add(Series.line("l", new double[] {0, 1}, new double[] {i, i + 1})));
        }
        Figure b = Figure.of("b", "B").add(new Plot("", Axis.linear("x"), Axis.linear("y")));
        Document da = svg(a);
        assertEquals("0 0 1040 680", da.getDocumentElement().getAttribute("viewBox"), "2 columns x 2 rows");
        Set<String> ids = new HashSet<>();
        for (Document d : List.of(da, svg(b))) {
            for (Element e : all(d.getDocumentElement(), "*")) {
                if (e.hasAttribute("id")) {
                    assertTrue(ids.add(e.getAttribute("id")), "duplicate id " + e.getAttribute("id"));
                }
            }
        }
        assertEquals(3, all(da.getDocumentElement(), "clipPath").size());
    }

    @Test
    void writesStandaloneSvgFile(@TempDir Path dir) throws Exception {
        Path f = dir.resolve("figs/a.svg");
        Figure.of("a", "A \u00B5").add(new Plot("", Axis.linear("x"), Axis.linear("y"))).writeSvg(f);
        DocumentBuilderFactory dbf = DocumentBuilderFactory.newInstance();
        dbf.setNamespaceAware(true);
        Document d = dbf.newDocumentBuilder().parse(f.toFile());
        assertEquals("A \u00B5", all(d.getDocumentElement(), "title").get(0).getTextContent());
        try (Stream<Path> s = Files.list(f.getParent())) {
            assertEquals(1, s.count(), "no temporary files left");
        }
    }

    @Test
    void emptyPlotStillRenders() throws Exception {
        Document d = svg(Figure.of("empty", "").add(new Plot("", Axis.log10(""), Axis.linear(""))));
        assertEquals("svg", d.getDocumentElement().getLocalName());
        Node title = all(d.getDocumentElement(), "title").get(0);
        assertEquals("", title.getTextContent());
    }

    @Test
    void invalidInputsAreRejected() {
        assertThrows(IllegalArgumentException.class, () -> Series.line("l", new double[2], new double[3]));
        assertThrows(IllegalArgumentException.class,
                () -> Series.line("l", new double[2], new double[2]).color("red\" onload=\"x"));
        assertThrows(IllegalArgumentException.class, () -> Series.band("b", new double[2], new double[2],
                new double[2]).opacity(0));
        assertThrows(IllegalArgumentException.class, () -> Axis.log10("x").withRange(0, 1));
        assertThrows(IllegalArgumentException.class, () -> Figure.of(" ", "t"));
        assertThrows(IllegalArgumentException.class, () -> Palette.color(-1));
    }

    @Test
    void tickLabelsUseFractionDigitsAndScientificForm() {
        Ticks t = Ticks.linear(-0.0123, 0.0456, 6);
        assertEquals("\u22120.02", SvgRenderer.tickLabel(-0.02, t).base());
        assertEquals("0", SvgRenderer.tickLabel(0.0, t).base());
        Ticks big = Ticks.linear(0, 3e6, 4);
        SvgRenderer.TickLabel l = SvgRenderer.tickLabel(2e6, big);
        assertEquals("2\u00D710", l.base());
        assertEquals("6", l.sup());
        Ticks lg = Ticks.log10(0.01, 100, 6);
        assertEquals("0.01", SvgRenderer.tickLabel(0.01, lg).base());
        assertEquals("100", SvgRenderer.tickLabel(100, lg).base());
        // An axis reaching beyond 0.01..1000 writes every tick as a power, including 0.01 and 1.
        Ticks wide = Ticks.log10(1e-4, 0.1, 6);
        assertEquals("10", SvgRenderer.tickLabel(0.01, wide).base());
        assertEquals("\u22122", SvgRenderer.tickLabel(0.01, wide).sup());
        assertEquals("\u22121", SvgRenderer.tickLabel(0.1, wide).sup());
    }
}
