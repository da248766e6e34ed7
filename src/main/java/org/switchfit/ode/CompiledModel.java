package org.switchfit.ode;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.switchfit.expr.Block;
import org.switchfit.expr.BlockCompiler;
import org.switchfit.expr.CompiledBlock;
import org.switchfit.expr.Derivative;
import org.switchfit.expr.Expr;
import org.switchfit.model.OdeForm;

/**
 * A model compiled to bytecode: the ODE right-hand side with its Jacobians, initial values, runtime locals, event
 * switching functions and the switching functions of piecewise conditions in the right-hand side
 * ({@link #rhsSwitchCount}). Immutable and thread-safe; the hot methods allocate nothing.
 *
 * <p>Parameter vector p: the layout of {@link OdeForm} (declared values of compartments, species, parameters,
 * species references with ids, local parameters {@code reactionId.paramId}); {@link #parameterIndex} maps names.
 * The right-hand side expects the effective parameters returned by {@link #initialValues} (initial assignments
 * applied).
 */
public final class CompiledModel implements OdeSystem {
    private final OdeForm form;
    private final int n;
    private final int m;
    private final CompiledBlock rhs;
    private final CompiledBlock locals;
    private final CompiledBlock init;
    private final CompiledBlock switching;
    private final int switchingCount;
    /** Event owning each trigger atom root (root index = event count + position). */
    private final int[] atomEvent;
    private final List<Expr> switchingExprs;
    private final List<Expr> rhsConditions;
    private final List<Expr> rhsSwitchingExprs;
    private final boolean[] rhsTimeOnly;
    private final CompiledBlock allSwitching;
    private final int[][] pattern;
    private volatile CompiledBlock forcedRhs;
    private volatile CompiledBlock jacY;
    private volatile CompiledBlock jacP;
    private volatile EventDerivatives eventDerivatives;

    CompiledModel(OdeForm form, List<Expr> switchingFunctions, int[] atomEvent) {
        this.form = form;
        this.n = form.stateCount();
        this.m = form.parameterCount();
        Block rt = form.runtime();
        Block localsBlock = rt.withOutputs(localRefs(rt));
        Block sw = rt.withOutputs(switchingFunctions).prune();
        this.rhsConditions = List.copyOf(RhsSwitches.conditions(rt));
        List<Expr> rsw = new ArrayList<>();
        for (Expr c : rhsConditions) {
            rsw.add(ModelCompiler.switching(c));
        }
        this.rhsSwitchingExprs = List.copyOf(rsw);
        this.rhsTimeOnly = RhsSwitches.timeOnly(rt, rhsConditions);
        List<Block> blocks = new ArrayList<>(List.of(rt.prune(), localsBlock, form.initial(), sw));
        if (!rsw.isEmpty()) {
            List<Expr> all = new ArrayList<>(switchingFunctions);
            all.addAll(rsw);
            blocks.add(rt.withOutputs(all).prune());
        }
        List<CompiledBlock> cb = BlockCompiler.compileAll(blocks);
        this.rhs = cb.get(0);
        this.locals = cb.get(1);
        this.init = cb.get(2);
        this.switching = cb.get(3);
        this.allSwitching = rsw.isEmpty() ? cb.get(3) : cb.get(4);
        this.switchingCount = switchingFunctions.size();
        this.atomEvent = atomEvent.clone();
        this.switchingExprs = List.copyOf(switchingFunctions);
        this.pattern = computePattern(rt);
    }

    private static List<Expr> localRefs(Block b) {
        List<Expr> l = new ArrayList<>();
        for (int i = 0; i < b.localCount(); i++) {
            l.add(Expr.local(i, b.localName(i)));
        }
        return l;
    }

