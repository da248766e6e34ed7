package org.switchfit.report;

import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Optional;

/**
 * The report over a fit directory: one self-contained HTML page built only from the files on disk
 * ({@link FitFile#ALL}); nothing is refitted, profiled or traced again. Each section needs one or two files; when
 * a file is absent the section shows a one-line note naming the command that writes it. A malformed file is a user
 * error ({@link org.switchfit.util.UserInputException}, one line), not a skipped section.
 *
 * <p>Sections, in order: research-use statement; problem summary and input checksums ({@code result.json}); data
 * and fitted trajectories with prediction bands ({@code trajectories.json}); multistart outcome
 * ({@code result.json}); parameter estimates, intervals and profiles ({@code result.json}, {@code profiles.json});
 * which fold positions the data pin down ({@code profiles.json}, {@code branches.json}); bifurcation diagram
 * ({@code branches.json}); two-parameter bistable region ({@code region.json}); hysteresis sweep
 * ({@code sweep.json}); phase plane ({@code phaseplane.json}). Figure ids are those of {@link #FIGURE_IDS}.
 * Stateless.
 */
public final class FitReport {
    private FitReport() {
    }

    /** Every figure id the report can contain, in page order. */
    public static final List<String> FIGURE_IDS = List.of("trajectories", "waterfall", "profiles", "fold-profiles",
            "bifurcation", "region", "hysteresis", "phase");

    /** The statement shown at the top of every report. */
    public static final String RESEARCH_USE = "The fitted values, intervals and predictions in this report are "
            + "statistical estimates from the data and model given. They depend on the model structure, the noise "
            + "model and the data; they are for research use and are not validated for clinical, diagnostic or "
            + "safety decisions.";

    /** Section headings, in page order. */
    static final String S_PROBLEM = "Problem and inputs";
    static final String S_TRAJ = "Data and fitted trajectories";
    static final String S_MULTI = "Multistart";
    static final String S_PARAMS = "Parameters";
    static final String S_FOLDS = "Which fold positions are pinned down";
    static final String S_BIF = "Bifurcation diagram";
    static final String S_REGION = "Two-parameter bistable region";
    static final String S_SWEEP = "Hysteresis sweep";
    static final String S_PHASE = "Phase plane";

