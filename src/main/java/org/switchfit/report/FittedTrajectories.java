package org.switchfit.report;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.TreeSet;
import org.switchfit.model.OdeForm;
import org.switchfit.objective.ObjectiveException;
import org.switchfit.objective.SteadyState;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.Integrator;
import org.switchfit.ode.Integrators;
import org.switchfit.ode.ModelOutputs;
import org.switchfit.ode.Simulator;
import org.switchfit.ode.SolverSettings;
import org.switchfit.ode.Trajectory;
import org.switchfit.problem.Condition;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.Measurement;
import org.switchfit.problem.ObservableDef;
import org.switchfit.problem.SimulationExperiment;
import org.switchfit.problem.ValueSource;

/**
 * Computes the content of {@code trajectories.json} from an {@link EstimationProblem} at a parameter vector θ:
 * each experiment is simulated once on a fine time grid (uniform over [0, last finite measurement time], merged
 * with the measurement times), the same way the likelihood does (pre-equilibration to steady state, re-initialised
 * states, SBML events through {@link Simulator}), and each observable with data in it is evaluated on the grid.
 * The fitted call is at the end of {@code switchfit fit}; prediction bands are added later by the profile command.
 *
 * <p>Conventions. Observable placeholders on the grid take the values of the first measurement of that observable
 * in the experiment (placeholders that change between time points of one observable are not drawn faithfully).
 * Data standard deviations are reported on the untransformed scale: σ for linear observables, {@code value · σ}
 * for log and {@code value · ln 10 · σ} for log10 (first-order propagation); a Laplace scale b is reported as its
 * standard deviation √2·b. Steady-state measurements (time +∞) are left out of the data arrays, and experiments
 * with only such measurements get a single grid point at t = 0. Stateless.
 */
public final class FittedTrajectories {
    private FittedTrajectories() {
    }

    /** Default number of uniform grid points per experiment. */
    public static final int DEFAULT_GRID = 201;

    /**
     * Fitted observables of every experiment at θ.
     *
     * @param problem    the problem
     * @param theta      parameters on the estimation scale (as a fit reports them), length
     *                   {@code problem.parameterCount()}
     * @param settings   integration settings (use those of the fit)
     * @param gridPoints number of uniform grid points per experiment, at least 2
     * @return the file content, without prediction bands
     * @throws ObjectiveException when a simulation fails (names the experiment)
     */
    public static TrajectoriesFile compute(EstimationProblem problem, double[] theta, SolverSettings settings,
                                           int gridPoints) {
        if (theta.length != problem.parameterCount() || gridPoints < 2) {
            throw new IllegalArgumentException("theta needs " + problem.parameterCount() + " values and gridPoints "
                    + ">= 2; got " + theta.length + " and " + gridPoints);
        }
        double[] linear = problem.toLinear(theta);
        List<TrajectoriesFile.Experiment> out = new ArrayList<>();
        for (SimulationExperiment e : problem.experiments()) {
            out.add(experiment(problem, e, linear, settings, gridPoints));
        }
        return new TrajectoriesFile(null, out);
    }

    private static TrajectoriesFile.Experiment experiment(EstimationProblem problem, SimulationExperiment e,
                                                          double[] linear, SolverSettings settings, int gridPoints) {
        int[] rows = e.measurements();
        double tMax = 0.0;
        TreeSet<Double> times = new TreeSet<>();
        Map<Integer, List<Measurement>> byObs = new LinkedHashMap<>();
        for (int r : rows) {
            Measurement me = problem.measurements().get(r);
            byObs.computeIfAbsent(me.observable(), k -> new ArrayList<>()).add(me);
            if (Double.isFinite(me.time())) {
                tMax = Math.max(tMax, me.time());
                times.add(me.time());
            }
        }
        for (int i = 0; i < gridPoints; i++) {
            times.add(tMax * i / (gridPoints - 1));
        }
        double[] grid = times.stream().mapToDouble(Double::doubleValue).toArray();
        Simulation sim;
        try {
            sim = simulate(problem, e, linear, settings, grid);
        } catch (IntegrationException ex) {
            throw new ObjectiveException("experiment '" + e.id() + "': fitted trajectory could not be computed: "
                    + ex.getMessage(), ex);
        }
        List<TrajectoriesFile.Observable> obs = new ArrayList<>();
        double[] q = new double[problem.qLength()];
        double[] hs = new double[2];
        int m = problem.compiled().parameterCount();
        for (Map.Entry<Integer, List<Measurement>> en : byObs.entrySet()) {
            int o = en.getKey();
            ObservableDef od = problem.observables().get(o);
            List<Measurement> ms = en.getValue();
            fillQ(problem, q, sim.pEff, m, ms.get(0), linear);
            double[] fitted = new double[grid.length];
            for (int k = 0; k < grid.length; k++) {
                problem.evaluateObservable(o, grid[k], sim.y[k], q, hs);
                fitted[k] = hs[0];
            }
            List<double[]> data = new ArrayList<>();
            for (Measurement me : ms) {
                if (!Double.isFinite(me.time())) {
                    continue;
                }
                int k = Arrays.binarySearch(grid, me.time());
                fillQ(problem, q, sim.pEff, m, me, linear);
                problem.evaluateObservable(o, me.time(), sim.y[k], q, hs);
                double sigma = Double.isFinite(me.fixedSigma()) ? me.fixedSigma() : hs[1];
                data.add(new double[] {me.time(), me.value(), untransformedSd(od, me.value(), sigma)});
            }
            obs.add(new TrajectoriesFile.Observable(od.id(), grid, fitted, null, null, column(data, 0),
                    column(data, 1), column(data, 2)));
        }
        return new TrajectoriesFile.Experiment(e.id(), obs);
    }

