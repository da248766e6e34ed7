package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.util.UserInputException;
import org.w3c.dom.Document;
import org.w3c.dom.Element;
import org.w3c.dom.NodeList;

/**
 * The report over a fit directory: every section and figure from synthetic files, graceful notes for absent files,
 * one-line errors for malformed ones, and JSON round trips of every record. Writes
 * {@code target/fit-report-sample.html} for the headless render check ({@code .ci/render-report.sh}).
 */
class FitReportTest {
    private static final String SVG_NS = "http://www.w3.org/2000/svg";

    @TempDir
    Path tmp;

    @Test
    void fullDirectoryGivesEverySectionAndFigure() throws Exception {
        FitDirectory d = SyntheticFitDirectory.create(tmp.resolve("fit"));
        HtmlReport r = FitReport.build(d, "switchfit test");
        Path out = Path.of("target", "fit-report-sample.html");
        r.write(out);
        String html = Files.readString(out);
        Document doc = SampleReportTest.parse(html);
        assertEquals(FitReport.FIGURE_IDS, r.figureIds());
        NodeList svgs = doc.getElementsByTagNameNS(SVG_NS, "svg");
        List<String> drawn = new ArrayList<>();
        for (int i = 0; i < svgs.getLength(); i++) {
            Element svg = (Element) svgs.item(i);
            drawn.add(svg.getAttribute("data-figure"));
            assertTrue(svg.getElementsByTagNameNS(SVG_NS, "path").getLength() > 0,
                    "figure " + svg.getAttribute("data-figure") + " draws no path");
        }
        assertEquals(FitReport.FIGURE_IDS, drawn);
        assertTrue(html.contains("<meta name=\"switchfit-figures\" content=\""
                + String.join(" ", FitReport.FIGURE_IDS) + "\"/>"));
        List<String> headings = texts(doc, "h2");
        assertEquals(List.of(FitReport.S_PROBLEM, FitReport.S_TRAJ, FitReport.S_MULTI, FitReport.S_PARAMS,
                FitReport.S_FOLDS, FitReport.S_BIF, FitReport.S_REGION, FitReport.S_SWEEP, FitReport.S_PHASE),
                headings);
        assertFalse(html.contains("Skipped:"), "no section may be skipped when every file is present");
        assertTrue(html.contains(FitReport.RESEARCH_USE.substring(0, 60)));
        // escaping of a reason with markup characters, and the checksums
        assertTrue(html.contains("integration &lt;failed&gt; &amp; stopped"));
        assertTrue(html.contains("ab".repeat(32)));
        // k_deg is open above: listed as non-identifiable, upper shown as open
        assertTrue(html.contains("Not identifiable from these data: k_deg (practically non-identifiable)"));
        // fold table: fold1 closed (pinned), fold2 open above (bounded on one side)
        List<List<String>> foldRows = tableRows(doc, "Fold positions");
        assertEquals("pinned", foldRows.get(0).get(6));
        assertEquals("bounded on one side", foldRows.get(1).get(6));
        // relative width of fold1 = (upper - lower) / |value| = 2 sqrt(2 * HALF_CHI2) * se / value with the
        // fixture's se = 0.1 and value 2 (derived by hand from its quadratic profile); shown with %.6g
        double width = 2 * Math.sqrt(2 * SyntheticFitDirectory.HALF_CHI2) * 0.1 / 2;
        assertEquals(String.format(java.util.Locale.ROOT, "%.6g", width), foldRows.get(0).get(5));
        // measured thresholds against the model: "up" (1.9 +- 0.15) matched to fold1 at p = 2, residual
        // (1.9 - 2) / 0.15 (by hand); "down" matched to no fold
        List<List<String>> meas = tableRows(doc, "Measured switching thresholds");
        assertEquals(List.of("up", "up", "1.90000", "0.150000", "fold1", "2.00000",
                String.format(java.util.Locale.ROOT, "%.6g", (1.9 - 2) / 0.15)), meas.get(0));
        assertEquals("none matched", meas.get(1).get(4));
        assertEquals("", meas.get(1).get(6));
        assertTrue(html.contains("rank 2 of 3 free parameters; directions the data cannot see: +0.707 log10(k_on)"));
        // prediction-profile table
        List<List<String>> pred = tableRows(doc, "Predictions with 95 %");
        assertEquals("gfp(cond1, t=10)", pred.get(0).get(0));
        assertEquals("pinned", pred.get(0).get(4));
        // multistart table sorted by final value, failed start last
        List<List<String>> starts = tableRows(doc, "Starts sorted by final value");
        assertEquals("7", starts.get(starts.size() - 1).get(1));
        assertEquals("0.00000", starts.get(0).get(3));
    }

