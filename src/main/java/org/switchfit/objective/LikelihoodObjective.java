package org.switchfit.objective;

import java.util.ArrayList;
import java.util.List;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * The negative log-likelihood of an {@link EstimationProblem} including normalisation constants and priors, as a
 * sum of independent {@link ResidualBlock}s: one per simulation experiment (timecourses, steady-state
 * measurements; exact gradients from forward sensitivities, or central finite differences for models with events,
 * see {@link ExperimentBlock}), one for the priors, and any blocks added by callers. Immutable and thread-safe
 * (blocks keep per-thread workspaces).
 */
public final class LikelihoodObjective implements Objective {
    private final EstimationProblem problem;
    private final List<ResidualBlock> blocks;
    private final int[] offsets;
    private final int size;
    private final double constant;
    private final int priorBlock;
    private final List<OutputFactor> factors;

    private LikelihoodObjective(EstimationProblem problem, List<ResidualBlock> blocks, int priorBlock) {
        this.problem = problem;
        this.blocks = List.copyOf(blocks);
        this.offsets = new int[blocks.size()];
        int off = 0;
        double c = 0.0;
        for (int b = 0; b < blocks.size(); b++) {
            offsets[b] = off;
            off += blocks.get(b).size();
            c += blocks.get(b).constant();
        }
        this.size = off;
        this.constant = c;
        this.priorBlock = priorBlock;
        this.factors = findFactors();
    }

    /** Parameters that every block reports as a pure output factor and that no condition passes to the model. */
    private List<OutputFactor> findFactors() {
        List<OutputFactor> out = new ArrayList<>();
        boolean[] toModel = new boolean[problem.parameterCount()];
        for (org.switchfit.problem.Condition cond : problem.conditions()) {
            for (int i = 0; i < cond.targetCount(); i++) {
                toModel[cond.targetTheta(i)] = true;
            }
        }
        for (int j = 0; j < toModel.length; j++) {
            if (toModel[j]) {
                continue;
            }
            int[] idx = new int[size];
            int c = 0;
            for (int b = 0; b < blocks.size() && c >= 0; b++) {
                int[] local = blocks.get(b).factorResiduals(j);
                if (local == null) {
                    c = -1;
                } else {
                    for (int i : local) {
                        idx[c++] = offsets[b] + i;
                    }
                }
            }
            if (c > 0) {
                org.switchfit.data.ParameterScale ps = problem.parameters().get(j).scale();
                OutputFactor.Scale sc = ps == org.switchfit.data.ParameterScale.LOG10 ? OutputFactor.Scale.LOG10
                        : ps == org.switchfit.data.ParameterScale.LOG ? OutputFactor.Scale.LN
                        : OutputFactor.Scale.LINEAR;
                out.add(new OutputFactor(j, sc, java.util.Arrays.copyOf(idx, c)));
            }
        }
        return List.copyOf(out);
    }

    /**
     * The estimated parameters that enter only as factors of predictions with constant noise ({@link
     * OutputFactor}): found from the observable formulas (θ times a term free of θ, linear data, normal noise,
     * constant σ), the conditions (θ must not reach the model) and the priors (none but uniform).
     */
    @Override
    public List<OutputFactor> outputFactors() {
        return factors;
    }

    /**
     * Builds the objective with the given integration settings and the default steady-state criterion.
     *
     * @throws UserInputException when the problem's dose-response or threshold data cannot be posed
     */
    public static LikelihoodObjective of(EstimationProblem problem, SolverSettings settings) {
        return of(problem, settings, SteadyState.defaults(), List.of());
    }

    /**
     * Builds the objective.
     *
     * @param extra additional blocks; when empty, the problem's dose-response and threshold data get the blocks of
     *              {@link SwitchingBlocks}
     */
    public static LikelihoodObjective of(EstimationProblem problem, SolverSettings settings, SteadyState steady,
                                         List<ResidualBlock> extra) {
        if (extra.isEmpty() && !problem.extraData().isEmpty()) {
            extra = SwitchingBlocks.of(problem);
        }
        List<ResidualBlock> blocks = new ArrayList<>();
        InitialDerivative initD = new InitialDerivative(problem.compiled().form());
        for (int e = 0; e < problem.experiments().size(); e++) {
            blocks.add(new ExperimentBlock(problem, initD, e, settings, steady));
        }
        PriorBlock pb = new PriorBlock(problem);
        blocks.add(pb);
        int prior = blocks.size() - 1;
        blocks.addAll(extra);
        return new LikelihoodObjective(problem, blocks, prior);
    }

    /** The problem. */
    public EstimationProblem problem() {
        return problem;
    }

    /** The constant c of {@code nll = 0.5 |r|^2 + c}. */
    public double constant() {
        return constant;
    }

    @Override
    public int parameterCount() {
        return problem.parameterCount();
    }

    @Override
    public int residualCount() {
        return size;
    }

    /**
     * {@inheritDoc}
     *
     * @throws PriorSupportException when θ lies outside the support of a uniform prior (NLL +infinity)
     */
    @Override
    public double evaluate(double[] theta, double[] residuals, double[] jacobian) {
        return run(new EvaluationContext(problem, theta, null, null), residuals, jacobian, null);
    }

