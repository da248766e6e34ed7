package org.switchfit.problem;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.switchfit.expr.Block;
import org.switchfit.expr.BlockCompiler;
import org.switchfit.expr.CompiledBlock;
import org.switchfit.expr.Derivative;
import org.switchfit.expr.Expr;
import org.switchfit.model.Model;
import org.switchfit.model.OdeForm;
import org.switchfit.ode.CompiledModel;

/**
 * A parameter-estimation problem joined to its model: estimated parameters θ, simulation conditions (declared
 * parameter vectors as functions of θ), experiments (pre-equilibration + simulation), observables and
 * measurements. Built by {@link ProblemLoader} from either problem format. Immutable and thread-safe.
 *
 * <p><b>Extended parameter vector q</b> used by observables: {@code q = [p_eff (m) | globals (G) |
 * observable placeholders (P) | noise placeholders (N)]}: p_eff the model's effective parameters, then the
 * problem-level parameters that observable or noise formulas use directly ({@link #globalIds()}, values from
 * {@link #globalSources()}), then the per-measurement placeholder values. Observable derivative layout:
 * variables are the n states followed by the q entries.
 */
public final class EstimationProblem {
    private final Path problemFile;
    private final List<Path> inputFiles;
    private final Path modelFile;
    private final Model model;
    private final CompiledModel compiled;
    private final List<FreeParameter> parameters;
    private final List<Condition> conditions;
    private final List<SimulationExperiment> experiments;
    private final List<ObservableDef> observables;
    private final List<Measurement> measurements;
    private final List<String> globalIds;
    private final List<ValueSource> globalSources;
    private final int maxObs;
    private final int maxNoise;
    private final List<Object> extraData;
    private final List<String> notes;
    private final CompiledBlock[] obsValues;
    private final CompiledBlock[] obsDerivs;
    private final int[][] obsDerivRows;
    private final int[][] obsDerivCols;

    EstimationProblem(Path problemFile, List<Path> inputFiles, Path modelFile, Model model, CompiledModel compiled,
                      List<FreeParameter> parameters, List<Condition> conditions,
                      List<SimulationExperiment> experiments, List<ObservableDef> observables,
                      List<Measurement> measurements, List<String> globalIds, List<ValueSource> globalSources,
                      int maxObs, int maxNoise, List<Object> extraData) {
        this(problemFile, inputFiles, modelFile, model, compiled, parameters, conditions, experiments, observables,
                measurements, globalIds, globalSources, maxObs, maxNoise, extraData, List.of());
    }

    EstimationProblem(Path problemFile, List<Path> inputFiles, Path modelFile, Model model, CompiledModel compiled,
                      List<FreeParameter> parameters, List<Condition> conditions,
                      List<SimulationExperiment> experiments, List<ObservableDef> observables,
                      List<Measurement> measurements, List<String> globalIds, List<ValueSource> globalSources,
                      int maxObs, int maxNoise, List<Object> extraData, List<String> notes) {
        this.notes = List.copyOf(notes);
        this.problemFile = problemFile;
        this.inputFiles = List.copyOf(inputFiles);
        this.modelFile = modelFile;
        this.model = model;
        this.compiled = compiled;
        this.parameters = List.copyOf(parameters);
        this.conditions = List.copyOf(conditions);
        this.experiments = List.copyOf(experiments);
        this.observables = List.copyOf(observables);
        this.measurements = List.copyOf(measurements);
        this.globalIds = List.copyOf(globalIds);
        this.globalSources = List.copyOf(globalSources);
        this.maxObs = maxObs;
        this.maxNoise = maxNoise;
        this.extraData = List.copyOf(extraData);
        int no = observables.size();
        OdeForm f = compiled.form();
        List<Block> vb = new ArrayList<>();
        List<Block> db = new ArrayList<>();
        List<int[]> pos = new ArrayList<>();
        obsDerivRows = new int[no][];
        obsDerivCols = new int[no][];
        List<Expr> vars = new ArrayList<>();
        for (int j = 0; j < f.stateCount(); j++) {
            vars.add(Expr.state(j, f.stateIds().get(j)));
        }
        for (int k = 0; k < qLength(); k++) {
            vars.add(Expr.param(k, "q" + k));
        }
        for (int o = 0; o < no; o++) {
            ObservableDef d = observables.get(o);
            Block b = f.runtime().withOutputs(List.of(d.prediction(), d.sigma())).prune();
            vb.add(b);
            Derivative.Sparse s = Derivative.jacobian(b, vars);
            db.add(s.block());
            int[] identity = new int[s.rows().length];
            for (int k = 0; k < identity.length; k++) {
                identity[k] = k;
            }
            pos.add(identity);
            obsDerivRows[o] = s.rows();
            obsDerivCols[o] = s.cols();
        }
        obsValues = no == 0 ? new CompiledBlock[0] : BlockCompiler.compileAll(vb).toArray(new CompiledBlock[0]);
        obsDerivs = no == 0 ? new CompiledBlock[0]
                : BlockCompiler.compileAll(db, pos).toArray(new CompiledBlock[0]);
    }

    /** The problem file read. */
    public Path problemFile() {
        return problemFile;
    }

