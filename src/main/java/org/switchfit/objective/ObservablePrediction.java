package org.switchfit.objective;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.Measurement;
import org.switchfit.problem.ObservableDef;
import org.switchfit.problem.SimulationExperiment;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * The model prediction {@code g(θ) = h(t, y(t; θ), q(θ))} of one observable in one experiment at one time,
 * untransformed (the observable formula itself, not its log), with the exact gradient from forward sensitivities:
 * the same simulation as the residuals of {@link LikelihoodObjective} (ExperimentSimulation:
 * initial-assignment derivatives times dp/dθ, optional pre-equilibration to steady state, staggered BDF
 * sensitivities, sensitivities carried across events and right-hand-side switches by their jump conditions) and
 * the same chain through the observable's derivatives with respect to states and parameters. Used for prediction
 * profiles (Kreutz, Raue and Timmer 2012, BMC Syst Biol 6:120, doi:10.1186/1752-0509-6-120).
 *
 * <p>Observable placeholders (observableParameters) take the values of the first measurement of that observable
 * in that experiment, so the prediction is what that data row would be compared with at time t. Time
 * {@code +inf} predicts the steady state of the experiment.
 *
 * <p>Models with events: finite times only. Models with {@code delay()} in their mathematics: none (no
 * sensitivities with a delay history). Both are refused as user errors. A failed sensitivity integration raises an
 * {@link ObjectiveException} (the residuals fall back to finite differences there; the prediction does not).
 * Immutable and thread-safe (per-thread workspaces).
 */
public final class ObservablePrediction implements Prediction {
    private final EstimationProblem problem;
    private final int observable;
    private final double time;
    private final double[] times;
    private final Measurement template;
    private final ExperimentSimulation simulation;
    private final String name;
    private final String experimentId;
    private final int np;
    private final ThreadLocal<Work> work;

    private ObservablePrediction(EstimationProblem problem, int experiment, int observable, double time,
                                 Measurement template, SolverSettings settings, SteadyState steady, String name,
                                 SourceLocation where) {
        this.problem = problem;
        this.experimentId = problem.experiments().get(experiment).id();
        this.observable = observable;
        this.time = time;
        this.times = new double[] {time};
        this.template = template;
        InitialDerivative initD = new InitialDerivative(problem.compiled().form());
        this.simulation = new ExperimentSimulation(problem, experiment, initD, settings, steady, true, where);
        this.name = name;
        this.np = problem.parameterCount();
        this.work = ThreadLocal.withInitial(Work::new);
    }

