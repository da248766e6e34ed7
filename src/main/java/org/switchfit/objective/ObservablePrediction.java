package org.switchfit.objective;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.SolverSettings;
import org.switchfit.ode.bdf.BdfIntegrator;
import org.switchfit.ode.bdf.BdfSession;
import org.switchfit.problem.Condition;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.Measurement;
import org.switchfit.problem.ObservableDef;
import org.switchfit.problem.SimulationExperiment;
import org.switchfit.problem.ValueSource;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * The model prediction {@code g(θ) = h(t, y(t; θ), q(θ))} of one observable in one experiment at one time,
 * untransformed (the observable formula itself, not its log), with the exact gradient from forward sensitivities:
 * the same chain as the residuals of {@link LikelihoodObjective} (initial-assignment derivatives times dp/dθ, optional
 * pre-equilibration to steady state, staggered BDF sensitivities through {@link ThetaSystem}, observable
 * derivatives with respect to states and parameters). Used for prediction profiles (Kreutz, Raue and Timmer 2012,
 * BMC Syst Biol 6:120, doi:10.1186/1752-0509-6-120).
 *
 * <p>Observable placeholders (observableParameters) take the values of the first measurement of that observable
 * in that experiment, so the prediction is what that data row would be compared with at time t. Time
 * {@code +inf} predicts the steady state of the experiment.
 *
 * <p>Partial: models with events are rejected (this class integrates sensitivities without event jumps; the
 * residual gradients of such models do handle events). Immutable and thread-safe (per-thread workspaces).
 */
public final class ObservablePrediction implements Prediction {
    private final EstimationProblem problem;
    private final CompiledModel model;
    private final InitialDerivative initD;
    private final Condition sim;
    private final Condition pre;
    private final int observable;
    private final double time;
    private final Measurement template;
    private final BdfIntegrator integrator;
    private final SteadyState steady;
    private final String name;
    private final String experimentId;
    private final int n;
    private final int m;
    private final int np;
    private final ThreadLocal<Work> work;

    private ObservablePrediction(EstimationProblem problem, int experiment, int observable, double time,
                                 Measurement template, SolverSettings settings, SteadyState steady, String name) {
        this.problem = problem;
        this.model = problem.compiled();
        this.initD = new InitialDerivative(model.form());
        SimulationExperiment exp = problem.experiments().get(experiment);
        this.experimentId = exp.id();
        this.sim = problem.conditions().get(exp.condition());
        this.pre = exp.preequilibration() >= 0 ? problem.conditions().get(exp.preequilibration()) : null;
        this.observable = observable;
        this.time = time;
        this.template = template;
        this.integrator = BdfIntegrator.of(settings);
        this.steady = steady;
        this.name = name;
        this.n = model.stateCount();
        this.m = model.parameterCount();
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
     *                            ambiguous, or the model has events
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
            throw new UserInputException(where, "prediction '" + spec + "': time must be >= 0");
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
        if (problem.hasEvents()) {
            throw new UserInputException(where, "prediction '" + spec + "': prediction profiles of models with "
                    + "events are not supported yet; profile parameters only");
        }
        int e = candidates.get(0);
        Measurement tmpl = firstMeasurement(problem, problem.experiments().get(e), o);
        return new ObservablePrediction(problem, e, o, t, tmpl, settings, steady, spec.trim());
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
        final double[] linear = new double[np];
        final double[] dLinear = new double[np];
        final double[] y = new double[n];
        final double[] yAux = new double[n];
        final double[] pDecl = new double[m];
        final double[] pEff = new double[m + np];
        final double[] pEffPre = new double[m + np];
        final double[] s = new double[np * n];
        final double[] sAux = new double[np * n];
        final double[] dPeff = new double[m * Math.max(np, 1)];
        final double[] dPeffPre = new double[m * Math.max(np, 1)];
        final double[] initVals = new double[initD.size()];
        final int[] kCol = new int[m];
        final double[] kFac = new double[m];
        final double[] q = new double[problem.qLength()];
        final double[] out = new double[2];
        final double[] deriv = new double[problem.observableDerivativeCount(observable)];
        final int[] derivRows = problem.observableDerivativeRows(observable);
        final int[] derivCols = problem.observableDerivativeCols(observable);
        final ThetaSystem sys = new ThetaSystem(model, np);
        final int[] sensParams = new int[np];

        Work() {
            Arrays.fill(kCol, -1);
            for (int c = 0; c < np; c++) {
                sensParams[c] = m + c;
            }
        }
    }