    /**
     * Builds the report of {@code dir}.
     *
     * @param dir    the fit directory
     * @param footer footer line (e.g. program version), or null
     * @return the page, ready to {@link HtmlReport#write}
     * @throws org.switchfit.util.UserInputException when a present file is malformed
     */
    public static HtmlReport build(FitDirectory dir, String footer) {
        Optional<FitSummary> fit = dir.find(FitFile.RESULT);
        Optional<TrajectoriesFile> traj = dir.find(FitFile.TRAJECTORIES);
        Optional<ProfilesFile> prof = dir.find(FitFile.PROFILES);
        Optional<BranchesFile> br = dir.find(FitFile.BRANCHES);
        Optional<RegionFile> region = dir.find(FitFile.REGION);
        Optional<SweepFile> sweep = dir.find(FitFile.SWEEP);
        Optional<PhasePlaneFile> phase = dir.find(FitFile.PHASE_PLANE);

        String title = "switchfit report" + fit.map(f -> ": " + f.problem()).orElse("");
        HtmlReport r = new HtmlReport(title);
        r.note(HtmlReport.NoteKind.WARNING, RESEARCH_USE);

        r.section(S_PROBLEM);
        if (fit.isPresent()) {
            problem(r, fit.get());
        } else {
            missing(r, dir, FitFile.RESULT);
        }

        r.section(S_TRAJ);
        Optional<DataCounts> counts = DataCounts.read(dir.path());
        counts.ifPresent(c -> r.paragraph("Data fitted: " + c.summary() + " (" + DataCounts.RESIDUALS + ", "
                + DataCounts.SWITCHING_RESIDUALS + ")."));
        if (traj.isPresent() && !traj.get().experiments().isEmpty()) {
            r.figure(FitReportFigures.trajectories(traj.get()), trajectoryCaption(traj.get()));
        } else if (traj.isPresent() && counts.isPresent() && counts.get().timecourse() == 0) {
            r.note(HtmlReport.NoteKind.INFO, "No timecourse data to plot; the dose-response points and "
                    + "thresholds beside the fitted model's values are in " + DataCounts.SWITCHING_RESIDUALS + ".");
        } else if (traj.isPresent()) {
            r.note(HtmlReport.NoteKind.INFO, dir.pathOf(FitFile.TRAJECTORIES) + " lists no experiments.");
        } else {
            missing(r, dir, FitFile.TRAJECTORIES);
        }
        prof.ifPresent(p -> FitReportTables.predictions(r, p));

        r.section(S_MULTI);
        if (fit.isPresent()) {
            multistart(r, fit.get());
        } else {
            missing(r, dir, FitFile.RESULT);
        }

        r.section(S_PARAMS);
        if (fit.isPresent() || prof.isPresent()) {
            FitReportTables.parameters(r, fit.orElse(null), prof.orElse(null));
            if (!fit.isPresent()) {
                missing(r, dir, FitFile.RESULT);
            }
            if (prof.isPresent()) {
                FitReportFigures.profiles(prof.get(), ProfilesFile.Kind.PARAMETER, "profiles", "Parameter profiles")
                        .ifPresent(f -> r.figure(f, profileCaption(prof.get())));
            } else {
                missing(r, dir, FitFile.PROFILES);
            }
        } else {
            missing(r, dir, FitFile.RESULT);
        }

        r.section(S_FOLDS);
        boolean foldProfiles = prof.isPresent() && prof.get().profiles().stream()
                .anyMatch(e -> e.kind() == ProfilesFile.Kind.FOLD);
        if (foldProfiles || br.isPresent()) {
            FitReportTables.folds(r, prof.orElse(null), br.orElse(null));
            if (foldProfiles) {
                FitReportFigures.profiles(prof.get(), ProfilesFile.Kind.FOLD, "fold-profiles", "Fold profiles")
                        .ifPresent(f -> r.figure(f, "Profile likelihoods of the fold positions. "
                                + profileCaption(prof.get())));
            } else if (!prof.isPresent()) {
                missing(r, dir, FitFile.PROFILES);
            }
        } else if (prof.isPresent()) {
            r.note(HtmlReport.NoteKind.INFO, FitReportTables.NO_FOLD_PROFILES);
        } else {
            missing(r, dir, FitFile.PROFILES);
        }

        r.section(S_BIF);
        if (br.isPresent() && !br.get().branches().isEmpty()) {
            r.figure(FitReportFigures.bifurcation(br.get(), prof.orElse(null)), "Steady states against "
                    + br.get().control() + ": stable (solid) and unstable (dashed) branches; folds with their "
                    + "profile-likelihood intervals (diamonds with bars); measured switching thresholds with 1 "
                    + "sigma bars (squares).");
        } else if (br.isPresent()) {
            r.note(HtmlReport.NoteKind.INFO, dir.pathOf(FitFile.BRANCHES) + " holds no branches.");
        } else {
            missing(r, dir, FitFile.BRANCHES);
        }

        r.section(S_REGION);
        if (region.isPresent()) {
            RegionFile g = region.get();
            r.figure(FitReportFigures.region(g), "Fold curves in the (" + g.parameter1() + ", " + g.parameter2()
                    + ") plane; the shaded area is bistable" + (g.closedByChord() ? " (closed by a straight chord "
                    + "at the edge of the traced range)" : "") + ".");
        } else {
            missing(r, dir, FitFile.REGION);
        }

        r.section(S_SWEEP);
        if (sweep.isPresent() && !sweep.get().runs().isEmpty()) {
            SweepFile s = sweep.get();
            r.figure(FitReportFigures.sweep(s), String.format(Locale.ROOT, "Simulated ramps of %s at rate %.3g per "
                    + "time unit; vertical lines mark the jumps of %s.", s.parameter(), s.rate(), s.readout()));
            FitReportTables.jumps(r, s);
        } else if (sweep.isPresent()) {
            r.note(HtmlReport.NoteKind.INFO, dir.pathOf(FitFile.SWEEP) + " holds no ramps.");
        } else {
            missing(r, dir, FitFile.SWEEP);
        }

        r.section(S_PHASE);
        if (phase.isPresent()) {
            PhasePlaneFile pp = phase.get();
            String held = pp.heldStates().isEmpty() ? "" : " Other states held at " + kv(pp.heldStates()) + ".";
            r.figure(FitReportFigures.phase(pp), "Nullclines of " + pp.xState() + " and " + pp.yState()
                    + " at the fitted parameters, steady states (filled: stable, hollow: unstable) and "
                    + "trajectories (dotted)." + held + (pp.note() == null ? "" : " " + pp.note()));
        } else {
            missing(r, dir, FitFile.PHASE_PLANE);
        }
        if (footer != null) {
            r.footer(footer);
        }
        return r;
    }

    private static void missing(HtmlReport r, FitDirectory dir, FitFile<?> file) {
        r.note(HtmlReport.NoteKind.INFO, "Skipped: " + file.fileName() + " is not in " + dir.path() + "; '"
                + file.producer() + "' writes it.");
    }