    @Test
    void emptyDirectoryGivesNotesAndNoFigures() throws Exception {
        Files.createDirectories(tmp.resolve("empty"));
        HtmlReport r = FitReport.build(FitDirectory.of(tmp.resolve("empty")), null);
        String html = r.toHtml();
        Document doc = SampleReportTest.parse(html);
        assertTrue(r.figureIds().isEmpty());
        assertEquals(9, texts(doc, "h2").size(), "every section heading stays, with a note");
        for (FitFile<?> f : FitFile.ALL) {
            assertTrue(html.contains("Skipped: " + f.fileName() + " is not in"), f.fileName());
            assertTrue(html.contains("&#39;" + f.producer() + "&#39; writes it"), f.producer());
        }
        assertTrue(html.contains(FitReport.RESEARCH_USE.substring(0, 60)));
    }

    @Test
    void partialDirectorySkipsOnlyTheMissingSections() throws Exception {
        FitDirectory d = FitDirectory.of(tmp.resolve("part"));
        d.write(FitFile.RESULT, SyntheticFitDirectory.result());
        d.write(FitFile.BRANCHES, SyntheticFitDirectory.branches());
        HtmlReport r = FitReport.build(d, null);
        SampleReportTest.parse(r.toHtml());
        assertEquals(List.of("waterfall", "bifurcation"), r.figureIds());
        String html = r.toHtml();
        assertTrue(html.contains("Skipped: profiles.json"));
        assertTrue(html.contains("Skipped: sweep.json"));
        assertFalse(html.contains("Skipped: result.json"));
        // folds from branches.json without profiles are listed as not profiled
        assertTrue(html.contains("not profiled"));
    }

    /** profiles.json with parameter profiles only: the fold section says no fold was profiled, not "missing". */
    @Test
    void profilesWithoutFoldsSayNoFoldWasProfiled() throws Exception {
        FitDirectory d = FitDirectory.of(tmp.resolve("nofolds"));
        d.write(FitFile.RESULT, SyntheticFitDirectory.result());
        ProfilesFile all = SyntheticFitDirectory.profiles();
        d.write(FitFile.PROFILES, new ProfilesFile(all.level(), all.bestNll(), all.thresholds(),
                all.betterOptimumFound(), all.bestNllFound(), all.folds(), all.rankCheck(), all.profiles().stream()
                .filter(e -> e.kind() == ProfilesFile.Kind.PARAMETER).toList()));
        String html = FitReport.build(d, null).toHtml();
        SampleReportTest.parse(html);
        assertFalse(html.contains("Skipped: profiles.json"), "profiles.json is there");
        String note = "No fold positions were profiled; &#39;switchfit profile FITDIR --folds --resume&#39; adds them";
        assertEquals(1, html.split(note, -1).length - 1, "the fold section says so once, with how to request them");
        // with branches.json too, the folds are listed as not profiled and the note stays (once)
        d.write(FitFile.BRANCHES, SyntheticFitDirectory.branches());
        html = FitReport.build(d, null).toHtml();
        assertTrue(html.contains("not profiled"));
        assertEquals(1, html.split(note, -1).length - 1);
        assertFalse(html.contains("Skipped: profiles.json"));
    }

