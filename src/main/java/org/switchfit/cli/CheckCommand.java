package org.switchfit.cli;

import java.io.PrintWriter;
import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import org.switchfit.data.DoseResponsePoint;
import org.switchfit.data.SwitchingThreshold;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.report.DataCounts;
import org.switchfit.report.Json;
import org.switchfit.util.AtomicFiles;
import picocli.CommandLine.Command;
import picocli.CommandLine.Mixin;
import picocli.CommandLine.Option;
import picocli.CommandLine.Parameters;
import picocli.CommandLine.Spec;

/**
 * {@code switchfit check}: validates a problem, evaluates the negative log-likelihood at the nominal parameters and
 * compares every simulated observable with a reference simulation table. Exit code 0 when everything matches (or no
 * reference exists), 3 when some simulated value differs from the reference.
 */
@Command(name = "check", mixinStandardHelpOptions = true,
        footer = {"", "Examples:", "  switchfit check datasets/stress_switch.yaml", "  switchfit check problem.yaml --json check.json --simulations simulated.tsv"},
        description = "Validate a problem (PEtab YAML or switchfit problem file), evaluate the negative "
                + "log-likelihood at the nominal parameter values and compare simulations with the reference "
                + "simulatedData table when there is one.",
        exitCodeListHeading = "%nExit codes:%n",
        exitCodeList = {"0:everything matches the reference (or there is none)",
            "3:some simulated value differs from the reference table",
            "2:user error in the problem (one line on stderr: what, where, what to do)",
            "1:internal failure"})
public final class CheckCommand implements Callable<Integer> {
    /** Exit code when simulations differ from the reference. */
    static final int EXIT_MISMATCH = 3;

    @Spec
    picocli.CommandLine.Model.CommandSpec spec;

    @Parameters(index = "0", paramLabel = "PROBLEM.yaml", description = "problem file")
    Path problem;

    @Option(names = "--json", paramLabel = "FILE", description = "write the results as JSON")
    Path json;

    @Option(names = "--simulations", paramLabel = "FILE",
            description = "write the measurement table(s) with a simulation column (TSV; the rows of all "
                    + "measurement files, in file order)")
    Path simulations;

    @Option(names = "--reference", paramLabel = "FILE",
            description = "reference simulation table (default: simulatedData*.tsv beside the problem file)")
    Path reference;

    @Mixin
    ToleranceOptions tolerances;

    @Override
    public Integer call() {
        SolverSettings settings = tolerances.settings();
        CheckRun run = new CheckRun(problem, reference, settings, spec.commandLine().getErr());
        PrintWriter out = spec.commandLine().getOut();
        Map<String, Object> j = run.json;
        DataCounts counts = counts(run.problem);
        j.put("doseResponsePoints", counts.doseResponse());
        j.put("thresholds", counts.thresholds());
        out.printf(Locale.ROOT, "%s: %s; %d estimated parameters%n", problem, counts.summary(),
                run.problem.parameterCount());
        out.printf(Locale.ROOT, "negative log-likelihood at nominal values: %.10g (priors %.6g)%n",
                run.evaluation.nll(), run.evaluation.priorPart());
        if (run.evaluation.outsidePrior() != null) {
            out.printf(Locale.ROOT, "note: %s; move its nominalValue into the support or correct the prior%n",
                    run.evaluation.outsidePrior());
        }
        FitCommand.printThresholds(out, run.evaluation.switching());
        if (run.reference != null) {
            out.printf(Locale.ROOT, "reference %s: %d of %d match; max abs deviation %.3g, max rel deviation %s "
                    + "(over nonzero references)%n", run.reference.getFileName(), j.get("matched"),
                    run.problem.measurements().size(), j.get("maxAbsDeviation"),
                    CheckRun.relative(j.get("maxRelDeviation")));
            @SuppressWarnings("unchecked")
            List<Map<String, Object>> obs = (List<Map<String, Object>>) j.get("observables");
            for (Map<String, Object> o : obs) {
                if (((Integer) o.get("mismatches")) > 0) {
                    out.printf(Locale.ROOT, "  observable %s: %d of %d differ (max abs %.3g, max rel %s)%n",
                            o.get("id"), o.get("mismatches"), o.get("measurements"), o.get("maxAbsDeviation"),
                            CheckRun.relative(o.get("maxRelDeviation")));
                }
            }
        } else {
            out.println("no reference simulation table found");
        }
        out.flush();
        if (json != null) {
            Json.write(json, j);
        }
        if (simulations != null) {
            AtomicFiles.writeString(simulations, run.simulationsTsv());
        }
        return run.allMatch() ? 0 : EXIT_MISMATCH;
    }

    /** The data of each kind in {@code p}: measurement-table rows, dose-response points, switching thresholds. */
    static DataCounts counts(EstimationProblem p) {
        int dose = 0;
        int thresholds = 0;
        for (Object o : p.extraData()) {
            if (o instanceof DoseResponsePoint) {
                dose++;
            } else if (o instanceof SwitchingThreshold) {
                thresholds++;
            }
        }
        return new DataCounts(p.measurements().size(), dose, thresholds);
    }
}
