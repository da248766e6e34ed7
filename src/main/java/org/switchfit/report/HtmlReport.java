package org.switchfit.report;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashSet;
import java.util.List;
import java.util.Map;
import java.util.Set;
import org.switchfit.util.AtomicFiles;

/**
 * Builds one self-contained HTML page: inline CSS, inline SVG figures, no scripts, no network references (a
 * Content-Security-Policy meta tag forbids them), so the file can be mailed or archived as is. All text is
 * HTML-escaped. Blocks are appended in order; {@link #section(String)} starts a new section that also gets an
 * entry in the table of contents. Fluent and mutable while being built; not thread-safe.
 *
 * <p>The page carries {@code <meta name="switchfit-figures" content="id1 id2 ...">} listing every figure id, so a
 * headless-browser check ({@code .ci/render-report.sh}) can verify that each {@code <svg data-figure="id">} is
 * present and drawn. The page is also well-formed XML (void elements self-closed, only XML entities), which the
 * tests use to check escaping.
 */
public final class HtmlReport {
    /** Kind of a note box. */
    public enum NoteKind {
        /** Neutral information. */
        INFO,
        /** Something the reader must take into account (e.g. non-identifiable parameters). */
        WARNING
    }

    private final String title;
    private final StringBuilder body = new StringBuilder(65_536);
    private final List<String[]> toc = new ArrayList<>();
    private final Set<String> figureIds = new LinkedHashSet<>();
    private boolean inSection;
    private String footer = "";

    /** A report with the given page title (shown as the main heading). */
    public HtmlReport(String title) {
        this.title = title == null ? "" : title;
    }

    /** Starts a new section with an h2 heading; returns this. */
    public HtmlReport section(String heading) {
        closeSection();
        String sid = "s" + (toc.size() + 1);
        toc.add(new String[] {sid, heading == null ? "" : heading});
        body.append("<section id=\"").append(sid).append("\">\n<h2>").append(Svg.esc(heading)).append("</h2>\n");
        inSection = true;
        return this;
    }

    /** Adds an h3 sub-heading; returns this. */
    public HtmlReport subheading(String text) {
        body.append("<h3>").append(Svg.esc(text)).append("</h3>\n");
        return this;
    }

    /** Adds a paragraph of plain text (escaped; line breaks kept as spaces); returns this. */
    public HtmlReport paragraph(String text) {
        body.append("<p>").append(Svg.esc(text)).append("</p>\n");
        return this;
    }

    /** Adds preformatted text such as a command line or a log excerpt; returns this. */
    public HtmlReport preformatted(String text) {
        body.append("<pre>").append(Svg.esc(text)).append("</pre>\n");
        return this;
    }

    /**
     * Adds a key-value summary in the map's iteration order (use a LinkedHashMap); values are shown with
     * {@link Table#formatNumber(Object)}; returns this.
     */
    public HtmlReport keyValues(Map<String, ?> entries) {
        body.append("<dl class=\"kv\">\n");
        for (Map.Entry<String, ?> e : entries.entrySet()) {
            body.append("<dt>").append(Svg.esc(e.getKey())).append("</dt><dd>")
                    .append(Svg.esc(Table.formatNumber(e.getValue()))).append("</dd>\n");
        }
        body.append("</dl>\n");
        return this;
    }

    /** Adds a table; returns this. */
    public HtmlReport table(Table t) {
        t.appendHtml(body);
        return this;
    }

    /**
     * Adds a figure with a caption (the figure title when caption is null); returns this. The figure is rendered
     * now, so later changes to it do not show.
     *
     * @throws IllegalArgumentException if a figure with the same id is already in the report
     */
    public HtmlReport figure(Figure f, String caption) {
        if (!figureIds.add(f.id())) {
            throw new IllegalArgumentException("duplicate figure id '" + f.id() + "' in report");
        }
        body.append("<figure id=\"fig-").append(f.id()).append("\">\n").append(f.toSvg());
        String cap = caption == null ? f.title() : caption;
        if (!cap.isEmpty()) {
            body.append("<figcaption>").append(Svg.esc(cap)).append("</figcaption>\n");
        }
        body.append("</figure>\n");
        return this;
    }

    /** Adds a prominent note box; returns this. */
    public HtmlReport note(NoteKind kind, String text) {
        String k = kind == NoteKind.WARNING ? "warning" : "info";
        body.append("<div class=\"note ").append(k).append("\" role=\"note\"><strong>")
                .append(kind == NoteKind.WARNING ? "Warning" : "Note").append(":</strong> ").append(Svg.esc(text))
                .append("</div>\n");
        return this;
    }

    /** Sets a footer line (e.g. program version and command); returns this. */
    public HtmlReport footer(String text) {
        this.footer = text == null ? "" : text;
        return this;
    }

    /** Ids of the figures added so far, in order. */
    public List<String> figureIds() {
        return Collections.unmodifiableList(new ArrayList<>(figureIds));
    }