    /**
     * @param outside null to throw {@link PriorSupportException}; else the prior block's residuals are left 0,
     *                {@code outside[0]} receives the message and the NLL is +infinity
     */
    private double run(EvaluationContext ctx, double[] residuals, double[] jacobian, String[] outside) {
        if (jacobian != null) {
            java.util.Arrays.fill(jacobian, 0, size * problem.parameterCount(), 0.0);
        }
        for (int b = 0; b < blocks.size(); b++) {
            try {
                blocks.get(b).evaluate(ctx, residuals, offsets[b], jacobian);
            } catch (PriorSupportException e) {
                if (outside == null) {
                    throw e;
                }
                java.util.Arrays.fill(residuals, offsets[b], offsets[b] + blocks.get(b).size(), 0.0);
                outside[0] = e.getMessage();
            }
        }
        if (outside != null && outside[0] != null) {
            return Double.POSITIVE_INFINITY;
        }
        double s = 0.0;
        for (int i = 0; i < size; i++) {
            s += residuals[i] * residuals[i];
        }
        double nll = 0.5 * s + constant;
        if (!Double.isFinite(nll)) {
            throw new ObjectiveException("the negative log-likelihood is not finite (" + nll + ")");
        }
        return nll;
    }

    /**
     * Evaluates at θ and returns the simulated observable values and noise spreads per measurement (problem
     * order), the NLL and its prior part. Outside the support of a uniform prior the simulations are still
     * returned, with NLL and prior part +infinity and the reason in {@link Evaluation#outsidePrior()}.
     */
    public Evaluation evaluateDetailed(double[] theta) {
        int nm = problem.measurements().size();
        double[] sim = new double[nm];
        double[] sig = new double[nm];
        java.util.Arrays.fill(sim, Double.NaN);
        java.util.Arrays.fill(sig, Double.NaN);
        double[] r = new double[size];
        List<SwitchingFit> switching = new ArrayList<>();
        String[] outside = new String[1];
        double nll = run(new EvaluationContext(problem, theta, sim, sig, switching), r, null, outside);
        ResidualBlock pb = blocks.get(priorBlock);
        double prior = pb.constant();
        for (int i = offsets[priorBlock]; i < offsets[priorBlock] + pb.size(); i++) {
            prior += 0.5 * r[i] * r[i];
        }
        if (outside[0] != null) {
            prior = Double.POSITIVE_INFINITY;
        }
        return new Evaluation(nll, prior, r, sim, sig, List.copyOf(switching), outside[0]);
    }

    /**
     * The states of one simulation experiment at the given times, simulated exactly as for the residuals (initial
     * values, pre-equilibration, right-hand-side switches and events through the simulator), without
     * sensitivities; for plotting fitted curves on a grid finer than the data. Thread-safe.
     *
     * @param experiment index into {@code problem().experiments()}
     * @param theta      parameters on the estimation scale, length {@link #parameterCount()}
     * @param times      nondecreasing times; +inf (steady state) only for models without events or delay()
     * @return the state at each time and the effective parameters p_eff of the simulation condition
     * @throws org.switchfit.ode.IntegrationException when the integration fails or no steady state is reached
     */
    public ExperimentStates experimentStates(int experiment, double[] theta, double[] times) {
        int ne = problem.experiments().size();
        if (experiment < 0 || experiment >= ne || theta.length != problem.parameterCount()) {
            throw new IllegalArgumentException("experiment must be in [0, " + ne + ") and theta needs "
                    + problem.parameterCount() + " values; got " + experiment + " and " + theta.length);
        }
        for (int i = 0; i < times.length; i++) {
            if (Double.isNaN(times[i]) || times[i] == Double.NEGATIVE_INFINITY || i > 0 && times[i] < times[i - 1]) {
                throw new IllegalArgumentException("times must be nondecreasing, not NaN or -inf; got " + times[i]
                        + " at index " + i);
            }
        }
        // of() adds one block per experiment, in order, before the prior block
        if (experiment >= priorBlock || !(blocks.get(experiment) instanceof ExperimentBlock block)) {
            throw new IllegalStateException("block " + experiment + " is not the block of experiment "
                    + problem.experiments().get(experiment).id());
        }
        double[][] y = new double[times.length][];
        double[][] pAt = new double[times.length][];
        block.states(problem.toLinear(theta), times, y, pAt);
        return new ExperimentStates(y, pAt);
    }

    /**
     * States of one experiment ({@link #experimentStates}).
     *
     * @param states       {@code states[i]} the state vector at the i-th requested time
     * @param parametersAt {@code parametersAt[i]} p_eff at the i-th requested time (declared parameters after initial
     *                     assignments, as the observable formulas read them; doses of parameters change it)
     */
    public record ExperimentStates(double[][] states, double[][] parametersAt) {

        /** p_eff at the first requested time (the simulation condition's, when no dose came before it). */
        public double[] effectiveParameters() {
            return parametersAt[0];
        }
    }

    /**
     * One detailed evaluation.
     *
     * @param nll       negative log-likelihood including priors
     * @param priorPart the priors' share of nll
     * @param residuals all residuals
     * @param simulated simulated observable value per measurement (untransformed)
     * @param sigmas    noise spread per measurement (on the transformed scale)
     * @param switching the switching-threshold and dose-response data with the model's values, in block order
     *                  (thresholds per experiment, control and direction; dose responses per history, by dose)
     * @param outsidePrior  null, or why nll is +infinity: which parameter lies outside its uniform prior's support
     */
    public record Evaluation(double nll, double priorPart, double[] residuals, double[] simulated,
                             double[] sigmas, List<SwitchingFit> switching, String outsidePrior) {
    }
}
