package org.switchfit.report;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.TreeSet;
import org.switchfit.objective.LikelihoodObjective;
import org.switchfit.objective.ObjectiveException;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.Measurement;
import org.switchfit.problem.ObservableDef;
import org.switchfit.problem.SimulationExperiment;
import org.switchfit.problem.ValueSource;

/**
 * Computes the content of {@code trajectories.json} from an {@link EstimationProblem} at a parameter vector θ:
 * each experiment is simulated once on a fine time grid (uniform over [0, last finite measurement time], merged
 * with the measurement times), by the likelihood's own experiment simulation ({@link
 * LikelihoodObjective#experimentStates}: pre-equilibration to steady state, re-initialised states, right-hand-side
 * switches and SBML events through the simulator), and each observable with data in it is evaluated on the grid.
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
     * Fitted observables of every experiment at θ, simulated by a new {@link LikelihoodObjective} of the problem
     * (use {@link #compute(LikelihoodObjective, double[], int)} when one exists).
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
        return compute(LikelihoodObjective.of(problem, settings), theta, gridPoints);
    }

    /**
     * Fitted observables of every experiment at θ, with the states simulated by the objective's own experiment
     * simulation ({@link LikelihoodObjective#experimentStates}).
     *
     * @param objective  the negative log-likelihood of the fit (its problem and integration settings)
     * @param theta      parameters on the estimation scale (as a fit reports them), length
     *                   {@code objective.parameterCount()}
     * @param gridPoints number of uniform grid points per experiment, at least 2
     * @return the file content, without prediction bands
     * @throws ObjectiveException when a simulation fails (names the experiment)
     */
    public static TrajectoriesFile compute(LikelihoodObjective objective, double[] theta, int gridPoints) {
        EstimationProblem problem = objective.problem();
        if (theta.length != problem.parameterCount() || gridPoints < 2) {
            throw new IllegalArgumentException("theta needs " + problem.parameterCount() + " values and gridPoints "
                    + ">= 2; got " + theta.length + " and " + gridPoints);
        }
        double[] linear = problem.toLinear(theta);
        List<TrajectoriesFile.Experiment> out = new ArrayList<>();
        for (int e = 0; e < problem.experiments().size(); e++) {
            out.add(experiment(objective, e, theta, linear, gridPoints));
        }
        return new TrajectoriesFile(null, out);
    }

    private static TrajectoriesFile.Experiment experiment(LikelihoodObjective objective, int index, double[] theta,
                                                          double[] linear, int gridPoints) {
        EstimationProblem problem = objective.problem();
        SimulationExperiment e = problem.experiments().get(index);
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
        LikelihoodObjective.ExperimentStates sim;
        try {
            sim = objective.experimentStates(index, theta, grid);
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
            double[] fitted = new double[grid.length];
            for (int k = 0; k < grid.length; k++) {
                fillQ(problem, q, sim.parametersAt()[k], m, ms.get(0), linear);
                problem.evaluateObservable(o, grid[k], sim.states()[k], q, hs);
                fitted[k] = hs[0];
            }
            List<double[]> data = new ArrayList<>();
            for (Measurement me : ms) {
                if (!Double.isFinite(me.time())) {
                    continue;
                }
                int k = Arrays.binarySearch(grid, me.time());
                fillQ(problem, q, sim.parametersAt()[k], m, me, linear);
                problem.evaluateObservable(o, me.time(), sim.states()[k], q, hs);
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
        problem.fillPlaceholders(q, me, linear);
    }

    private static double[] column(List<double[]> rows, int c) {
        double[] a = new double[rows.size()];
        for (int i = 0; i < a.length; i++) {
            a[i] = rows.get(i)[c];
        }
        return a;
    }
}