    /** Standard deviation on the untransformed scale (first-order propagation; Laplace b -> sqrt(2) b). */
    static double untransformedSd(ObservableDef od, double value, double sigma) {
        double sd = od.noise() == ObservableDef.Noise.LAPLACE ? Math.sqrt(2.0) * sigma : sigma;
        switch (od.transformation()) {
            case LOG:
                return Math.abs(value) * sd;
            case LOG10:
                return Math.abs(value) * Math.log(10.0) * sd;
            default:
                return sd;
        }
    }

    private static void fillQ(EstimationProblem problem, double[] q, double[] pEff, int m, Measurement me,
                              double[] linear) {
        System.arraycopy(pEff, 0, q, 0, m);
        List<ValueSource> g = problem.globalSources();
        for (int i = 0; i < g.size(); i++) {
            q[m + i] = g.get(i).value(linear);
        }
        int oOff = problem.obsPlaceholderOffset();
        for (int i = 0; i < me.obsParameters().size(); i++) {
            q[oOff + i] = me.obsParameters().get(i).value(linear);
        }
        int nOff = problem.noisePlaceholderOffset();
        for (int i = 0; i < me.noiseParameters().size(); i++) {
            q[nOff + i] = me.noiseParameters().get(i).value(linear);
        }
    }

    /** States at each grid time and the effective parameters of the simulation condition. */
    private record Simulation(double[][] y, double[] pEff) {
    }

    private static Simulation simulate(EstimationProblem problem, SimulationExperiment e, double[] linear,
                                       SolverSettings settings, double[] grid) {
        CompiledModel model = problem.compiled();
        int n = model.stateCount();
        int m = model.parameterCount();
        Condition simC = problem.conditions().get(e.condition());
        double[] pDecl = new double[m];
        double[] pEff = new double[m];
        double[] y = new double[n];
        double[][] ys = new double[grid.length][];
        Integrator integrator = Integrators.create(settings);
        simC.declared(linear, pDecl);
        if (problem.hasEvents()) {
            // same route as the likelihood for models with events (which has no pre-equilibration for them)
            model.initialValues(0.0, pDecl, y, pEff);
            Trajectory tr = new Simulator(model, integrator).simulate(grid, pDecl, stateOutputs(model));
            for (int k = 0; k < grid.length; k++) {
                ys[k] = new double[n];
                for (int i = 0; i < n; i++) {
                    ys[k][i] = tr.value(k, i);
                }
            }
            return new Simulation(ys, pEff);
        }
        if (e.preequilibration() >= 0) {
            Condition pre = problem.conditions().get(e.preequilibration());
            double[] pDeclPre = new double[m];
            double[] pEffPre = new double[m];
            pre.declared(linear, pDeclPre);
            model.initialValues(0.0, pDeclPre, y, pEffPre);
            IntegrationSession ses = integrator.start(model, 0.0, y, pEffPre, null, null, null);
            toSteadyState(ses, model, pEffPre, y, "pre-equilibration condition '" + pre.id() + "'");
            double[] y0 = new double[n];
            model.initialValues(0.0, pDecl, y0, pEff);
            for (int i : simC.reinit()) {
                y[i] = y0[i];
            }
        } else {
            model.initialValues(0.0, pDecl, y, pEff);
        }
        IntegrationSession ses = null;
        double t = 0.0;
        for (int k = 0; k < grid.length; k++) {
            if (grid[k] > t) {
                if (ses == null) {
                    ses = integrator.start(model, t, y, pEff, null, null, null);
                }
                ses.advance(grid[k], y, null);
                t = grid[k];
            }
            ys[k] = y.clone();
        }
        return new Simulation(ys, pEff);
    }

    /** Same criterion as the likelihood's {@link SteadyState#defaults()}: growing intervals until |f| is small. */
    private static void toSteadyState(IntegrationSession ses, CompiledModel model, double[] p, double[] y,
                                      String what) {
        SteadyState crit = SteadyState.defaults();
        int n = model.stateCount();
        double[] f = new double[n];
        double t = ses.time();
        double dt = 1.0;
        while (true) {
            model.rhs(t, y, p, f);
            double worst = 0.0;
            for (int i = 0; i < n; i++) {
                worst = Math.max(worst, Math.abs(f[i]) / (crit.atol() + crit.rtol() * Math.abs(y[i])));
            }
            if (worst <= 1.0) {
                return;
            }
            if (t >= crit.maxTime()) {
                throw new IntegrationException(t, String.format(Locale.ROOT, "%s: no steady state up to t = %.3g",
                        what, t));
            }
            t = ses.advance(t + dt, y, null);
            dt *= 10.0;
        }
    }

    private static ModelOutputs stateOutputs(CompiledModel model) {
        List<String> names = new ArrayList<>();
        OdeForm f = model.form();
        for (int i = 0; i < model.stateCount(); i++) {
            OdeForm.StateKind k = f.stateKind(i);
            String id = f.stateIds().get(i);
            names.add(k == OdeForm.StateKind.SPECIES_AMOUNT ? "amount(" + id + ")"
                    : k == OdeForm.StateKind.SPECIES_CONCENTRATION ? "concentration(" + id + ")" : id);
        }
        return ModelOutputs.of(model, names);
    }

    private static double[] column(List<double[]> rows, int c) {
        double[] a = new double[rows.size()];
        for (int i = 0; i < a.length; i++) {
            a[i] = rows.get(i)[c];
        }
        return a;
    }
}