    /** Every input file (problem, model, tables), for checksums. */
    public List<Path> inputFiles() {
        return inputFiles;
    }

    /** The SBML model file. */
    public Path modelFile() {
        return modelFile;
    }

    /** The model as simulated (with the loader's additions for condition-table species). */
    public Model model() {
        return model;
    }

    /** The compiled model. */
    public CompiledModel compiled() {
        return compiled;
    }

    /** Estimated parameters, θ order. */
    public List<FreeParameter> parameters() {
        return parameters;
    }

    /** Number of estimated parameters. */
    public int parameterCount() {
        return parameters.size();
    }

    public List<Condition> conditions() {
        return conditions;
    }

    public List<SimulationExperiment> experiments() {
        return experiments;
    }

    public List<ObservableDef> observables() {
        return observables;
    }

    public List<Measurement> measurements() {
        return measurements;
    }

    /** Problem-level parameter ids used directly by observable or noise formulas (q slots m..m+G). */
    public List<String> globalIds() {
        return globalIds;
    }

    /** Values of {@link #globalIds()}. */
    public List<ValueSource> globalSources() {
        return globalSources;
    }

    /** Largest number of observableParameter placeholders of any observable. */
    public int maxObsPlaceholders() {
        return maxObs;
    }

    /** Largest number of noiseParameter placeholders of any observable. */
    public int maxNoisePlaceholders() {
        return maxNoise;
    }

    /** Data that only other objective blocks understand (dose-response points, switching thresholds). */
    public List<Object> extraData() {
        return extraData;
    }

    /**
     * Warnings about the input that did not stop the loading, one line each with its location (unknown keys, likely
     * misspelt columns, defaults used for missing values, estimated parameters nothing uses). The commands print
     * them; library code does not.
     */
    public List<String> notes() {
        return notes;
    }

    /** Length of q: m + G + P + N. */
    public int qLength() {
        return compiled.parameterCount() + globalIds.size() + maxObs + maxNoise;
    }

    /** q index of the first observable placeholder. */
    public int obsPlaceholderOffset() {
        return compiled.parameterCount() + globalIds.size();
    }

    /** q index of the first noise placeholder. */
    public int noisePlaceholderOffset() {
        return obsPlaceholderOffset() + maxObs;
    }

    /**
     * Writes the globals and the observable and noise placeholders of measurement {@code me} into their slots of
     * the observable parameter vector q (from index m on; the model parameters q[0, m) are the caller's). A slot
     * that holds an estimated parameter reads {@code linear} (θ on the linear scale), or NaN when it is null.
     */
    public void fillPlaceholders(double[] q, Measurement me, double[] linear) {
        int m = compiled().parameterCount();
        List<ValueSource> g = globalSources();
        for (int i = 0; i < g.size(); i++) {
            q[m + i] = placeholderValue(g.get(i), linear);
        }
        int oOff = obsPlaceholderOffset();
        for (int i = 0; i < me.obsParameters().size(); i++) {
            q[oOff + i] = placeholderValue(me.obsParameters().get(i), linear);
        }
        int nOff = noisePlaceholderOffset();
        for (int i = 0; i < me.noiseParameters().size(); i++) {
            q[nOff + i] = placeholderValue(me.noiseParameters().get(i), linear);
        }
    }

    private static double placeholderValue(ValueSource s, double[] linear) {
        return s.isTheta() && linear == null ? Double.NaN : s.value(linear);
    }

    /** θ on the estimation scale at the nominal values. */
    public double[] nominalTheta() {
        double[] t = new double[parameters.size()];
        for (int j = 0; j < t.length; j++) {
            FreeParameter p = parameters.get(j);
            t[j] = p.toTheta(p.nominal());
        }
        return t;
    }

    /** Linear values of θ. */
    public double[] toLinear(double[] theta) {
        double[] x = new double[theta.length];
        for (int j = 0; j < x.length; j++) {
            x[j] = parameters.get(j).toLinear(theta[j]);
        }
        return x;
    }

    /** Writes {@code out[0] = h}, {@code out[1] = sigma} of observable o at (t, y, q). */
    public void evaluateObservable(int o, double t, double[] y, double[] q, double[] out) {
        obsValues[o].eval(t, y, q, out);
    }

    /** Number of structurally non-zero derivative entries of observable o. */
    public int observableDerivativeCount(int o) {
        return obsDerivRows[o].length;
    }

    /** Output (0 = h, 1 = sigma) of each derivative entry of observable o. */
    public int[] observableDerivativeRows(int o) {
        return obsDerivRows[o].clone();
    }

    /** Variable (state j &lt; n, else q index + n) of each derivative entry of observable o. */
    public int[] observableDerivativeCols(int o) {
        return obsDerivCols[o].clone();
    }

    /** Writes the derivative entries of observable o at (t, y, q) into {@code out[0..count)}. */
    public void evaluateObservableDerivatives(int o, double t, double[] y, double[] q, double[] out) {
        obsDerivs[o].eval(t, y, q, out);
    }

    /** Whether the model has events (then gradients are computed by finite differences). */
    public boolean hasEvents() {
        return !compiled.form().events().isEmpty();
    }
}