    private int[][] computePattern(Block rt) {
        List<Expr> vars = new ArrayList<>();
        for (int j = 0; j < n; j++) {
            vars.add(Expr.state(j, form.stateIds().get(j)));
        }
        Derivative.Sparse s = Derivative.jacobian(rt.prune(), vars);
        List<List<Integer>> rows = new ArrayList<>();
        for (int i = 0; i < n; i++) {
            rows.add(new ArrayList<>());
        }
        for (int k = 0; k < s.rows().length; k++) {
            rows.get(s.rows()[k]).add(s.cols()[k]);
        }
        int[][] pat = new int[n][];
        for (int i = 0; i < n; i++) {
            pat[i] = rows.get(i).stream().mapToInt(Integer::intValue).sorted().distinct().toArray();
        }
        return pat;
    }

    /** The ODE form this was compiled from. */
    public OdeForm form() {
        return form;
    }

    @Override
    public int stateCount() {
        return n;
    }

    @Override
    public int parameterCount() {
        return m;
    }

    @Override
    public void rhs(double t, double[] y, double[] p, double[] dydt) {
        rhs.eval(t, y, p, dydt);
    }

    @Override
    public void jacobianY(double t, double[] y, double[] p, double[] jac) {
        CompiledBlock j = jacY;
        if (j == null) {
            j = compileJacobians()[0];
        }
        Arrays.fill(jac, 0, n * n, 0.0);
        j.eval(t, y, p, jac);
    }

    @Override
    public void jacobianP(double t, double[] y, double[] p, double[] jac) {
        CompiledBlock j = jacP;
        if (j == null) {
            j = compileJacobians()[1];
        }
        Arrays.fill(jac, 0, n * m, 0.0);
        j.eval(t, y, p, jac);
    }

    /**
     * Like {@link #jacobianP} but writes only the structurally non-zero entries of ∂f/∂p; every other entry of
     * {@code jac} is left as it is. Callers that keep one array per thread zero it once (for example with a first
     * {@link #jacobianP} call) and then skip the n x m clearing on every later call.
     */
    public void jacobianPNonzeros(double t, double[] y, double[] p, double[] jac) {
        CompiledBlock j = jacP;
        if (j == null) {
            j = compileJacobians()[1];
        }
        j.eval(t, y, p, jac);
    }

    @Override
    public int[][] jacobianPattern() {
        int[][] c = new int[n][];
        for (int i = 0; i < n; i++) {
            c[i] = pattern[i].clone();
        }
        return c;
    }

    private synchronized CompiledBlock[] compileJacobians() {
        if (jacY == null || jacP == null) {
            Block rt = form.runtime().prune();
            List<Expr> ys = new ArrayList<>();
            for (int j = 0; j < n; j++) {
                ys.add(Expr.state(j, form.stateIds().get(j)));
            }
            List<Expr> ps = new ArrayList<>();
            for (int k = 0; k < m; k++) {
                ps.add(Expr.param(k, form.parameterIds().get(k)));
            }
            Derivative.Sparse dy = Derivative.jacobian(rt, ys);
            Derivative.Sparse dp = Derivative.jacobian(rt, ps);
            int[] posY = new int[dy.rows().length];
            for (int k = 0; k < posY.length; k++) {
                posY[k] = dy.rows()[k] * n + dy.cols()[k];
            }
            int[] posP = new int[dp.rows().length];
            for (int k = 0; k < posP.length; k++) {
                posP[k] = dp.rows()[k] * m + dp.cols()[k];
            }
            List<CompiledBlock> cb = BlockCompiler.compileAll(List.of(dy.block(), dp.block()),
                    List.of(posY, posP));
            jacY = cb.get(0);
            jacP = cb.get(1);
        }
        return new CompiledBlock[] {jacY, jacP};
    }

    /** Number of runtime locals (assignment rules, concentrations, reaction rates, rates of change). */
    public int localCount() {
        return form.runtime().localCount();
    }

    /** Writes all runtime locals at (t, y, p) into {@code w} (length &gt;= {@link #localCount}). */
    public void locals(double t, double[] y, double[] p, double[] w) {
        locals.eval(t, y, p, w);
    }