    /**
     * Parses {@code obs@t} or {@code EXPERIMENT/obs@t} and builds the prediction.
     *
     * @param spec     observable id and time, optionally preceded by an experiment id and '/'; {@code obs@t} is
     *                 allowed when exactly one experiment measures {@code obs}; t may be {@code inf}
     * @param settings integration settings (use the fit's)
     * @throws UserInputException when the text is malformed, names an unknown observable or experiment, is
     *                            ambiguous, or asks for what a model with events cannot give (see the class doc)
     */
    public static ObservablePrediction of(EstimationProblem problem, SolverSettings settings, SteadyState steady,
                                          String spec) {
        SourceLocation where = SourceLocation.ofFile(problem.problemFile().toString());
        int at = spec.lastIndexOf('@');
        if (at <= 0 || at == spec.length() - 1) {
            throw new UserInputException(where, "prediction '" + spec + "' is not of the form obs@t or "
                    + "EXPERIMENT/obs@t; write e.g. pSTAT5A@30");
        }
        String head = spec.substring(0, at);
        String tText = spec.substring(at + 1).trim();
        double t;
        try {
            t = "inf".equalsIgnoreCase(tText) ? Double.POSITIVE_INFINITY : Double.parseDouble(tText);
        } catch (NumberFormatException e) {
            throw new UserInputException(where, "prediction '" + spec + "': time '" + tText + "' is not a number;"
                    + " give a time such as 30 or inf", e);
        }
        if (!(t >= 0)) {
            throw new UserInputException(where, "prediction '" + spec + "': time " + tText + " is "
                    + (Double.isNaN(t) ? "not a number" : "negative")
                    + "; give a time >= 0, or inf for the steady state");
        }
        String expId = null;
        String obsId = head;
        int slash = head.lastIndexOf('/');
        if (slash >= 0) {
            expId = head.substring(0, slash);
            obsId = head.substring(slash + 1);
        }
        int o = -1;
        List<String> obsIds = new ArrayList<>();
        for (int k = 0; k < problem.observables().size(); k++) {
            obsIds.add(problem.observables().get(k).id());
            if (problem.observables().get(k).id().equals(obsId)) {
                o = k;
            }
        }
        if (o < 0) {
            throw new UserInputException(where, "prediction '" + spec + "': '" + obsId + "' is not an observable "
                    + "of the problem (observables: " + String.join(", ", obsIds) + ")");
        }
        List<Integer> candidates = new ArrayList<>();
        List<String> candIds = new ArrayList<>();
        for (int e = 0; e < problem.experiments().size(); e++) {
            SimulationExperiment ex = problem.experiments().get(e);
            if (expId != null && !ex.id().equals(expId)) {
                continue;
            }
            if (firstMeasurement(problem, ex, o) != null) {
                candidates.add(e);
                candIds.add(ex.id());
            }
        }
        if (candidates.isEmpty()) {
            throw new UserInputException(where, "prediction '" + spec + "': no experiment"
                    + (expId == null ? "" : " '" + expId + "'") + " measures '" + obsId + "'; name an experiment "
                    + "that has data for it");
        }
        if (candidates.size() > 1) {
            throw new UserInputException(where, "prediction '" + spec + "': '" + obsId + "' is measured in several "
                    + "experiments (" + String.join(", ", candIds) + "); write EXPERIMENT/" + obsId + "@" + tText);
        }
        boolean delays = !problem.compiled().form().delaySlots().isEmpty();
        if (problem.hasEvents() || delays) {
            if (t == Double.POSITIVE_INFINITY) {
                throw new UserInputException(where, "prediction '" + spec + "': steady-state predictions of a model "
                        + "with " + (problem.hasEvents() ? "events" : "delay()") + " are not supported; give a "
                        + "finite time");
            }
            if (delays) {
                throw new UserInputException(where, "prediction '" + spec + "': prediction profiles of a model with "
                        + "delay() are not supported (no sensitivities with a delay history); profile parameters "
                        + "only");
            }
        }
        int e = candidates.get(0);
        Measurement tmpl = firstMeasurement(problem, problem.experiments().get(e), o);
        return new ObservablePrediction(problem, e, o, t, tmpl, settings, steady, spec.trim(), where);
    }

    private static Measurement firstMeasurement(EstimationProblem problem, SimulationExperiment ex, int o) {
        for (int i : ex.measurements()) {
            Measurement me = problem.measurements().get(i);
            if (me.observable() == o) {
                return me;
            }
        }
        return null;
    }

    /** The text it was built from, e.g. {@code pSTAT5A@30}. */
    public String name() {
        return name;
    }

    /** Id of the experiment simulated. */
    public String experimentId() {
        return experimentId;
    }

    /** The prediction time (may be +inf). */
    public double time() {
        return time;
    }

    @Override
    public int parameterCount() {
        return np;
    }

    /** Per-thread arrays; every θ is a sensitivity column (a prediction is evaluated a few hundred times). */
    private final class Work {
        final ExperimentSimulation.State st = simulation.newState();
        final double[] linear = new double[np];
        final double[] dLinear = new double[np];
    }

    @Override
    public double evaluate(double[] theta, double[] gradient) {
        Work w = work.get();
        ExperimentSimulation.State st = w.st;
        // Sensitivities are integrated even without a gradient request: they take part in the step-size control,
        // so skipping them changes the steps and g by up to the integration tolerance; an optimizer comparing
        // trial values (no gradient) with accepted ones (gradient) would see that as noise.
        boolean sens = np > 0;
        for (int j = 0; j < np; j++) {
            w.linear[j] = problem.parameters().get(j).toLinear(theta[j]);
            w.dLinear[j] = problem.parameters().get(j).linearDerivative(theta[j]);
        }
        try {
            simulation.run(st, w.linear, w.dLinear, sens, times, (i, t) -> { });
        } catch (IntegrationException e) {
            throw new ObjectiveException("prediction '" + name + "': " + e.getMessage(), e);
        }
        simulation.fillQ(st, template, w.linear);
        problem.evaluateObservable(observable, time, st.y, st.q, st.out);
        double h = st.out[0];
        if (!Double.isFinite(h)) {
            throw new ObjectiveException(String.format(Locale.ROOT, "prediction '%s' is not finite (%s)", name, h));
        }
        if (gradient != null) {
            Arrays.fill(gradient, 0, np, 0.0);
            simulation.chain(st, template, observable, time, w.dLinear, sens, gradient, null);
        }
        return h;
    }

    /** The observable definition predicted. */
    public ObservableDef observable() {
        return problem.observables().get(observable);
    }
}
