package org.switchfit.cli;

import java.io.IOException;
import java.math.BigDecimal;
import java.math.RoundingMode;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import org.switchfit.continuation.Threshold;
import org.switchfit.data.DoseResponsePoint;
import org.switchfit.data.EstimatedParameter;
import org.switchfit.data.Experiment;
import org.switchfit.data.NoiseModel;
import org.switchfit.data.Observable;
import org.switchfit.data.ParameterScale;
import org.switchfit.data.ProblemFileWriter;
import org.switchfit.data.SwitchfitProblem;
import org.switchfit.data.SwitchingThreshold;
import org.switchfit.data.TimecoursePoint;
import org.switchfit.data.ValueRef;
import org.switchfit.ode.Trajectory;
import org.switchfit.util.AtomicFiles;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * The SYNTHETIC demo data set for the Zarn/Quel stress switch ({@code models/stress_switch.xml}): simulated from
 * the model's nominal parameter values (the truth) with seeded noise, and the problem file that estimates seven
 * parameters from it. Run as {@code switchfit demo --regenerate-data}; the output is byte-identical for a given
 * seed (see {@link DemoNoise}).
 *
 * <p>Data: act_frac = ZarnA / (ZarnI + ZarnA) (Gaussian noise, sigma {@value #SIGMA_ACT}, estimated as
 * {@code sigma_act}) and quel_level = QuelA (proportional noise 0.01 + 0.05 |y|, known) at
 * {@link #TIMES} after a stimulus step from the rest state to 0.5, 1.5 and 3.0, and from the stimulated state
 * (3.0) back to 0.5; steady-state act_frac from the low and the high state at stimulus 0 to 3.5 in steps of 0.25
 * (long integration then Newton, so each point is the attractor reached from that state); the switch-on and
 * switch-off thresholds (the folds of the true model, by pseudo-arclength continuation on the reduced system),
 * {@value #THRESHOLD_REPLICATES} replicates each with Gaussian noise sigma {@value #SIGMA_THRESHOLD}. Measured
 * values are rounded to {@value #DECIMALS} decimals after the noise is added.
 *
 * <p>k_basal is estimated on purpose although the data hardly see it: it sets the rest level of act_frac
 * (about k_basal Km_dephos / k_dephos = 0.002, far below the noise) and shifts both thresholds by only
 * k_basal / k_stim = 0.05, which k_stim and K_inh can largely absorb; it is meant to show a poorly determined
 * parameter in the profiles.
 */
final class DemoScenario {
    /** Default seed of the checked-in data. */
    static final long DEFAULT_SEED = 20261202L;
    static final double SIGMA_ACT = 0.03;
    static final double QUEL_ABSOLUTE = 0.01;
    static final double QUEL_RELATIVE = 0.05;
    static final double SIGMA_THRESHOLD = 0.05;
    static final int THRESHOLD_REPLICATES = 3;
    static final int DECIMALS = 4;
    static final double[] TIMES = {0, 2, 5, 10, 15, 20, 30, 40, 50, 60};
    /** Range of the stimulus for threshold searches and branches. */
    static final double STIMULUS_LOW = 0;
    static final double STIMULUS_HIGH = 4;
    static final String PROBLEM_STEM = "stress_switch";
    static final String CONTROL = "stimulus";

    /** An estimated parameter of the demo: bounds on the linear scale, log10 scale. */
    record Estimated(String id, double lower, double upper, double start) {
    }

    /** Parameters estimated by the demo problem (start values deliberately off the truth). */
    static final List<Estimated> ESTIMATED = List.of(
            new Estimated("k_basal", 1e-5, 1, 0.003),
            new Estimated("k_stim", 0.002, 20, 0.1),
            new Estimated("k_dephos", 0.01, 100, 2),
            new Estimated("K_inh", 0.004, 40, 0.6),
            new Estimated("k_inh", 0.1, 1000, 5),
            new Estimated("k_rec", 0.01, 100, 2),
            new Estimated("sigma_act", 1e-3, 1, 0.05));

    /** A step experiment: settles in {@code from}, then the stimulus is {@code stimulus}. */
    private record Step(String id, double stimulus, String from, boolean quel) {
    }

    private static final List<Step> STEPS = List.of(
            new Step("step_0p5", 0.5, "rest", false),
            new Step("step_1p5", 1.5, "rest", false),
            new Step("step_3", 3.0, "rest", true),
            new Step("release_0p5", 0.5, "stimulated", true));

    /**
     * Generation settings.
     *
     * @param seed       noise seed
     * @param noiseScale factor on every noise standard deviation (1 for the data set; 0 gives exact values)
     * @param decimals   decimals kept in measured values, or -1 to keep full precision
     */
    record Settings(long seed, double noiseScale, int decimals) {
        static Settings defaults() {
            return new Settings(DEFAULT_SEED, 1, DECIMALS);
        }
    }

    /** Generated data: the problem (not yet written) and the noise-free thresholds. */
    record Generated(SwitchfitProblem problem, double switchOn, double switchOff, Settings settings) {
    }

    private DemoScenario() {
    }

    /**
     * Generates the data from the model's nominal values.
     *
     * @param modelFile  the SBML model (the truth is its declared values)
     * @param datasetDir folder the problem will be written to (model path is stored relative to it)
     */
    static Generated generate(Path modelFile, Path datasetDir, Settings s) {
        DemoModel dm = DemoModel.load(modelFile);
        double[] truth = dm.nominal();
        int stim = dm.index(CONTROL);
        double[] low = lowState(dm, truth);
        double[] high = highState(dm, truth);

        List<TimecoursePoint> tc = new ArrayList<>();
        for (Step st : STEPS) {
            double[] pFrom = truth.clone();
            pFrom[stim] = st.from.equals("rest") ? 0.0 : 3.0;
            double[] y0 = dm.settle(pFrom, low);
            double[] p = truth.clone();
            p[stim] = st.stimulus;
            Trajectory tr = dm.simulate(p, y0, TIMES);
            DemoNoise act = new DemoNoise(s.seed, "timecourse/" + st.id + "/act_frac");
            for (int r = 0; r < tr.rows(); r++) {
                double y = actFrac(dm, row(tr, r));
                tc.add(new TimecoursePoint(st.id, "act_frac", TIMES[r],
                        round(y + s.noiseScale * SIGMA_ACT * act.nextGaussian(), s.decimals), Double.NaN, null));
            }
            if (st.quel) {
                DemoNoise qn = new DemoNoise(s.seed, "timecourse/" + st.id + "/quel_level");
                int iq = dm.states.indexOf("QuelA");
                for (int r = 0; r < tr.rows(); r++) {
                    double y = tr.value(r, iq);
                    double sd = QUEL_ABSOLUTE + QUEL_RELATIVE * Math.abs(y);
                    tc.add(new TimecoursePoint(st.id, "quel_level", TIMES[r],
                            round(y + s.noiseScale * sd * qn.nextGaussian(), s.decimals), Double.NaN, null));
                }
            }
        }

        List<DoseResponsePoint> dr = new ArrayList<>();
        for (DoseResponsePoint.History h : DoseResponsePoint.History.values()) {
            DemoNoise n = new DemoNoise(s.seed, "dose/rest/act_frac/" + h.name().toLowerCase(Locale.ROOT));
            for (double dose : doses()) {
                double y = steadyActFrac(dm, truth, dose, h == DoseResponsePoint.History.LOW ? low : high);
                dr.add(new DoseResponsePoint("rest", "act_frac", CONTROL, dose,
                        round(y + s.noiseScale * SIGMA_ACT * n.nextGaussian(), s.decimals), Double.NaN, h, null));
            }
        }

        double[] rest = truth.clone();
        rest[stim] = 0;
        double[] yRest = dm.settle(rest, low);
        Threshold on = dm.threshold(truth, yRest, CONTROL, STIMULUS_LOW, STIMULUS_HIGH, true, "ZarnA");
        Threshold off = dm.threshold(truth, yRest, CONTROL, STIMULUS_LOW, STIMULUS_HIGH, false, "ZarnA");
        List<SwitchingThreshold> th = new ArrayList<>();
        DemoNoise tn = new DemoNoise(s.seed, "thresholds/rest/stimulus");
        for (int k = 0; k < THRESHOLD_REPLICATES; k++) {
            th.add(new SwitchingThreshold("rest", CONTROL, SwitchingThreshold.Direction.UP,
                    round(on.value() + s.noiseScale * SIGMA_THRESHOLD * tn.nextGaussian(), s.decimals),
                    SIGMA_THRESHOLD, null));
        }
        for (int k = 0; k < THRESHOLD_REPLICATES; k++) {
            th.add(new SwitchingThreshold("rest", CONTROL, SwitchingThreshold.Direction.DOWN,
                    round(off.value() + s.noiseScale * SIGMA_THRESHOLD * tn.nextGaussian(), s.decimals),
                    SIGMA_THRESHOLD, null));
        }
        Path dir = datasetDir.toAbsolutePath().normalize();
        Path model = dir.resolve("../models/stress_switch.xml").normalize();
        SwitchfitProblem problem = new SwitchfitProblem(dir.resolve(PROBLEM_STEM + ".yaml"), 1, model,
                parameters(), experiments(), observables(), tc, dr, th, List.of());
        return new Generated(problem, on.value(), off.value(), s);
    }

    /** Doses 0, 0.25, ..., 3.5. */
    static double[] doses() {
        double[] d = new double[15];
        for (int i = 0; i < d.length; i++) {
            d[i] = 0.25 * i;
        }
        return d;
    }

    /** The off state: all Zarn inactive, all Quel active (the model's initial state). */
    static double[] lowState(DemoModel dm, double[] p) {
        return dm.initialState(p);
    }

    /** The on state: all Zarn active, all Quel inactive (same totals as the initial state). */
    static double[] highState(DemoModel dm, double[] p) {
        double[] y = dm.initialState(p);
        double[] h = new double[y.length];
        int zi = dm.states.indexOf("ZarnI");
        int za = dm.states.indexOf("ZarnA");
        int qa = dm.states.indexOf("QuelA");
        int qi = dm.states.indexOf("QuelI");
        h[za] = y[zi] + y[za];
        h[qi] = y[qa] + y[qi];
        return h;
    }

    /** Steady-state act_frac at the dose, reached from yStart. */
    static double steadyActFrac(DemoModel dm, double[] p, double dose, double[] yStart) {
        double[] q = p.clone();
        q[dm.index(CONTROL)] = dose;
        return actFrac(dm, dm.settle(q, yStart));
    }

    static double actFrac(DemoModel dm, double[] y) {
        double za = y[dm.states.indexOf("ZarnA")];
        return za / (y[dm.states.indexOf("ZarnI")] + za);
    }

    private static double[] row(Trajectory tr, int r) {
        double[] y = new double[tr.names().size()];
        for (int k = 0; k < y.length; k++) {
            y[k] = tr.value(r, k);
        }
        return y;
    }

    static double round(double v, int decimals) {
        if (decimals < 0) {
            return v;
        }
        return new BigDecimal(v).setScale(decimals, RoundingMode.HALF_EVEN).doubleValue();
    }

    private static List<EstimatedParameter> parameters() {
        List<EstimatedParameter> l = new ArrayList<>();
        for (Estimated e : ESTIMATED) {
            l.add(new EstimatedParameter(e.id, e.lower, e.upper, ParameterScale.LOG10, e.start, null, null));
        }
        return l;
    }

    private static List<Experiment> experiments() {
        List<Experiment> l = new ArrayList<>();
        l.add(experiment("rest", 0.0, null));
        l.add(experiment("stimulated", 3.0, null));
        for (Step st : STEPS) {
            l.add(experiment(st.id, st.stimulus, st.from));
        }
        return l;
    }

    private static Experiment experiment(String id, double stimulus, String settleIn) {
        Map<String, ValueRef> pv = new LinkedHashMap<>();
        pv.put(CONTROL, ValueRef.ofNumber(stimulus));
        return new Experiment(id, pv, Map.of(), settleIn, List.of(), null);
    }

    private static List<Observable> observables() {
        return List.of(
                new Observable("act_frac", "ZarnA / (ZarnI + ZarnA)", null, null,
                        new NoiseModel.Gaussian(ValueRef.ofParameter("sigma_act")), null),
                new Observable("quel_level", "QuelA", null, null,
                        new NoiseModel.Proportional(ValueRef.ofNumber(QUEL_ABSOLUTE),
                                ValueRef.ofNumber(QUEL_RELATIVE)), null));
    }

    /**
     * Writes the problem file and its tables into {@code datasetDir}, each table headed by a SYNTHETIC comment,
     * plus {@code stress_switch-truth.md}.
     *
     * @return the files written
     */
    static List<Path> write(Generated g, Path datasetDir, Path modelFile) {
        Path yaml = g.problem().problemFile();
        List<Path> files = new ArrayList<>(ProblemFileWriter.write(g.problem(), yaml));
        String note = "SYNTHETIC data generated by 'switchfit demo --regenerate-data' (seed " + g.settings().seed()
                + ") from the nominal values of models/stress_switch.xml; see stress_switch-truth.md";
        for (Path f : files) {
            String body = read(f);
            if (f.equals(yaml)) {
                int eol = body.indexOf('\n') + 1;
                body = "# " + note + "\n" + body.substring(0, eol) + "description: \"SYNTHETIC demo: Zarn/Quel "
                        + "stress switch, stimulus steps, dose-response from both states, switching thresholds\"\n"
                        + body.substring(eol);
            } else {
                body = "# " + note + "\n" + body;
            }
            AtomicFiles.writeString(f, body);
        }
        Path truth = datasetDir.resolve(PROBLEM_STEM + "-truth.md");
        AtomicFiles.writeString(truth, truthText(g, DemoModel.load(modelFile)));
        files.add(truth);
        return files;
    }

    private static String read(Path f) {
        try {
            return Files.readString(f, StandardCharsets.UTF_8);
        } catch (IOException e) {
            throw new UserInputException(SourceLocation.ofFile(f.toString()), "cannot be read back after writing ("
                    + e.getMessage() + "); check the folder's permissions", e);
        }
    }

    private static String truthText(Generated g, DemoModel dm) {
        double[] p = dm.nominal();
        StringBuilder b = new StringBuilder();
        b.append("# Demo data set: the truth behind it (SYNTHETIC)\n\n");
        b.append("Every number in `stress_switch.yaml` and its tables is **synthetic**: simulated from the model\n")
                .append("`models/stress_switch.xml` (an invented switch, see `stress_switch-generator-notes.md`) with\n")
                .append("seeded noise. Nothing here was measured.\n\n");
        b.append("Regenerate (byte-identical output for the same seed):\n\n```\n./switchfit demo --regenerate-data")
                .append(g.settings().seed() == DEFAULT_SEED ? "" : " --seed " + g.settings().seed())
                .append("\n```\n\n");
        b.append("Generator: `org.switchfit.cli.DemoScenario`; noise: `org.switchfit.cli.DemoNoise` (SplitMix64 words,\n")
                .append("Box-Muller normals with StrictMath, one stream per seed and data block).\n\n");
        b.append("## True parameter values (the model's declared values)\n\n| parameter | true value | estimated |\n")
                .append("|---|---|---|\n");
        for (String id : dm.compiled.parameterIds()) {
            if (dm.states.contains(id) || id.equals("cell")) {
                continue;
            }
            b.append("| ").append(id).append(" | ").append(fmt(p[dm.index(id)])).append(" | ")
                    .append(id.equals(CONTROL) ? "control (set per experiment)" : isEstimated(id) ? "yes" : "no")
                    .append(" |\n");
        }
        b.append("| sigma_act | ").append(fmt(SIGMA_ACT)).append(" | yes |\n\n");
        b.append("Estimated on log10 scale within the bounds of the problem file; k_basal is expected to be\n")
                .append("poorly determined (it sets a rest level of about 0.002, far below the noise, and shifts the\n")
                .append("thresholds by only k_basal / k_stim = 0.05).\n\n");
        b.append("## Noise model and seed\n\n");
        b.append(String.format(Locale.ROOT, "* seed %d; values rounded to %d decimals after adding noise%n",
                g.settings().seed(), g.settings().decimals()));
        b.append(String.format(Locale.ROOT, "* act_frac = ZarnA / (ZarnI + ZarnA): Gaussian, sigma %s%n",
                fmt(SIGMA_ACT * g.settings().noiseScale())));
        b.append(String.format(Locale.ROOT, "* quel_level = QuelA: Gaussian, sigma %s + %s |y|%n",
                fmt(QUEL_ABSOLUTE * g.settings().noiseScale()), fmt(QUEL_RELATIVE * g.settings().noiseScale())));
        b.append(String.format(Locale.ROOT, "* thresholds: Gaussian, sigma %s, %d replicates per direction%n%n",
                fmt(SIGMA_THRESHOLD * g.settings().noiseScale()), THRESHOLD_REPLICATES));
        b.append("## Noise-free values\n\n");
        b.append(String.format(Locale.ROOT, "* switch-on fold (sweep up): stimulus = %.12g%n", g.switchOn()));
        b.append(String.format(Locale.ROOT, "* switch-off fold (sweep down): stimulus = %.12g%n", g.switchOff()));
        b.append("\n(independent sympy values: 2.0675533425302829702 and 0.82548611445015955433, see the\n")
                .append("generator notes.)\n\n");
        b.append("## Experiments\n\n");
        b.append("* `rest` (stimulus 0) and `stimulated` (stimulus 3.0): settle-in states; `rest` also carries the\n")
                .append("  dose-response (stimulus 0 to 3.5 by 0.25, from the low state ZarnA = 0, QuelA = 1 and the\n")
                .append("  high state ZarnA = 1, QuelA = 0: integration to t = 3000 min, then Newton) and the thresholds\n");
        for (Step st : STEPS) {
            b.append(String.format(Locale.ROOT, "* `%s`: settled in `%s`, stimulus set to %s at t = 0; act_frac%s at"
                    + " t = %s min%n", st.id, st.from, fmt(st.stimulus), st.quel ? " and quel_level" : "",
                    timesText()));
        }
        return b.toString();
    }

    private static boolean isEstimated(String id) {
        for (Estimated e : ESTIMATED) {
            if (e.id.equals(id)) {
                return true;
            }
        }
        return false;
    }

    private static String timesText() {
        List<String> t = new ArrayList<>();
        for (double x : TIMES) {
            t.add(fmt(x));
        }
        return String.join(", ", t);
    }

    private static String fmt(double v) {
        return BigDecimal.valueOf(v).stripTrailingZeros().toPlainString();
    }
}
