package org.switchfit.ode;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.switchfit.expr.Block;
import org.switchfit.expr.BlockCompiler;
import org.switchfit.expr.CompiledBlock;
import org.switchfit.expr.Derivative;
import org.switchfit.expr.Expr;
import org.switchfit.linalg.DenseLu;
import org.switchfit.expr.Op;
import org.switchfit.model.OdeForm;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UnsupportedConstructException;

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
    private final boolean rhsUsesTime;
    private final CompiledBlock allSwitching;
    private final int[][] pattern;
    private volatile CompiledBlock forcedRhs;
    private volatile CompiledBlock jacY;
    private volatile CompiledBlock jacP;
    private volatile EventDerivatives eventDerivatives;
    /** Fast reactions: count k, block with outputs g (k) then directions D (n * k); Jacobians of g, lazily. */
    private final int nFast;
    private final CompiledBlock fast;
    private volatile CompiledBlock[] fastJac;

    CompiledModel(OdeForm form, List<Expr> switchingFunctions, int[] atomEvent) {
        this.form = form;
        this.n = form.stateCount();
        this.m = form.parameterCount();
        Block rt = form.runtime();
        Expr jump = RhsSwitches.discontinuousFunction(rt);
        if (jump != null) {
            String fn = jump.op() == Op.CEIL ? "ceiling" : jump.op().name().toLowerCase(java.util.Locale.ROOT);
            throw new UnsupportedConstructException(SourceLocation.ofFile(form.model().source()),
                    "the discontinuous function " + fn + " of time in the right-hand side (" + jump
                            + "; its jumps are not located, so results would depend on the output times)",
                    "write the switch as a piecewise condition (e.g. piecewise(1, time >= 12 && time < 24, 0)) or"
                            + " as events");
        }
        Block localsBlock = rt.withOutputs(localRefs(rt));
        Block sw = rt.withOutputs(switchingFunctions).prune();
        this.rhsConditions = List.copyOf(RhsSwitches.conditions(rt));
        List<Expr> rsw = new ArrayList<>();
        for (Expr c : rhsConditions) {
            rsw.add(ModelCompiler.switching(c));
        }
        this.rhsSwitchingExprs = List.copyOf(rsw);
        this.rhsTimeOnly = RhsSwitches.timeOnly(rt, rhsConditions);
        this.rhsUsesTime = RhsSwitches.usesTime(rt);
        List<Block> blocks = new ArrayList<>(List.of(rt.prune(), localsBlock, form.initial(), sw));
        if (!rsw.isEmpty()) {
            List<Expr> all = new ArrayList<>(switchingFunctions);
            all.addAll(rsw);
            blocks.add(rt.withOutputs(all).prune());
        }
        this.nFast = form.fastConstraints().size();
        if (nFast > 0) {
            List<Expr> fo = new ArrayList<>(form.fastConstraints());
            fo.addAll(form.fastDirections());
            blocks.add(rt.withOutputs(fo).prune());
        }
        List<CompiledBlock> cb = BlockCompiler.compileAll(blocks);
        this.fast = nFast > 0 ? cb.get(cb.size() - 1) : null;
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
            CompiledBlock[] j = denseJacobians(form.runtime().prune());
            jacY = j[0];
            jacP = j[1];
        }
        return new CompiledBlock[] {jacY, jacP};
    }

    /**
     * Compiled ∂out/∂y and ∂out/∂p of a block's outputs, written row-major into n- and m-wide arrays (entries that
     * vanish identically are not written: callers clear the arrays).
     */
    private CompiledBlock[] denseJacobians(Block b) {
        List<Expr> ys = new ArrayList<>();
        for (int j = 0; j < n; j++) {
            ys.add(Expr.state(j, form.stateIds().get(j)));
        }
        List<Expr> ps = new ArrayList<>();
        for (int k = 0; k < m; k++) {
            ps.add(Expr.param(k, form.parameterIds().get(k)));
        }
        Derivative.Sparse dy = Derivative.jacobian(b, ys);
        Derivative.Sparse dp = Derivative.jacobian(b, ps);
        int[] posY = new int[dy.rows().length];
        for (int k = 0; k < posY.length; k++) {
            posY[k] = dy.rows()[k] * n + dy.cols()[k];
        }
        int[] posP = new int[dp.rows().length];
        for (int k = 0; k < posP.length; k++) {
            posP[k] = dp.rows()[k] * m + dp.cols()[k];
        }
        List<CompiledBlock> cb = BlockCompiler.compileAll(List.of(dy.block(), dp.block()), List.of(posY, posP));
        return new CompiledBlock[] {cb.get(0), cb.get(1)};
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
        equilibrateFast(t0, y0, pEff);
    }

    /** Number of fast reactions (rapid equilibrium, {@link OdeForm#fastConstraints}). */
    public int fastReactionCount() {
        return nFast;
    }

    /**
     * Largest number of pseudo-time steps of {@link #equilibrateFast}. The step grows 2- to 1000-fold per step
     * while the residual does not rise, so the 1e10-fold growth that marks convergence takes at most 34 such steps;
     * measured: at most 35 on the SBML Test Suite's fast-reaction cases (01565 has 52 fast reactions; 301 before
     * the doubling). 500 leaves room for starts where the residual rises for a while.
     */
    private static final int FAST_STEPS = 500;
    /** Halvings of a pseudo-time step whose result is not finite: 60 shrink it by 1e18, past any useful size. */
    private static final int FAST_HALVINGS = 60;
    /**
     * Convergence of {@link #equilibrateFast}: a step below 1e-12 of the largest state magnitude. Near the
     * equilibrium the steps are Newton steps (pseudo-time step grown without bound), which converge quadratically,
     * so the next step would be near round-off; 1e-12 is below the tightest relative integration tolerance used
     * anywhere (1e-10), so the projection error never shows in a result.
     */
    private static final double FAST_STEP_TOLERANCE = 1e-12;
    /**
     * Bounds of the pseudo-time step's change per step of {@link #equilibrateFast}: switched evolution relaxation
     * multiplies it by the residual ratio, bounded so one lucky step cannot jump to Newton steps far from the
     * equilibrium nor one bad step stall the iteration (bounding the ratio is common practice; the values are ours).
     */
    private static final double FAST_MAX_GROWTH = 1e3;
    private static final double FAST_MIN_GROWTH = 0.1;
    /**
     * A small step counts as converged only once the pseudo-time step has grown 1e10-fold: the steps are then
     * Newton steps, not the short steps of a slow start.
     */
    private static final double FAST_NEWTON_REGIME = 1e10;
    /** First pseudo-time step of {@link #equilibrateFast}: an explicit step would move the state by 1 % of its scale. */
    private static final double FAST_FIRST_MOVE = 0.01;

    /**
     * Brings y to the rapid equilibrium of the fast reactions: moves it along their stoichiometry (extents ξ) until
     * every fast rate law g is 0, by pseudo-transient continuation (Kelley and Keyes 1998) of the fast subsystem
     * {@code dξ/dτ = g(y + D ξ)}: implicit Euler steps {@code (I/Δτ - B) Δξ = g}, B = ∂g/∂ξ, with Δτ grown by the
     * ratio of successive largest |g| (switched evolution relaxation) and halved after a non-finite step. Small first
     * steps follow the fast reactions' own direction, so the state settles on the equilibrium the fast dynamics
     * reach (stable for the fast subsystem), not on whichever root of g is nearest; large later steps are Newton
     * steps. A law that is exactly 0 at the start leaves the state as it is. Called by {@link #initialValues};
     * the simulator calls it after events. No-op without fast reactions.
     *
     * @throws FastEquilibriumException when no equilibrium is found (a law that never vanishes along its reaction)
     */
    public void equilibrateFast(double t, double[] y, double[] p) {
        if (nFast == 0) {
            return;
        }
        int k = nFast;
        double[] out = new double[k + n * k];
        double[] trial = new double[k + n * k];
        double[] jac = new double[k * n];
        double[] b = new double[k * k];
        double[] a = new double[k * k];
        double[] xi = new double[k];
        double[] y1 = new double[n];
        DenseLu lu = DenseLu.withPivotThreshold(k, 0.0);
        fast.eval(t, y, p, out);
        double res = maxAbs(out, k);
        if (Double.isNaN(res)) {
            throw new FastEquilibriumException(t, worstFast(out), "its rate is not a number");
        }
        double dtau = Double.NaN;
        double dtau0 = Double.NaN;
        for (int it = 0; it < FAST_STEPS; it++) {
            if (res == 0.0) {
                return;
            }
            double ymax = 0.0;
            for (int i = 0; i < n; i++) {
                ymax = Math.max(ymax, Math.abs(y[i]));
            }
            if (Double.isNaN(dtau)) {
                double move = 0.0;
                for (int i = 0; i < n; i++) {
                    double d = 0.0;
                    for (int j = 0; j < k; j++) {
                        d += out[k + i * k + j] * out[j];
                    }
                    move = Math.max(move, Math.abs(d));
                }
                dtau = move == 0.0 ? 1.0 : FAST_FIRST_MOVE * Math.max(ymax, Double.MIN_NORMAL) / move;
                dtau0 = dtau;
            }
            couplingMatrix(t, y, p, out, jac, b);
            boolean accepted = false;
            double step = 0.0;
            for (int tries = 0; tries < FAST_HALVINGS && !accepted; tries++) {
                for (int j = 0; j < k * k; j++) {
                    a[j] = -b[j];
                }
                for (int j = 0; j < k; j++) {
                    a[j * k + j] += 1.0 / dtau;
                    xi[j] = out[j];
                }
                if (lu.factor(a)) {
                    lu.solve(xi);
                    step = 0.0;
                    for (int i = 0; i < n; i++) {
                        double d = 0.0;
                        for (int j = 0; j < k; j++) {
                            d += out[k + i * k + j] * xi[j];
                        }
                        y1[i] = y[i] + d;
                        step = Math.max(step, Math.abs(d));
                    }
                    fast.eval(t, y1, p, trial);
                    double r1 = maxAbs(trial, k);
                    if (Double.isFinite(r1) && Double.isFinite(step)) {
                        accepted = true;
                        // switched evolution relaxation: grow the pseudo-time step as the residual falls, and at
                        // least double it while the residual does not rise (the largest |g| can belong to a slow
                        // reaction that falls slowly while the others have settled)
                        double ratio = r1 == 0.0 ? FAST_MAX_GROWTH : Math.min(FAST_MAX_GROWTH, res / r1);
                        dtau *= r1 <= res ? Math.max(2.0, ratio) : Math.max(FAST_MIN_GROWTH, ratio);
                        res = r1;
                        break;
                    }
                }
                dtau *= 0.5;
            }
            if (!accepted) {
                throw new FastEquilibriumException(t, worstFast(out), "no equilibrium along the fast reactions "
                        + "(their rates are not finite along them)");
            }
            System.arraycopy(y1, 0, y, 0, n);
            System.arraycopy(trial, 0, out, 0, out.length);
            if (step <= FAST_STEP_TOLERANCE * ymax && dtau >= FAST_NEWTON_REGIME * dtau0) {
                return;
            }
        }
        throw new FastEquilibriumException(t, worstFast(out), "no equilibrium along the fast reactions in "
                + FAST_STEPS + " pseudo-time steps (its rate is still " + maxAbs(out, nFast) + ")");
    }

    /**
     * Sensitivities of a state projected by {@link #equilibrateFast} (implicit function theorem, stoichiometry
     * independent of θ): column c of s (dy/dθ_c before the projection, {@code s[c * n + i]}) becomes
     * {@code s_c - D B⁻¹ (∂g/∂y s_c + ∂g/∂p dp_c)} with B = ∂g/∂y D, evaluated at the projected y; unchanged when
     * B is singular.
     *
     * @param dP dp/dθ, {@code dP[k * nc + c]} for parameter k (null when p does not depend on θ)
     */
    public void projectFastSensitivities(double t, double[] y, double[] p, double[] s, double[] dP, int nc) {
        projectFastSensitivities(t, y, p, s, dP, null, nc);
    }

    /**
     * As {@link #projectFastSensitivities(double, double[], double[], double[], double[], int)} for a projection
     * at a moving time t(θ) with {@code tau[c] = dt/dθ_c} (after an event): s holds the total derivatives of the
     * state there and the correction includes {@code ∂g/∂t τ_c}.
     */
    public void projectFastSensitivities(double t, double[] y, double[] p, double[] s, double[] dP, double[] tau,
                                         int nc) {
        if (nFast == 0 || nc == 0) {
            return;
        }
        int k = nFast;
        double[] out = new double[k + n * k];
        double[] jac = new double[k * n];
        double[] b = new double[k * k];
        fast.eval(t, y, p, out);
        couplingMatrix(t, y, p, out, jac, b);
        double[] jp = new double[k * m];
        if (dP != null) {
            fastJacobians()[1].eval(t, y, p, jp);
        }
        double[] jt = new double[k];
        if (tau != null) {
            fastJacobians()[2].eval(t, y, p, jt);
        }
        DenseLu lu = DenseLu.withPivotThreshold(k, 0.0);
        if (!lu.factor(b)) {
            // a law that does not change along its reaction (a rate constant of 0): the projection moved nothing
            // (equilibrateFast returns at once when such a law is 0), so neither does its derivative
            return;
        }
        double[] r = new double[k];
        for (int c = 0; c < nc; c++) {
            for (int j = 0; j < k; j++) {
                double v = 0.0;
                for (int i = 0; i < n; i++) {
                    v += jac[j * n + i] * s[c * n + i];
                }
                if (dP != null) {
                    for (int q = 0; q < m; q++) {
                        v += jp[j * m + q] * dP[q * nc + c];
                    }
                }
                if (tau != null) {
                    v += jt[j] * tau[c];
                }
                r[j] = -v;
            }
            lu.solve(r);
            for (int i = 0; i < n; i++) {
                double d = 0.0;
                for (int j = 0; j < k; j++) {
                    d += out[k + i * k + j] * r[j];
                }
                s[c * n + i] += d;
            }
        }
    }

    /** ∂g/∂y into jac (k x n, row-major) and B = ∂g/∂y D into b (k x k), D read from {@code out}. */
    private void couplingMatrix(double t, double[] y, double[] p, double[] out, double[] jac, double[] b) {
        int k = nFast;
        Arrays.fill(jac, 0.0);
        fastJacobians()[0].eval(t, y, p, jac);
        for (int j = 0; j < k; j++) {
            for (int l = 0; l < k; l++) {
                double v = 0.0;
                for (int i = 0; i < n; i++) {
                    v += jac[j * n + i] * out[k + i * k + l];
                }
                b[j * k + l] = v;
            }
        }
    }

    /** Id of the fast reaction with the largest |rate| in {@code out} (NaN counts as largest). */
    private String worstFast(double[] out) {
        int worst = 0;
        for (int j = 0; j < nFast; j++) {
            if (Double.isNaN(out[j]) || Math.abs(out[j]) > Math.abs(out[worst])) {
                worst = j;
                if (Double.isNaN(out[j])) {
                    break;
                }
            }
        }
        return form.fastReactionIds().get(worst);
    }

    private static double maxAbs(double[] v, int len) {
        double r = 0.0;
        for (int i = 0; i < len; i++) {
            double a = Math.abs(v[i]);
            if (Double.isNaN(a)) {
                return Double.NaN;
            }
            r = Math.max(r, a);
        }
        return r;
    }

    /** Dense ∂g/∂y (k x n), ∂g/∂p (k x m) and ∂g/∂t (k) of the fast constraints, compiled on first use. */
    private CompiledBlock[] fastJacobians() {
        CompiledBlock[] j = fastJac;
        if (j != null) {
            return j;
        }
        synchronized (this) {
            if (fastJac == null) {
                Block g = form.runtime().withOutputs(form.fastConstraints()).prune();
                CompiledBlock[] yp = denseJacobians(g);
                Derivative.Sparse dt = Derivative.jacobian(g, List.of(Expr.TIME));
                CompiledBlock t = BlockCompiler.compileAll(List.of(dt.block()), List.of(dt.rows())).get(0);
                fastJac = new CompiledBlock[] {yp[0], yp[1], t};
            }
            return fastJac;
        }
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

    /**
     * The conditions of the right-hand-side switches that depend on the states (not on time alone): where the
     * right-hand side is not smooth in y, which continuation assumes it is.
     */
    public List<Expr> stateRhsSwitchConditions() {
        List<Expr> out = new ArrayList<>();
        for (int k = 0; k < rhsConditions.size(); k++) {
            if (!rhsTimeOnly[k]) {
                out.add(rhsConditions.get(k));
            }
        }
        return out;
    }

    /** Whether the derivatives depend on time explicitly (directly or through rules and rates they use). */
    public boolean rhsUsesTime() {
        return rhsUsesTime;
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