    /** A fit to switching data only: the data section counts each kind instead of "lists no experiments". */
    @Test
    void switchingDataOnlyAreCountedInTheDataSection() throws Exception {
        FitDirectory d = FitDirectory.of(tmp.resolve("switching-only"));
        d.write(FitFile.RESULT, SyntheticFitDirectory.result());
        d.write(FitFile.TRAJECTORIES, new TrajectoriesFile(null, List.of()));
        Files.writeString(d.path().resolve("residuals.csv"),
                "experiment,observable,time,measurement,simulation,sigma,residual\n");
        Files.writeString(d.path().resolve("switching_residuals.csv"),
                "data,experiment,control,direction,observable,dose,measurement,model,sigma,residual,note\n"
                + "threshold,base,S,up,,,0.3,0.32,0.02,-1.2,fold\n"
                + "dose_response,base,S,low,xo,0.1,0.2,0.19,0.05,0.26,\n"
                + "dose_response,base,S,high,xo,0.4,1.6,1.64,0.05,-0.86,\n");
        String html = FitReport.build(d, null).toHtml();
        SampleReportTest.parse(html);
        assertTrue(html.contains("Data fitted: 0 measurements, 2 dose-response points, 1 switching threshold "
                + "(residuals.csv, switching_residuals.csv)."), html);
        assertTrue(html.contains("No timecourse data to plot"));
        assertFalse(html.contains("lists no experiments"));
    }

    @Test
    void malformedFileIsOneLineUserError() throws Exception {
        FitDirectory d = SyntheticFitDirectory.create(tmp.resolve("bad"));
        String json = Files.readString(d.pathOf(FitFile.PROFILES));
        Files.writeString(d.pathOf(FitFile.PROFILES), json.replaceFirst("\"level\"", "\"levle\""));
        UserInputException e = assertThrows(UserInputException.class, () -> FitReport.build(d, null));
        assertOneLine(e.getMessage());
        assertTrue(e.getMessage().contains("profiles.json"), e.getMessage());
        assertTrue(e.getMessage().contains("levle"), e.getMessage());
        assertTrue(e.getMessage().contains("rerun 'switchfit profile'"), e.getMessage());

        Files.writeString(d.pathOf(FitFile.SWEEP), "{\"parameter\": \"p\", ");
        UserInputException e2 = assertThrows(UserInputException.class, () -> d.read(FitFile.SWEEP));
        assertOneLine(e2.getMessage());
        assertTrue(e2.getMessage().contains("sweep.json, line"), e2.getMessage());
        assertTrue(e2.getMessage().contains("'switchfit sweep'"), e2.getMessage());

        // a record invariant (lower band without upper) is also a one-line error
        String traj = Files.readString(d.pathOf(FitFile.TRAJECTORIES));
        Files.writeString(d.pathOf(FitFile.TRAJECTORIES), traj.replaceFirst("\"upper\"", "\"upperX\""));
        UserInputException e3 = assertThrows(UserInputException.class, () -> d.read(FitFile.TRAJECTORIES));
        assertOneLine(e3.getMessage());
        assertTrue(e3.getMessage().contains("trajectories.json"), e3.getMessage());
    }

    @Test
    void missingFileReadNamesTheProducer() {
        FitDirectory d = FitDirectory.of(tmp.resolve("none"));
        UserInputException e = assertThrows(UserInputException.class, () -> d.read(FitFile.REGION));
        assertOneLine(e.getMessage());
        assertTrue(e.getMessage().contains("region.json"), e.getMessage());
        assertTrue(e.getMessage().contains("'switchfit region'"), e.getMessage());
        assertTrue(d.find(FitFile.REGION).isEmpty());
    }

