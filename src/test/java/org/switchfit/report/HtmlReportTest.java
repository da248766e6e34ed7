package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.stream.Collectors;
import java.util.stream.Stream;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.NodeList;

/** HTML report: escaping everywhere (the page is checked as well-formed XML), tables, atomic writing. */
class HtmlReportTest {
    private static final String NASTY = "<b>&amp; \"q\" 'a' </p>";

    private static List<String> texts(Document d, String tag) {
        NodeList n = d.getElementsByTagName(tag);
        return java.util.stream.IntStream.range(0, n.getLength()).mapToObj(i -> n.item(i).getTextContent())
                .collect(Collectors.toList());
    }

    @Test
    void everyTextIsEscaped() throws Exception {
        Map<String, Object> kv = new LinkedHashMap<>();
        kv.put(NASTY, NASTY);
        HtmlReport r = new HtmlReport(NASTY).section(NASTY).subheading(NASTY).paragraph(NASTY).keyValues(kv)
                .table(new Table(NASTY, NASTY).row(NASTY)).note(HtmlReport.NoteKind.WARNING, NASTY)
                .preformatted(NASTY).figure(Figure.of("f", NASTY), NASTY).section("two").footer(NASTY);
        String html = r.toHtml();
        assertFalse(html.contains("<b>"), "raw markup from text must not appear");
        Document d = SampleReportTest.parse(html);
        assertEquals(List.of(NASTY, NASTY), texts(d, "title").subList(0, 2), "page title, then the svg title");
        for (String tag : List.of("h1", "h2", "h3", "p", "dt", "dd", "caption", "th", "td", "pre", "figcaption",
                "footer")) {
            assertTrue(texts(d, tag).contains(NASTY), tag + ": " + texts(d, tag));
        }
        assertTrue(texts(d, "div").stream().anyMatch(t -> t.equals("Warning: " + NASTY)));
        // Two sections -> a table of contents linking to them.
        assertEquals(List.of(NASTY, "two"), texts(d, "a"));
    }

    @Test
    void pageIsSelfContained() {
        String html = new HtmlReport("t").figure(Figure.of("a", "A"), "cap").figure(Figure.of("b", "B"), null)
                .toHtml();
        assertFalse(html.contains("<script"));
        assertFalse(html.contains("src="));
        assertFalse(html.contains("<link"));
        assertTrue(html.contains("content=\"default-src 'none'; style-src 'unsafe-inline'; img-src data:\""));
        assertTrue(html.contains("<meta name=\"switchfit-figures\" content=\"a b\"/>"));
    }

    @Test
    void duplicateFigureIdsAreRejected() {
        HtmlReport r = new HtmlReport("t").figure(Figure.of("same", "A"), null);
        assertThrows(IllegalArgumentException.class, () -> r.figure(Figure.of("same", "B"), null));
    }

    @Test
    void tableSortsNumericallyWithNanLastAndMarksTheColumn() throws Exception {
        Table t = new Table("", "name", "value").row("a", 10.0).row("b", Double.NaN).row("c", 9.0).row("d", -1e3)
                .sortBy(1, true);
        assertEquals(List.of("d", "c", "a", "b"), t.rows().stream().map(r -> (String) r[0]).toList());
        Document d = SampleReportTest.parse("<div>" + new HtmlReport("x").table(t).toHtml()
                .replaceFirst("(?s)^.*?<main>", "").replaceFirst("(?s)</main>.*$", "") + "</div>");
        NodeList th = d.getElementsByTagName("th");
        assertEquals("ascending", ((Element) th.item(1)).getAttribute("aria-sort"));
        assertEquals("num", ((Element) th.item(1)).getAttribute("class"), "numeric column is right-aligned");
        assertEquals(List.of("d", "-1000.00", "c", "9.00000", "a", "10.0000", "b", "NaN"), texts(d, "td"));
        t.sortBy(0, false);
        assertEquals(List.of("d", "c", "b", "a"), t.rows().stream().map(r -> (String) r[0]).toList());
        assertThrows(IllegalArgumentException.class, () -> t.row("only one"));
    }

    @Test
    void numberCellsUseSixSignificantDigits() {
        // %.6g (java.util.Formatter, Locale.ROOT): 6 significant digits.
        assertEquals("3.14159", Table.formatNumber(Math.PI));
        assertEquals("1.00000e-07", Table.formatNumber(1e-7));
        assertEquals("Inf", Table.formatNumber(Double.POSITIVE_INFINITY));
        assertEquals("-Inf", Table.formatNumber(Double.NEGATIVE_INFINITY));
        assertEquals("42", Table.formatNumber(42));
        assertEquals("", Table.formatNumber(null));
    }

    @Test
    void writeIsAtomicAndLeavesNoTemporaryFiles(@TempDir Path dir) throws Exception {
        Path out = dir.resolve("sub/report.html");
        HtmlReport r = new HtmlReport("one");
        r.write(out);
        r.paragraph("more");
        r.write(out); // replace
        assertTrue(Files.readString(out).contains("<p>more</p>"));
        try (Stream<Path> s = Files.list(out.getParent())) {
            assertEquals(List.of("report.html"), s.map(p -> p.getFileName().toString()).toList());
        }
    }
}