    /**
     * Initial values at time t0 from declared parameters.
     *
     * @param pDeclared declared values (length m)
     * @param y0        receives the initial state (length n)
     * @param pEff      receives the effective parameters (length m)
     */
    public void initialValues(double t0, double[] pDeclared, double[] y0, double[] pEff) {
        double[] out = new double[n + m];
        init.eval(t0, y0, pDeclared, out);
        System.arraycopy(out, 0, y0, 0, n);
        System.arraycopy(out, n, pEff, 0, m);
    }

    /** Declared parameter values (copy). */
    public double[] parameterValues() {
        return form.parameterValues();
    }

    /** Parameter names in p order. */
    public List<String> parameterIds() {
        return form.parameterIds();
    }

    /** Index of a parameter name, or -1. */
    public int parameterIndex(String id) {
        return form.parameterIndex(id);
    }

    /**
     * Event root functions: the switching function of each event in model order, then the atoms of compound
     * triggers ({@link #eventOfRoot}); {@link #eventRootCount} of them.
     */
    public RootFunctions switchingFunctions() {
        return roots(switching, switchingCount);
    }

    /** Number of event root functions: one per event plus the trigger atoms. */
    public int eventRootCount() {
        return switchingCount;
    }

    /** The event that event root k belongs to: k itself below the event count, else the owner of the atom. */
    public int eventOfRoot(int k) {
        int ne = switchingCount - atomEvent.length;
        return k < ne ? k : atomEvent[k - ne];
    }

    /** The first {@code count} outputs of a compiled block as switching functions. */
    private static RootFunctions roots(CompiledBlock sw, int count) {
        return new RootFunctions() {
            @Override
            public int count() {
                return count;
            }

            @Override
            public void evaluate(double t, double[] y, double[] p, double[] g) {
                sw.eval(t, y, p, g);
            }
        };
    }

    /**
     * Number of right-hand-side switches: piecewise conditions in the derivatives (or in the assignment rules and
     * rates they use) that depend on time or states, see {@link RhsSwitches}.
     */
    public int rhsSwitchCount() {
        return rhsConditions.size();
    }

    /** Whether right-hand-side switch k depends on time only (not on states): its time is known in advance. */
    boolean rhsSwitchOnTimeOnly(int k) {
        return rhsTimeOnly[k];
    }

    /** The conditions of the right-hand-side switches (for messages and tests). */
    public List<Expr> rhsSwitchConditions() {
        return rhsConditions;
    }

    /** Switching functions of the right-hand-side switches ({@link ModelCompiler#switching} of each condition). */
    public List<Expr> rhsSwitchingExpressions() {
        return rhsSwitchingExprs;
    }

    /**
     * Every switching function an integration of this model stops at: the events' ({@link #switchingFunctions},
     * indices below {@link #eventRootCount}) followed by the right-hand-side switches'.
     */
    public RootFunctions rootFunctions() {
        return roots(allSwitching, switchingCount + rhsConditions.size());
    }

    /**
     * The right-hand side with the right-hand-side switches' conditions forced: condition k counts as true when
     * {@code pModes[m + k] > 0}. {@code pModes[0..m)} holds the effective parameters. Allocation-free after the
     * first call (which compiles the block).
     */
    void rhsForced(double t, double[] y, double[] pModes, double[] dydt) {
        CompiledBlock b = forcedRhs;
        if (b == null) {
            synchronized (this) {
                b = forcedRhs;
                if (b == null) {
                    b = BlockCompiler.compile(RhsSwitches.forced(form.runtime(), rhsConditions, m));
                    forcedRhs = b;
                }
            }
        }
        b.eval(t, y, pModes, dydt);
    }

    /** Derivatives of the event mathematics (compiled on first use, then shared). */
    EventDerivatives eventDerivatives() {
        EventDerivatives d = eventDerivatives;
        if (d == null) {
            synchronized (this) {
                d = eventDerivatives;
                if (d == null) {
                    d = EventDerivatives.of(this);
                    eventDerivatives = d;
                }
            }
        }
        return d;
    }

    /** Symbolic switching functions (for messages and tests). */
    public List<Expr> switchingExpressions() {
        return switchingExprs;
    }
}