    @Test
    void everyRecordRoundTrips() {
        FitDirectory d = SyntheticFitDirectory.create(tmp.resolve("rt"));
        List<Object> written = List.of(SyntheticFitDirectory.result(), SyntheticFitDirectory.trajectories(),
                SyntheticFitDirectory.profiles(), SyntheticFitDirectory.branches(), SyntheticFitDirectory.region(),
                SyntheticFitDirectory.sweep(), SyntheticFitDirectory.phasePlane());
        for (int i = 0; i < FitFile.ALL.size(); i++) {
            Object back = d.read(FitFile.ALL.get(i));
            assertEquals(Json.toJson(written.get(i)), Json.toJson(back), FitFile.ALL.get(i).fileName());
        }
        ProfilesFile p = d.read(FitFile.PROFILES);
        assertNull(p.profiles().get(2).upper(), "open side stays null");
        assertEquals(ProfilesFile.Identifiability.PRACTICALLY_NONIDENTIFIABLE, p.profiles().get(2).classification());
        String json = Json.toJson(p);
        assertTrue(json.contains("\"class\" : \"practically-nonidentifiable\""), json);
        assertTrue(json.contains("\"kind\" : \"fold\""), json);
    }

    /**
     * result.json as the fit command on the objective branch writes it (a map with these keys, copied from its
     * writer) must read as a FitSummary; bounds are absent there.
     */
    @Test
    void readsResultJsonOfTheFitCommand() throws Exception {
        Map<String, Object> j = new LinkedHashMap<>();
        j.put("problem", "p.yaml");
        j.put("bestNll", -3.5);
        j.put("parameters", Map.of("k", 2.0));
        j.put("parametersEstimationScale", Map.of("k", Math.log10(2.0)));
        j.put("scales", Map.of("k", "log10"));
        j.put("startsNearBest", 2);
        j.put("nearBestTolerance", 0.1);
        j.put("failedStarts", 0);
        Map<String, Object> st = new LinkedHashMap<>();
        st.put("index", 0);
        st.put("nll", -3.5);
        st.put("status", "CONVERGED");
        st.put("termination", "SMALL_STEP");
        st.put("iterations", 4);
        st.put("evaluations", 6);
        st.put("reason", null);
        j.put("starts", List.of(st));
        j.put("settings", Map.of("starts", 1, "seed", 1L, "rtol", 1e-8, "atol", 1e-12, "nominalStart", false));
        j.put("wallSeconds", 0.5);
        j.put("versions", Map.of("switchfit", "switchfit 0.1.0", "java", "17"));
        j.put("inputs", List.of(Map.of("file", "p.yaml", "sha256", "00")));
        Path f = tmp.resolve("fitcmd").resolve("result.json");
        Json.write(f, j);
        FitSummary s = FitDirectory.of(f.getParent()).read(FitFile.RESULT);
        assertEquals(-3.5, s.bestNll(), 0.0);
        assertEquals(2.0, s.parameters().get("k"), 0.0);
        assertNull(s.bounds());
        assertEquals(1L, s.settings().seed());
        assertEquals("00", s.inputs().get(0).sha256());
        SampleReportTest.parse(FitReport.build(FitDirectory.of(f.getParent()), null).toHtml());
    }

