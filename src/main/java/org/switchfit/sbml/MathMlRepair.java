package org.switchfit.sbml;

import java.io.StringReader;
import java.io.StringWriter;
import java.util.ArrayList;
import java.util.List;
import java.util.regex.Pattern;
import javax.xml.parsers.DocumentBuilderFactory;
import javax.xml.transform.OutputKeys;
import javax.xml.transform.TransformerFactory;
import javax.xml.transform.dom.DOMSource;
import javax.xml.transform.stream.StreamResult;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.Node;
import org.w3c.dom.NodeList;
import org.xml.sax.InputSource;

/**
 * Unwraps MathML {@code <apply>} elements whose only child is another {@code <apply>} (an expression used as its
 * own operator, with no arguments): some published SBML files contain them, and JSBML then drops an operand. The
 * wrapper is replaced by the inner expression, which is how such files are meant to be read. Stateless.
 */
final class MathMlRepair {
    private static final Pattern NESTED = Pattern.compile("<(\\w+:)?apply>\\s*<(\\w+:)?apply>");

    private MathMlRepair() {
    }

    /** Whether the text may contain a nested apply. */
    static boolean needed(String xml) {
        return NESTED.matcher(xml).find();
    }

    /** The document with every apply-of-a-single-apply replaced by the inner apply. */
    static String repair(String xml) throws Exception {
        DocumentBuilderFactory f = DocumentBuilderFactory.newInstance();
        f.setNamespaceAware(true);
        f.setFeature("http://apache.org/xml/features/disallow-doctype-decl", true);
        Document doc = f.newDocumentBuilder().parse(new InputSource(new StringReader(xml)));
        NodeList all = doc.getElementsByTagNameNS("*", "apply");
        List<Element> wrappers = new ArrayList<>();
        for (int i = 0; i < all.getLength(); i++) {
            Element e = (Element) all.item(i);
            List<Element> kids = children(e);
            if (kids.size() == 1 && "apply".equals(kids.get(0).getLocalName())) {
                wrappers.add(e);
            }
        }
        for (Element w : wrappers) {
            Element inner = children(w).get(0);
            w.getParentNode().replaceChild(inner, w);
        }
        StringWriter sw = new StringWriter();
        javax.xml.transform.Transformer t = TransformerFactory.newInstance().newTransformer();
        t.setOutputProperty(OutputKeys.ENCODING, "UTF-8");
        t.transform(new DOMSource(doc), new StreamResult(sw));
        return sw.toString();
    }

    private static List<Element> children(Element e) {
        List<Element> out = new ArrayList<>();
        for (Node n = e.getFirstChild(); n != null; n = n.getNextSibling()) {
            if (n.getNodeType() == Node.ELEMENT_NODE) {
                out.add((Element) n);
            }
        }
        return out;
    }
}
