package org.switchfit.cli;

import com.fasterxml.jackson.databind.ObjectMapper;
import com.fasterxml.jackson.databind.SerializationFeature;
import com.fasterxml.jackson.databind.node.ArrayNode;
import com.fasterxml.jackson.databind.node.ObjectNode;
import java.io.IOException;
import java.io.PrintWriter;
import java.nio.charset.StandardCharsets;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Comparator;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeMap;
import java.util.concurrent.Callable;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.ScheduledExecutorService;
import java.util.concurrent.ScheduledFuture;
import java.util.concurrent.TimeUnit;
import java.util.regex.Matcher;
import java.util.regex.Pattern;
import java.util.stream.Stream;
import org.switchfit.model.Model;
import org.switchfit.ode.AutoIntegrator;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.Integrator;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.Integrators;
import org.switchfit.ode.ModelCompiler;
import org.switchfit.ode.ModelOutputs;
import org.switchfit.ode.Simulator;
import org.switchfit.ode.SolverSettings;
import org.switchfit.ode.Trajectory;
import org.switchfit.sbml.SbmlReader;
import org.switchfit.util.AtomicFiles;
import org.switchfit.util.UnsupportedConstructException;
import org.switchfit.util.UserInputException;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/**
 * {@code switchfit suite}: runs SBML Test Suite semantic cases (one folder per case with settings, expected
 * results and the model in several SBML levels) and compares with the expected results using each case's own
 * tolerances: |sim - expected| &lt;= absolute + relative * |expected| per value.
 */
@Command(name = "suite", mixinStandardHelpOptions = true,
        footer = {"", "Examples:", "  switchfit suite ../shared/conformance/sbml-semantic --cases 1-200 --json target/suite.json", "  switchfit suite CASES_DIR --min-pass 0.95 --log suite.log"},
        description = "Run SBML Test Suite semantic cases from DIR and compare with their expected results.")