    /** Degenerate but valid content (all starts failed, empty profiles and branches) still gives a page. */
    @Test
    void degenerateContentStillRenders() throws Exception {
        FitDirectory d = FitDirectory.of(tmp.resolve("degenerate"));
        Map<String, Double> nulls = new LinkedHashMap<>();
        nulls.put("k", null);
        d.write(FitFile.RESULT, new FitSummary("p.yaml", Double.NaN, nulls, nulls, Map.of("k", "log10"), null, 0,
                0.1, 2, List.of(new FitSummary.Start(0, Double.NaN, "FAILED", null, 0, 1, "stiff"),
                new FitSummary.Start(1, Double.NaN, "FAILED", null, 0, 1, "stiff")), null, 0.1, null, null));
        d.write(FitFile.PROFILES, new ProfilesFile(0.95, Double.NaN, List.of(new ProfilesFile.Entry("k",
                ProfilesFile.Kind.PARAMETER, "log10", Double.NaN, null, null, Double.NaN,
                ProfilesFile.Identifiability.STRUCTURALLY_NONIDENTIFIABLE, null, null))));
        d.write(FitFile.BRANCHES, new BranchesFile("p", new double[] {0, 1}, List.of("x"), null,
                List.of(new BranchesFile.Branch("b", List.of(new BranchesFile.Point(0.5, new double[] {1}, true,
                        null, null)))), null));
        d.write(FitFile.TRAJECTORIES, new TrajectoriesFile(null, List.of(new TrajectoriesFile.Experiment("e",
                List.of(new TrajectoriesFile.Observable("o", new double[] {0}, new double[] {Double.NaN}, null,
                        null, new double[0], new double[0], new double[0]))))));
        d.write(FitFile.SWEEP, new SweepFile("p", "x", 1, List.of()));
        HtmlReport r = FitReport.build(d, null);
        String html = r.toHtml();
        SampleReportTest.parse(html);
        assertTrue(html.contains("0 of 2 starts ended within 0.1"), "all-failed verdict");
        assertTrue(html.contains("No start produced a usable value"));
        assertTrue(html.contains("structurally non-identifiable"));
        assertTrue(html.contains("holds no ramps"));
    }

    @Test
    void pinningVerdicts() {
        // Definitions (ours): both ends finite = pinned, one = bounded on one side, none = free.
        assertEquals(FitReportTables.Pinning.PINNED, FitReportTables.Pinning.of(1.0, 2.0));
        assertEquals(FitReportTables.Pinning.ONE_SIDED, FitReportTables.Pinning.of(null, 2.0));
        assertEquals(FitReportTables.Pinning.ONE_SIDED, FitReportTables.Pinning.of(1.0, Double.NaN));
        assertEquals(FitReportTables.Pinning.FREE, FitReportTables.Pinning.of(null, null));
        FitSummary.Bounds b = new FitSummary.Bounds(1e-3, 1e3);
        assertTrue(FitReportTables.atBound(1e3 * (1 - 1e-9), b));
        assertFalse(FitReportTables.atBound(999.0, b));
    }

    private static void assertOneLine(String m) {
        assertFalse(m.contains("\n") || m.contains("\r"), "message must be one line: " + m);
    }

    private static List<String> texts(Document doc, String tag) {
        NodeList l = doc.getElementsByTagName(tag);
        List<String> out = new ArrayList<>();
        for (int i = 0; i < l.getLength(); i++) {
            out.add(l.item(i).getTextContent());
        }
        return out;
    }

    /** Body rows (cell texts) of the table whose caption starts with {@code caption}. */
    private static List<List<String>> tableRows(Document doc, String caption) {
        NodeList tables = doc.getElementsByTagName("table");
        for (int i = 0; i < tables.getLength(); i++) {
            Element t = (Element) tables.item(i);
            NodeList cap = t.getElementsByTagName("caption");
            if (cap.getLength() == 0 || !cap.item(0).getTextContent().startsWith(caption)) {
                continue;
            }
            List<List<String>> rows = new ArrayList<>();
            Element body = (Element) t.getElementsByTagName("tbody").item(0);
            NodeList trs = body.getElementsByTagName("tr");
            for (int r = 0; r < trs.getLength(); r++) {
                NodeList tds = ((Element) trs.item(r)).getElementsByTagName("td");
                List<String> cells = new ArrayList<>();
                for (int c = 0; c < tds.getLength(); c++) {
                    cells.add(tds.item(c).getTextContent());
                }
                rows.add(cells);
            }
            return rows;
        }
        throw new AssertionError("no table with caption " + caption);
    }

}