    private void closeSection() {
        if (inSection) {
            body.append("</section>\n");
            inSection = false;
        }
    }

    /** The complete HTML document. Does not change the builder, so more blocks may be added afterwards. */
    public String toHtml() {
        StringBuilder sb = new StringBuilder(body.length() + 8_192);
        sb.append("<!DOCTYPE html>\n<html lang=\"en\">\n<head>\n<meta charset=\"utf-8\"/>\n")
                .append("<meta http-equiv=\"Content-Security-Policy\" content=\"default-src 'none'; ")
                .append("style-src 'unsafe-inline'; img-src data:\"/>\n")
                .append("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>\n")
                .append("<meta name=\"switchfit-figures\" content=\"").append(Svg.esc(String.join(" ", figureIds)))
                .append("\"/>\n<title>").append(Svg.esc(title)).append("</title>\n<style>\n").append(CSS)
                .append("</style>\n</head>\n<body>\n<main>\n<h1>").append(Svg.esc(title)).append("</h1>\n");
        if (toc.size() >= 2) {
            sb.append("<nav aria-label=\"Contents\"><ol>\n");
            for (String[] e : toc) {
                sb.append("<li><a href=\"#").append(e[0]).append("\">").append(Svg.esc(e[1])).append("</a></li>\n");
            }
            sb.append("</ol></nav>\n");
        }
        sb.append(body);
        if (inSection) {
            sb.append("</section>\n");
        }
        if (!footer.isEmpty()) {
            sb.append("<footer>").append(Svg.esc(footer)).append("</footer>\n");
        }
        sb.append("</main>\n</body>\n</html>\n");
        return sb.toString();
    }

    /** Writes {@link #toHtml()} to {@code file} atomically (UTF-8), creating parent directories. */
    public void write(Path file) {
        AtomicFiles.writeString(file, toHtml());
    }

    private static final String CSS = String.join("\n",
            ":root{--ink:#1f2328;--muted:#57606a;--line:#d0d7de;--accent:#0072B2;}",
            "*{box-sizing:border-box}",
            "body{margin:0;background:#f6f8fa;color:var(--ink);"
                    + "font:15px/1.5 'DejaVu Sans','Liberation Sans',Arial,Helvetica,sans-serif}",
            "main{max-width:1120px;margin:0 auto;padding:24px 28px 40px;background:#fff;"
                    + "border-left:1px solid var(--line);border-right:1px solid var(--line);min-height:100vh}",
            "h1{font-size:26px;margin:8px 0 16px;padding-bottom:8px;border-bottom:3px solid var(--accent)}",
            "h2{font-size:20px;margin:32px 0 10px;padding-bottom:4px;border-bottom:1px solid var(--line)}",
            "h3{font-size:16px;margin:20px 0 8px}",
            "nav ol{margin:0 0 16px;padding-left:22px;columns:2;color:var(--muted)}",
            "a{color:var(--accent)}",
            "dl.kv{display:grid;grid-template-columns:max-content 1fr;gap:4px 18px;margin:10px 0 16px;"
                    + "padding:10px 14px;background:#f6f8fa;border:1px solid var(--line);border-radius:6px}",
            "dl.kv dt{font-weight:bold;color:var(--muted)}dl.kv dd{margin:0;font-variant-numeric:tabular-nums}",
            ".table-wrap{overflow-x:auto;margin:10px 0 18px}",
            "table{border-collapse:collapse;font-size:14px;font-variant-numeric:tabular-nums}",
            "caption{caption-side:top;text-align:left;font-weight:bold;padding:4px 0}",
            "th,td{padding:4px 10px;border-bottom:1px solid var(--line);text-align:left;vertical-align:top}",
            "th{background:#eef2f6;border-bottom:2px solid #8c959f;white-space:nowrap}",
            "th.num,td.num{text-align:right}",
            "tbody tr:nth-child(even){background:#f9fafb}",
            ".sort{color:var(--accent);font-size:11px}",
            "figure{margin:16px 0 24px}figure svg{max-width:100%;height:auto;display:block;"
                    + "border:1px solid var(--line);border-radius:4px}",
            "figcaption{color:var(--muted);font-size:14px;margin-top:6px}",
            ".note{margin:14px 0;padding:12px 16px;border-left:6px solid;border-radius:4px;font-size:15px}",
            ".note.info{background:#e8f1fa;border-color:#0072B2}",
            ".note.warning{background:#fff1e0;border-color:#D55E00}",
            "pre{background:#f6f8fa;border:1px solid var(--line);padding:8px 12px;overflow-x:auto;font-size:13px}",
            "footer{margin-top:36px;color:var(--muted);font-size:13px;border-top:1px solid var(--line);"
                    + "padding-top:8px}",
            "@media print{body{background:#fff}main{border:none}}",
            "");
}
