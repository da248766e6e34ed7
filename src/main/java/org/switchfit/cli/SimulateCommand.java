package org.switchfit.cli;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.switchfit.model.Model;
import org.switchfit.model.Species;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.FastEquilibriumException;
import org.switchfit.ode.InitialValueCheck;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.Integrators;
import org.switchfit.ode.ModelCompiler;
import org.switchfit.ode.ModelOutputs;
import org.switchfit.ode.Simulator;
import org.switchfit.ode.SolverSettings;
import org.switchfit.ode.Trajectory;
import org.switchfit.sbml.SbmlReader;
import org.switchfit.util.AtomicFiles;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;
import picocli.CommandLine.Command;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/** {@code switchfit simulate}: one time course of an SBML model, written as CSV. */
@Command(name = "simulate", mixinStandardHelpOptions = true,
        footer = {"", "Examples:", "  switchfit simulate models/stress_switch.xml --times 0:1:120 --set stimulus=3 --out step3.csv", "  switchfit simulate models/stress_switch.xml --times 0,10,60 --method dp"},
        description = "Simulate an SBML model and write a CSV time course (time, then one column per species: "
                + "concentration, or amount for hasOnlySubstanceUnits species).")
public final class SimulateCommand implements Callable<Integer> {

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "MODEL", description = "SBML model file, or the folder of a finished "
            + "'switchfit fit' run (its model_fitted.xml)")
    Path model;

    @Option(names = "--times", required = true, paramLabel = "START:STEP:END|t1,t2,...",
            description = "output times, as start:step:end or a comma-separated list")
    String times;

    @Option(names = "--set", paramLabel = "ID=VALUE", description = "override a parameter, compartment size or "
            + "initial species value (repeatable)")
    Map<String, String> overrides = new java.util.LinkedHashMap<>();

    @Option(names = "--out", paramLabel = "FILE", description = "output CSV (default: standard output)")
    Path out;

    @Option(names = "--method", defaultValue = "auto", paramLabel = "bdf|dp|auto",
            description = "integration method (default: ${DEFAULT-VALUE})")
    String method;

    @Option(names = "--rtol", defaultValue = "1e-8", description = "relative tolerance (default: ${DEFAULT-VALUE})")
    double rtol;

    @Option(names = "--atol", defaultValue = "1e-12", description = "absolute tolerance (default: ${DEFAULT-VALUE})")
    double atol;

    @Override
    public Integer call() {
        double[] t = parseTimes(times);
        SolverSettings settings = settings(method, rtol, atol);
        Model m = SbmlReader.read(SwitchSetup.sbmlFile(model));
        CompiledModel cm = ModelCompiler.compile(m);
        double[] p = cm.parameterValues();
        for (Map.Entry<String, String> e : overrides.entrySet()) {
            int k = cm.parameterIndex(e.getKey());
            if (k < 0) {
                throw new UserInputException(null, String.format(Locale.ROOT, "--set %s: '%s' is not a settable "
                        + "quantity of %s (settable: %s)", e.getKey(), e.getKey(), model, abbreviate(cm.parameterIds())));
            }
            p[k] = parseDouble(e.getValue(), "--set " + e.getKey());
        }
        List<String> cols = new ArrayList<>();
        for (Species s : m.species()) {
            cols.add(s.id());
        }
        ModelOutputs outs = ModelOutputs.of(cm, cols);
        Trajectory tr;
        try {
            InitialValueCheck.require(cm, p, overrides.keySet(), "--set");
            tr = new Simulator(cm, Integrators.create(settings)).simulate(t, p, outs);
        } catch (FastEquilibriumException e) {
            throw new UserInputException(SourceLocation.ofFile(model.toString()), e.getMessage()
                    + "; check the rate law of fast reaction '" + e.reaction() + "'");
        } catch (IntegrationException e) {
            throw new UserInputException(SourceLocation.ofFile(model.toString()), e.getMessage()
                    + "; try --method bdf or looser tolerances (--rtol, --atol)");
        }
        String csv = toCsv(tr);
        if (out == null) {
            PrintWriter w = spec.commandLine().getOut();
            w.print(csv);
            w.flush();
        } else {
            AtomicFiles.writeString(out, csv);
        }
        return 0;
    }

    static String abbreviate(List<String> ids) {
        if (ids.size() <= 12) {
            return String.join(", ", ids);
        }
        return String.join(", ", ids.subList(0, 12)) + ", ...";
    }

    static SolverSettings settings(String method, double rtol, double atol) {
        SolverSettings.Method mt;
        switch (method.toLowerCase(Locale.ROOT)) {
            case "bdf":
                mt = SolverSettings.Method.BDF;
                break;
            case "dp":
                mt = SolverSettings.Method.DORMAND_PRINCE;
                break;
            case "auto":
                mt = SolverSettings.Method.AUTO;
                break;
            default:
                throw new UserInputException(null, "--method '" + method + "' is not known; use bdf, dp or auto");
        }
        if (!(rtol > 0) || !(atol > 0)) {
            throw new UserInputException(null, "--rtol and --atol must be positive; got " + rtol + " and " + atol);
        }
        return SolverSettings.defaults().withMethod(mt).withTolerances(rtol, atol);
    }

    static double parseDouble(String s, String what) {
        try {
            return Double.parseDouble(s.strip());
        } catch (NumberFormatException e) {
            throw new UserInputException(null, what + ": '" + s + "' is not a number; write e.g. 0.5 or 1e-3");
        }
    }

    /** Parses start:step:end (inclusive end within rounding) or a comma list. */
    static double[] parseTimes(String spec) {
        String s = spec.strip();
        if (s.contains(":")) {
            String[] parts = s.split(":");
            if (parts.length != 3) {
                throw new UserInputException(null, "--times '" + spec + "': expected start:step:end, e.g. 0:0.1:10");
            }
            double a = parseDouble(parts[0], "--times start");
            double h = parseDouble(parts[1], "--times step");
            double b = parseDouble(parts[2], "--times end");
            if (!(h > 0) || !(b >= a)) {
                throw new UserInputException(null, "--times '" + spec + "': need step > 0 and end >= start");
            }
            long count = (long) Math.floor((b - a) / h * (1 + 1e-12) + 1e-9) + 1;
            if (count > 10_000_000) {
                throw new UserInputException(null, "--times '" + spec + "' gives " + count + " points; use a larger "
                        + "step");
            }
            double[] t = new double[(int) count];
            for (int i = 0; i < t.length; i++) {
                t[i] = a + i * h;
            }
            return requireSimulatedRange(t, spec);
        }
        String[] parts = s.split(",");
        double[] t = new double[parts.length];
        for (int i = 0; i < t.length; i++) {
            t[i] = parseDouble(parts[i], "--times");
            if (i > 0 && t[i] < t[i - 1]) {
                throw new UserInputException(null, "--times must be non-decreasing; " + t[i] + " follows " + t[i - 1]);
            }
        }
        return requireSimulatedRange(t, spec);
    }

    /**
     * Simulations start at t = 0 with the model's initial values and run forward; a negative output time was
     * printed as if the state ran backwards from there (x(0) for x' = t at t = -2), and an infinite one repeated
     * the initial state. Both are refused.
     */
    private static double[] requireSimulatedRange(double[] t, String spec) {
        for (double v : t) {
            if (v < 0) {
                throw new UserInputException(null, "--times '" + spec + "': " + fmt(v) + " is before 0; simulations "
                        + "start at t = 0 with the model's initial values: give times >= 0");
            }
            if (!Double.isFinite(v)) {
                throw new UserInputException(null, "--times '" + spec + "': " + v + " is not a finite time; give "
                        + "finite times >= 0 (for a steady state use a late time and check it has settled)");
            }
        }
        return t;
    }

    static String toCsv(Trajectory tr) {
        StringWriter sw = new StringWriter();
        sw.append("time");
        for (String nm : tr.names()) {
            sw.append(',').append(nm);
        }
        sw.append('\n');
        for (int r = 0; r < tr.rows(); r++) {
            sw.append(fmt(tr.time(r)));
            for (int k = 0; k < tr.names().size(); k++) {
                sw.append(',').append(fmt(tr.value(r, k)));
            }
            sw.append('\n');
        }
        return sw.toString();
    }

    static String fmt(double v) {
        if (v == Math.rint(v) && Math.abs(v) < 1e15) {
            return Long.toString((long) v);
        }
        return Double.toString(v);
    }

}