    @Override
    public double evaluate(double[] theta, double[] gradient) {
        Work w = work.get();
        // Sensitivities are integrated even without a gradient request: they take part in the step-size control,
        // so skipping them changes the steps and g by up to the integration tolerance; an optimizer comparing
        // trial values (no gradient) with accepted ones (gradient) would see that as noise.
        boolean sens = np > 0;
        for (int j = 0; j < np; j++) {
            w.linear[j] = problem.parameters().get(j).toLinear(theta[j]);
            w.dLinear[j] = problem.parameters().get(j).linearDerivative(theta[j]);
        }
        try {
            if (pre != null) {
                initial(w, pre, sens, w.y, w.pEffPre, w.s, w.dPeffPre);
                if (sens) {
                    w.sys.setColumns(w.dPeffPre);
                }
                BdfSession ses = integrator.start(w.sys, 0.0, w.y, w.pEffPre, null, sens ? w.sensParams : null,
                        sens ? w.s : null);
                steady.run(ses, model, w.pEffPre, w.y, sens ? w.s : null, "pre-equilibration condition '"
                        + pre.id() + "'");
                initial(w, sim, sens, w.yAux, w.pEff, w.sAux, w.dPeff);
                for (int i : sim.reinit()) {
                    w.y[i] = w.yAux[i];
                    if (sens) {
                        for (int c = 0; c < np; c++) {
                            w.s[c * n + i] = w.sAux[c * n + i];
                        }
                    }
                }
            } else {
                initial(w, sim, sens, w.y, w.pEff, w.s, w.dPeff);
            }
            if (sens) {
                w.sys.setColumns(w.dPeff);
            }
            if (time > 0) {
                BdfSession ses = integrator.start(w.sys, 0.0, w.y, w.pEff, null, sens ? w.sensParams : null,
                        sens ? w.s : null);
                if (time == Double.POSITIVE_INFINITY) {
                    steady.run(ses, model, w.pEff, w.y, sens ? w.s : null, "condition '" + sim.id() + "'");
                } else {
                    ses.advance(time, w.y, sens ? w.s : null);
                }
            }
        } catch (IntegrationException e) {
            throw new ObjectiveException("prediction '" + name + "': " + e.getMessage(), e);
        }
        System.arraycopy(w.pEff, 0, w.q, 0, m);
        fillQ(w.q, w.linear);
        problem.evaluateObservable(observable, time, w.y, w.q, w.out);
        double h = w.out[0];
        if (!Double.isFinite(h)) {
            throw new ObjectiveException(String.format(Locale.ROOT, "prediction '%s' is not finite (%s)", name, h));
        }
        if (gradient != null) {
            Arrays.fill(gradient, 0, np, 0.0);
            chain(w, sens, gradient);
        }
        return h;
    }

    /** As in the residual blocks: y0, p_eff and (when sens) dy0/dθ, dp_eff/dθ for condition c, all θ columns. */
    private void initial(Work w, Condition c, boolean sens, double[] y, double[] pEff, double[] s, double[] dPeff) {
        c.declared(w.linear, w.pDecl);
        double[] pe = new double[m];
        model.initialValues(0.0, w.pDecl, y, pe);
        System.arraycopy(pe, 0, pEff, 0, m);
        if (!sens) {
            return;
        }
        Arrays.fill(s, 0, np * n, 0.0);
        Arrays.fill(dPeff, 0, m * np, 0.0);
        for (int i = 0; i < c.targetCount(); i++) {
            w.kCol[c.target(i)] = c.targetTheta(i);
            w.kFac[c.target(i)] = w.dLinear[c.targetTheta(i)];
        }
        initD.evaluate(y, w.pDecl, w.initVals);
        int[] r = initD.rows;
        int[] k = initD.cols;
        for (int e = 0; e < r.length; e++) {
            int col = w.kCol[k[e]];
            if (col < 0) {
                continue;
            }
            double v = w.initVals[e] * w.kFac[k[e]];
            if (r[e] < n) {
                s[col * n + r[e]] += v;
            } else {
                dPeff[(r[e] - n) * np + col] += v;
            }
        }
        for (int i = 0; i < c.targetCount(); i++) {
            w.kCol[c.target(i)] = -1;
        }
    }

    private void fillQ(double[] q, double[] linear) {
        List<ValueSource> g = problem.globalSources();
        for (int i = 0; i < g.size(); i++) {
            q[m + i] = g.get(i).value(linear);
        }
        int oOff = problem.obsPlaceholderOffset();
        for (int i = 0; i < template.obsParameters().size(); i++) {
            q[oOff + i] = template.obsParameters().get(i).value(linear);
        }
        int nOff = problem.noisePlaceholderOffset();
        for (int i = 0; i < template.noiseParameters().size(); i++) {
            q[nOff + i] = template.noiseParameters().get(i).value(linear);
        }
    }

    /** dh/dθ = ∂h/∂y · dy/dθ + ∂h/∂p_eff · dp_eff/dθ + ∂h/∂(placeholders, globals) · dx/dθ. */
    private void chain(Work w, boolean sens, double[] grad) {
        problem.evaluateObservableDerivatives(observable, time, w.y, w.q, w.deriv);
        int gOff = m;
        int oOff = problem.obsPlaceholderOffset();
        int nOff = problem.noisePlaceholderOffset();
        for (int e = 0; e < w.deriv.length; e++) {
            double v = w.deriv[e];
            if (v == 0.0 || w.derivRows[e] != 0) {
                continue;
            }
            int var = w.derivCols[e];
            if (var < n) {
                if (sens) {
                    for (int c = 0; c < np; c++) {
                        grad[c] += v * w.s[c * n + var];
                    }
                }
                continue;
            }
            int k = var - n;
            if (k < gOff) {
                if (sens) {
                    for (int c = 0; c < np; c++) {
                        grad[c] += v * w.dPeff[k * np + c];
                    }
                }
                continue;
            }
            ValueSource src;
            if (k < oOff) {
                src = problem.globalSources().get(k - gOff);
            } else if (k < nOff) {
                src = template.obsParameters().get(k - oOff);
            } else {
                // noise placeholders do not enter h
                continue;
            }
            if (src.isTheta()) {
                grad[src.thetaIndex()] += v * w.dLinear[src.thetaIndex()];
            }
        }
    }

    /** The observable definition predicted. */
    public ObservableDef observable() {
        return problem.observables().get(observable);
    }
}