public final class SuiteCommand implements Callable<Integer> {
    /** Wall-clock limit per case. */
    static final long CASE_TIMEOUT_SECONDS = 20;

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "DIR", description = "folder with one sub-folder NNNNN per case")
    Path dir;

    @Option(names = "--cases", paramLabel = "RANGES", description = "case numbers, e.g. 1-200 or 1,5,10-20")
    String cases;

    @Option(names = "--json", paramLabel = "FILE", description = "write per-case results and totals as JSON")
    Path json;

    @Option(names = "--min-pass", paramLabel = "FRACTION", defaultValue = "0",
            description = "exit with code 1 when the passing fraction of in-scope cases is below this")
    double minPass;

    @Option(names = "--save", paramLabel = "DIR", description = "write each simulated result as DIR/NNNNN.csv")
    Path save;

    @Option(names = "--level", paramLabel = "L.V", description = "use this SBML level.version (e.g. 2.4) instead "
            + "of the highest available")
    String level;

    @Option(names = "--method", paramLabel = "bdf|dp|auto", description = "integration method (default: "
            + "Dormand-Prince, switching to BDF when a case turns out stiff)")
    String method;

    @Option(names = "--threads", paramLabel = "N", description = "worker threads (default: available processors)")
    Integer threads;

    /** Outcome of one case. */
    record Outcome(String id, String status, String reason, List<String> tags) {
    }

    @Override
    public Integer call() throws Exception {
        if (!Files.isDirectory(dir)) {
            throw new UserInputException(null, "suite folder '" + dir + "' does not exist; pass the folder that "
                    + "holds the NNNNN case folders");
        }
        if (!(minPass >= 0 && minPass <= 1)) {
            throw new UserInputException(null, "--min-pass must be between 0 and 1, got " + minPass);
        }
        int[] lv = parseLevel(level);
        List<Path> caseDirs = selectCases(dir, cases);
        if (caseDirs.isEmpty()) {
            throw new UserInputException(null, "no case folders (NNNNN) found in '" + dir + "'"
                    + (cases == null ? "" : " for --cases " + cases));
        }
        SbmlReader.silenceLogging();
        int nThreads = threads != null ? Math.max(1, threads) : Runtime.getRuntime().availableProcessors();
        ExecutorService pool = Executors.newFixedThreadPool(nThreads, r -> {
            Thread th = new Thread(r, "suite-worker");
            th.setDaemon(true);
            return th;
        });
        ScheduledExecutorService watchdog = Executors.newSingleThreadScheduledExecutor(r -> {
            Thread th = new Thread(r, "suite-watchdog");
            th.setDaemon(true);
            return th;
        });
        long start = System.nanoTime();
        List<Future<Outcome>> futures = new ArrayList<>();
        for (Path c : caseDirs) {
            futures.add(pool.submit(() -> runWithTimeout(c, lv, watchdog)));
        }
        List<Outcome> outcomes = new ArrayList<>();
        for (int i = 0; i < futures.size(); i++) {
            try {
                outcomes.add(futures.get(i).get());
            } catch (ExecutionException e) {
                outcomes.add(new Outcome(caseDirs.get(i).getFileName().toString(), "error",
                        "internal: " + e.getCause(), List.of()));
            }
        }
        pool.shutdownNow();
        watchdog.shutdownNow();
        double seconds = (System.nanoTime() - start) / 1e9;
        return report(outcomes, seconds);
    }

    private Outcome runWithTimeout(Path caseDir, int[] lv, ScheduledExecutorService watchdog) {
        Thread me = Thread.currentThread();
        ScheduledFuture<?> alarm = watchdog.schedule(me::interrupt, CASE_TIMEOUT_SECONDS, TimeUnit.SECONDS);
        try {
            return runCase(caseDir, lv);
        } finally {
            alarm.cancel(false);
            Thread.interrupted(); // clear a late interrupt
        }
    }

    private int report(List<Outcome> outcomes, double seconds) throws IOException {
        int passed = 0;
        int failed = 0;
        int unsupported = 0;
        int errors = 0;
        int outOfScope = 0;
        Map<String, Integer> unsupportedReasons = new TreeMap<>();
        Map<String, Integer> failTags = new TreeMap<>();
        for (Outcome o : outcomes) {
            switch (o.status()) {
                case "pass":
                    passed++;
                    break;
                case "fail":
                    failed++;
                    break;
                case "unsupported":
                    unsupported++;
                    if (o.reason().startsWith("out of scope")) {
                        outOfScope++;
                    }
                    unsupportedReasons.merge(shortReason(o.reason()), 1, Integer::sum);
                    break;
                default:
                    errors++;
            }
            if (o.status().equals("fail") || o.status().equals("error")) {
                for (String tg : o.tags()) {
                    failTags.merge(tg, 1, Integer::sum);
                }
            }
        }
        int inScope = outcomes.size() - outOfScope;
        double fraction = inScope == 0 ? 1.0 : (double) passed / inScope;
        PrintWriter w = spec.commandLine().getOut();
        for (Outcome o : outcomes) {
            if (!o.status().equals("pass")) {
                w.printf(Locale.ROOT, "%s %-11s %s%n", o.id(), o.status(), o.reason());
            }
        }
        w.printf(Locale.ROOT, "cases: %d  passed: %d  failed: %d  unsupported: %d (out of scope: %d)  errors: %d%n",
                outcomes.size(), passed, failed, unsupported, outOfScope, errors);
        w.printf(Locale.ROOT, "pass fraction of in-scope cases: %.4f (%d/%d); %.1f s%n", fraction, passed, inScope,
                seconds);
        if (!failTags.isEmpty()) {
            List<Map.Entry<String, Integer>> tags = new ArrayList<>(failTags.entrySet());
            tags.sort(Map.Entry.<String, Integer>comparingByValue().reversed());
            StringBuilder sb = new StringBuilder("tags of failures and errors:");
            for (int i = 0; i < Math.min(12, tags.size()); i++) {
                sb.append(' ').append(tags.get(i).getKey()).append('=').append(tags.get(i).getValue());
            }
            w.println(sb);
        }
        w.flush();
        if (json != null) {
            ObjectMapper om = new ObjectMapper().enable(SerializationFeature.INDENT_OUTPUT);
            ObjectNode root = om.createObjectNode();
            root.put("total", outcomes.size());
            root.put("passed", passed);
            root.put("failed", failed);
            root.put("unsupported", unsupported);
            root.put("errors", errors);
            root.put("outOfScope", outOfScope);
            root.put("passFraction", fraction);
            ObjectNode ur = root.putObject("unsupportedConstructs");
            unsupportedReasons.forEach(ur::put);
            ArrayNode arr = root.putArray("cases");
            for (Outcome o : outcomes) {
                ObjectNode c = arr.addObject();
                c.put("id", o.id());
                c.put("status", o.status());
                c.put("reason", o.reason());
            }
            AtomicFiles.writeString(json, om.writeValueAsString(root) + "\n");
        }
        return fraction < minPass ? 1 : 0;
    }

    private static String shortReason(String reason) {
        Matcher m = Pattern.compile("uses (.*?), which switchfit does not support").matcher(reason);
        if (m.find()) {
            return m.group(1);
        }
        return reason.length() > 80 ? reason.substring(0, 80) : reason;
    }

    static int[] parseLevel(String level) {
        if (level == null) {
            return null;
        }
        Matcher m = Pattern.compile("(\\d)\\.(\\d)").matcher(level.strip());
        if (!m.matches()) {
            throw new UserInputException(null, "--level '" + level + "': expected LEVEL.VERSION such as 2.4 or 3.2");
        }
        return new int[] {Integer.parseInt(m.group(1)), Integer.parseInt(m.group(2))};
    }

    static List<Path> selectCases(Path dir, String ranges) throws IOException {
        List<int[]> rs = new ArrayList<>();
        if (ranges != null) {
            for (String part : ranges.split(",")) {
                String s = part.strip();
                try {
                    if (s.contains("-")) {
                        String[] ab = s.split("-", 2);
                        rs.add(new int[] {Integer.parseInt(ab[0].strip()), Integer.parseInt(ab[1].strip())});
                    } else if (!s.isEmpty()) {
                        int v = Integer.parseInt(s);
                        rs.add(new int[] {v, v});
                    }
                } catch (NumberFormatException e) {
                    throw new UserInputException(null, "--cases '" + ranges + "': '" + s + "' is not a number or "
                            + "range; write e.g. 1-200 or 1,5,10-20");
                }
            }
        }
        List<Path> out = new ArrayList<>();
        try (Stream<Path> st = Files.list(dir)) {
            st.filter(Files::isDirectory).filter(p -> p.getFileName().toString().matches("\\d{5}"))
                    .sorted(Comparator.comparing(p -> p.getFileName().toString()))
                    .forEach(p -> {
                        int num = Integer.parseInt(p.getFileName().toString());
                        boolean keep = rs.isEmpty();
                        for (int[] r : rs) {
                            keep |= num >= r[0] && num <= r[1];
                        }
                        if (keep) {
                            out.add(p);
                        }
                    });
        }
        return out;
    }

    /** Runs one case; never throws. */
    Outcome runCase(Path caseDir, int[] lv) {
        String id = caseDir.getFileName().toString();
        List<String> tags = List.of();
        try {
            Map<String, String> header = readHeader(caseDir.resolve(id + "-model.m"));
            tags = new ArrayList<>();
            for (String key : new String[] {"componentTags", "testTags"}) {
                String v = header.get(key);
                if (v != null) {
                    for (String tg : v.split(",")) {
                        if (!tg.isBlank()) {
                            tags.add(tg.strip());
                        }
                    }
                }
            }
            if ("FluxBalanceSteadyState".equals(header.getOrDefault("testType", "").strip())) {
                return new Outcome(id, "unsupported", "out of scope: flux balance steady state", tags);
            }
            Path file = pickFile(caseDir, id, lv);
            if (file == null) {
                return new Outcome(id, "unsupported", lv == null ? "no SBML file in case folder"
                        : "case has no SBML L" + lv[0] + "V" + lv[1] + " file", tags);
            }
            Map<String, String> settings = readSettings(caseDir.resolve(id + "-settings.txt"));
            double start = Double.parseDouble(settings.get("start"));
            double duration = Double.parseDouble(settings.get("duration"));
            int steps = (int) Double.parseDouble(settings.get("steps"));
            double absTol = Double.parseDouble(settings.get("absolute"));
            double relTol = Double.parseDouble(settings.get("relative"));
            List<String> vars = list(settings.get("variables"));
            List<String> amount = list(settings.get("amount"));
            List<String> conc = list(settings.get("concentration"));
            double[] times = new double[steps + 1];
            for (int i = 0; i <= steps; i++) {
                times[i] = start + i * duration / steps;
            }
            Model model = SbmlReader.read(file);
            CompiledModel cm = ModelCompiler.compile(model);
            List<String> outNames = new ArrayList<>();
            for (String v : vars) {
                if (amount.contains(v) && model.species(v) != null) {
                    outNames.add("amount(" + v + ")");
                } else if (conc.contains(v) && model.species(v) != null) {
                    outNames.add("concentration(" + v + ")");
                } else {
                    outNames.add(v);
                }
            }
            ModelOutputs outs = ModelOutputs.of(cm, outNames);
            double atol = Math.min(1e-12, absTol * 1e-4);
            Integrator integ = method == null
                    ? new AutoIntegrator(SolverSettings.defaults().withTolerances(1e-10, atol))
                    : Integrators.create(SimulateCommand.settings(method, 1e-10, atol));
            Trajectory tr = new Simulator(cm, integ).simulate(times, cm.parameterValues(), outs);
            Results expected = readResults(caseDir.resolve(id + "-results.csv"));
            if (save != null) {
                AtomicFiles.writeString(save.resolve(id + ".csv"), toCsv(expected.header, tr));
            }
            String mismatch = compare(expected, vars, tr, absTol, relTol);
            return mismatch == null ? new Outcome(id, "pass", "", tags) : new Outcome(id, "fail", mismatch, tags);
        } catch (UnsupportedConstructException e) {
            return new Outcome(id, "unsupported", SbmlReaderMessages.oneLine(e.getMessage()), tags);
        } catch (UserInputException e) {
            return new Outcome(id, "error", SbmlReaderMessages.oneLine(e.getMessage()), tags);
        } catch (IntegrationException e) {
            String msg = Thread.currentThread().isInterrupted() || e.getMessage().contains("interrupted")
                    ? "timeout after " + CASE_TIMEOUT_SECONDS + " s" : e.getMessage();
            return new Outcome(id, "error", SbmlReaderMessages.oneLine(msg), tags);
        } catch (RuntimeException | IOException | StackOverflowError e) {
            return new Outcome(id, "error", SbmlReaderMessages.oneLine("internal: " + e), tags);
        }
    }

    private static String toCsv(List<String> header, Trajectory tr) {
        StringBuilder sb = new StringBuilder(String.join(",", header)).append('\n');
        for (int r = 0; r < tr.rows(); r++) {
            sb.append(SimulateCommand.fmt(tr.time(r)));
            for (int k = 0; k < tr.names().size(); k++) {
                sb.append(',').append(Double.toString(tr.value(r, k)));
            }
            sb.append('\n');
        }
        return sb.toString();
    }

    private static String compare(Results exp, List<String> vars, Trajectory tr, double abs, double rel) {
        if (exp.rows.size() != tr.rows()) {
            return "expected " + exp.rows.size() + " rows, simulated " + tr.rows();
        }
        for (int c = 1; c < exp.header.size(); c++) {
            String name = exp.header.get(c).strip();
            int k = vars.indexOf(name);
            if (k < 0) {
                return "result column '" + name + "' is not among the settings variables";
            }
            for (int r = 0; r < exp.rows.size(); r++) {
                double e = exp.rows.get(r)[c];
                double s = tr.value(r, k);
                boolean ok;
                if (Double.isNaN(e)) {
                    ok = Double.isNaN(s);
                } else if (Double.isInfinite(e)) {
                    ok = s == e;
                } else {
                    ok = Math.abs(s - e) <= abs + rel * Math.abs(e);
                }
                if (!ok) {
                    return String.format(Locale.ROOT, "%s at t=%s: simulated %.10g, expected %.10g", name,
                            SimulateCommand.fmt(tr.time(r)), s, e);
                }
            }
        }
        return null;
    }

    /** Parsed results.csv. */
    record Results(List<String> header, List<double[]> rows) {
    }

    static Results readResults(Path p) throws IOException {
        List<String> lines = Files.readAllLines(p, StandardCharsets.UTF_8);
        List<String> header = new ArrayList<>();
        for (String h : lines.get(0).strip().split(",")) {
            header.add(h.strip());
        }
        List<double[]> rows = new ArrayList<>();
        for (int i = 1; i < lines.size(); i++) {
            String ln = lines.get(i).strip();
            if (ln.isEmpty()) {
                continue;
            }
            String[] f = ln.split(",");
            double[] v = new double[f.length];
            for (int j = 0; j < f.length; j++) {
                v[j] = parseValue(f[j]);
            }
            rows.add(v);
        }
        return new Results(header, rows);
    }

    static double parseValue(String s) {
        String t = s.strip().toLowerCase(Locale.ROOT);
        switch (t) {
            case "nan":
                return Double.NaN;
            case "inf":
            case "+inf":
            case "infinity":
                return Double.POSITIVE_INFINITY;
            case "-inf":
            case "-infinity":
                return Double.NEGATIVE_INFINITY;
            default:
                return Double.parseDouble(t);
        }
    }

    private static Path pickFile(Path caseDir, String id, int[] lv) throws IOException {
        Pattern pat = Pattern.compile(Pattern.quote(id) + "-sbml-l(\\d)v(\\d)\\.xml");
        Path best = null;
        int bestKey = -1;
        try (Stream<Path> st = Files.list(caseDir)) {
            for (Path p : (Iterable<Path>) st::iterator) {
                Matcher m = pat.matcher(p.getFileName().toString());
                if (!m.matches()) {
                    continue;
                }
                int l = Integer.parseInt(m.group(1));
                int v = Integer.parseInt(m.group(2));
                if (lv != null) {
                    if (l == lv[0] && v == lv[1]) {
                        return p;
                    }
                    continue;
                }
                int key = l * 10 + v;
                if (key > bestKey) {
                    bestKey = key;
                    best = p;
                }
            }
        }
        return best;
    }

    static Map<String, String> readSettings(Path p) throws IOException {
        Map<String, String> m = new LinkedHashMap<>();
        for (String ln : Files.readAllLines(p, StandardCharsets.UTF_8)) {
            int c = ln.indexOf(':');
            if (c > 0) {
                m.put(ln.substring(0, c).strip(), ln.substring(c + 1).strip());
            }
        }
        return m;
    }

    static Map<String, String> readHeader(Path p) throws IOException {
        Map<String, String> m = new LinkedHashMap<>();
        if (!Files.exists(p)) {
            return m;
        }
        for (String ln : Files.readAllLines(p, StandardCharsets.UTF_8)) {
            String s = ln.strip();
            if (s.startsWith("*)")) {
                break;
            }
            int c = s.indexOf(':');
            if (c > 0) {
                m.putIfAbsent(s.substring(0, c).strip(), s.substring(c + 1).strip());
            }
        }
        return m;
    }

    private static List<String> list(String s) {
        List<String> l = new ArrayList<>();
        if (s == null) {
            return l;
        }
        for (String x : s.split(",")) {
            if (!x.isBlank()) {
                l.add(x.strip());
            }
        }
        return l;
    }

    /** Message helpers. */
    static final class SbmlReaderMessages {
        private SbmlReaderMessages() {
        }

        static String oneLine(String s) {
            if (s == null) {
                return "";
            }
            return s.replace('\r', ' ').replace('\n', ' ');
        }
    }
}
