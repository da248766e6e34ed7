package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.StringReader;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.HashSet;
import java.util.List;
import java.util.Set;
import javax.xml.parsers.DocumentBuilder;
import javax.xml.parsers.DocumentBuilderFactory;
import org.junit.jupiter.api.Test;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.NodeList;
import org.xml.sax.InputSource;

/**
 * Writes the sample report to {@code target/sample-report.html} (rendered by {@code .ci/render-report.sh}) and
 * checks the whole page is well-formed XML with one drawn {@code <svg data-figure>} per listed figure.
 */
class SampleReportTest {

    @Test
    void writesWellFormedSampleReport() throws Exception {
        HtmlReport r = SampleReport.build();
        Path out = Path.of("target", "sample-report.html");
        r.write(out);
        String html = Files.readString(out);
        Document doc = parse(html);
        NodeList svgs = doc.getElementsByTagNameNS("http://www.w3.org/2000/svg", "svg");
        Set<String> ids = new HashSet<>();
        for (int i = 0; i < svgs.getLength(); i++) {
            Element svg = (Element) svgs.item(i);
            ids.add(svg.getAttribute("data-figure"));
            assertTrue(svg.getElementsByTagNameNS("http://www.w3.org/2000/svg", "path").getLength() > 0,
                    "figure " + svg.getAttribute("data-figure") + " draws no path");
        }
        List<String> expected = List.of("trajectories", "waterfall", "profiles", "bifurcation", "region",
                "hysteresis", "phase");
        assertEquals(expected, r.figureIds());
        assertEquals(new HashSet<>(expected), ids);
        assertTrue(html.contains("<meta name=\"switchfit-figures\" content=\"" + String.join(" ", expected)
                + "\"/>"));
        // The title with <>&"' appears only escaped.
        assertTrue(html.contains("switchfit sample report &lt;synthetic&gt; &amp; &quot;escaped&quot; &#39;text&#39;"));
        assertTrue(!html.contains("<synthetic>"));
    }

    static Document parse(String xml) throws Exception {
        DocumentBuilderFactory f = DocumentBuilderFactory.newInstance();
        f.setNamespaceAware(true);
        f.setFeature("http://apache.org/xml/features/disallow-doctype-decl", false);
        f.setFeature("http://apache.org/xml/features/nonvalidating/load-external-dtd", false);
        DocumentBuilder b = f.newDocumentBuilder();
        b.setErrorHandler(null);
        return b.parse(new InputSource(new StringReader(xml)));
    }
}