    private static void problem(HtmlReport r, FitSummary f) {
        Map<String, Object> kv = new LinkedHashMap<>();
        kv.put("problem file", f.problem());
        kv.put("estimated parameters", f.parameters().size());
        kv.put("best negative log-likelihood", f.bestNll());
        if (f.settings() != null) {
            kv.put("starts", f.settings().starts());
            kv.put("seed", f.settings().seed());
            kv.put("integration tolerances", String.format(Locale.ROOT, "rtol %.3g, atol %.3g",
                    f.settings().rtol(), f.settings().atol()));
            kv.put("iterations per start (limit)", f.settings().maxIterations() == 0 ? "optimizer default"
                    : f.settings().maxIterations());
            kv.put("cost-change tolerance", f.settings().costTolerance() == 0 ? "optimizer default"
                    : f.settings().costTolerance());
            kv.put("scaling factors in closed form", f.settings().closedFormFactors() ? "yes" : "no");
        }
        kv.put("wall time [s]", f.wallSeconds());
        for (Map.Entry<String, String> e : f.versions().entrySet()) {
            kv.put("version (" + e.getKey() + ")", e.getValue());
        }
        r.keyValues(kv);
        Table t = new Table("Input files and their SHA-256 checksums", "file", "SHA-256");
        for (FitSummary.InputFile in : f.inputs()) {
            t.row(in.file(), in.sha256());
        }
        r.table(t);
    }

    private static void multistart(HtmlReport r, FitSummary f) {
        List<FitSummary.Start> starts = f.starts();
        if (starts.isEmpty()) {
            r.note(HtmlReport.NoteKind.INFO, "result.json lists no starts.");
            return;
        }
        double[] nll = new double[starts.size()];
        for (int i = 0; i < nll.length; i++) {
            nll[i] = starts.get(i).failed() ? Double.NaN : starts.get(i).nll();
        }
        r.figure(Figure.of("waterfall", "Multistart waterfall").add(Charts.waterfall(nll, f.nearBestTolerance()))
                .panelSize(720, 340), String.format(Locale.ROOT, "Final negative log-likelihood of each start, "
                + "sorted; the dashed line is %.3g above the best value.", f.nearBestTolerance()));
        String verdict = String.format(Locale.ROOT, "%d of %d starts ended within %.3g of the best value %.8g; "
                + "%d failed.", f.startsNearBest(), starts.size(), f.nearBestTolerance(), f.bestNll(),
                f.failedStarts());
        if (f.startsNearBest() == 0) {
            r.note(HtmlReport.NoteKind.WARNING, verdict + " No start produced a usable value, so there is no "
                    + "estimate: check the problem with 'switchfit check' and the failure reasons below.");
        } else if (f.startsNearBest() == 1) {
            r.note(HtmlReport.NoteKind.WARNING, verdict + " The best value was reached only once, so a better "
                    + "optimum may exist: run more starts.");
        } else {
            r.paragraph(verdict);
        }
        Table t = new Table("Starts sorted by final value", "rank", "start", "final NLL", "above best", "status",
                "termination", "iterations", "reason");
        List<FitSummary.Start> sorted = new ArrayList<>(starts);
        sorted.sort(Comparator.comparingDouble((FitSummary.Start s) -> s.failed() ? Double.POSITIVE_INFINITY
                : s.nll()).thenComparingInt(FitSummary.Start::index));
        for (int i = 0; i < sorted.size(); i++) {
            FitSummary.Start s = sorted.get(i);
            t.row(i + 1, s.index(), s.nll(), s.failed() ? Double.NaN : s.nll() - f.bestNll(), s.status(),
                    s.termination(), s.iterations(), s.reason());
        }
        r.table(t);
    }

    private static String trajectoryCaption(TrajectoriesFile t) {
        String band = t.bandLevel() == null ? "" : String.format(Locale.ROOT, " with %.0f %% prediction bands "
                + "(prediction profiles)", 100 * t.bandLevel());
        return "Measured data (black, 1 sigma bars) and the fitted observables" + band + ".";
    }

    private static String profileCaption(ProfilesFile p) {
        return String.format(Locale.ROOT, "The profile is \u0394(\u22122 log L) = 2 (NLL \u2212 %.8g); the dashed "
                + "horizontal line is the %.0f %% threshold, dotted vertical lines the estimate and the interval "
                + "ends.", p.bestNll(), 100 * p.level());
    }

    static String kv(Map<String, Double> m) {
        StringBuilder sb = new StringBuilder();
        for (Map.Entry<String, Double> e : m.entrySet()) {
            if (sb.length() > 0) {
                sb.append(", ");
            }
            sb.append(e.getKey()).append(" = ").append(Table.formatNumber(e.getValue()));
        }
        return sb.toString();
    }
}
