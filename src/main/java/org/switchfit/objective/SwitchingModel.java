package org.switchfit.objective;

import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.switchfit.continuation.ConservationLaws;
import org.switchfit.continuation.ReducedSystem;
import org.switchfit.linalg.DenseLu;
import org.switchfit.model.Model;
import org.switchfit.model.Reaction;
import org.switchfit.model.SpeciesRef;
import org.switchfit.ode.CompiledModel;
import org.switchfit.problem.Condition;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Steady-state view of a problem's model shared by {@link ThresholdBlock}, {@link DoseResponseBlock} and
 * {@link FoldPrediction}: the conservation laws found from the stoichiometry, the reduced system (states = the
 * independent species, parameters = (p_eff, totals T)), and per condition the initial state y0(θ), p_eff(θ), the
 * totals T = L y0 and their θ-derivatives (initial-assignment derivative chained with dp/dθ). The control parameter
 * of a sweep or dose is overridden, so its row of dp/dθ is zeroed.
 *
 * <p>The laws are checked numerically at construction: every law must satisfy {@code |l^T f(y0, p0)| <= 1e-9
 * (1 + Σ|l_i f_i|)} at the nominal initial state; models whose states are not all species of integer constant
 * stoichiometry in equal compartments (rate rules, different volumes) fail this and are rejected with a
 * {@link UserInputException}. Immutable and thread-safe; every evaluation allocates its own (small) arrays.
 */
final class SwitchingModel {
    final EstimationProblem problem;
    final CompiledModel model;
    final ConservationLaws laws;
    final ReducedSystem reduced;
    final int n;
    final int m;
    final int nr;
    final int nl;
    /** ∂y/∂x (n x nr, row-major) of the affine map from reduced state and totals to the full state. */
    final double[] dyDx;
    /** ∂y/∂T (n x nl, row-major). */
    final double[] dyDt;
    private final InitialDerivative initD;

    SwitchingModel(EstimationProblem problem) {
        this.problem = problem;
        this.model = problem.compiled();
        this.n = model.stateCount();
        this.m = model.parameterCount();
        SourceLocation where = SourceLocation.ofFile(problem.modelFile().toString());
        if (problem.hasEvents()) {
            throw new UserInputException(where, "has events; switching thresholds and dose responses need steady "
                    + "states of an event-free model: remove the events or the threshold/dose-response data");
        }
        this.laws = ConservationLaws.of(stoichiometry(problem.model(), model.form().stateIds(), where));
        this.reduced = laws.reduce(model);
        this.nr = reduced.stateCount();
        this.nl = laws.lawCount();
        this.initD = new InitialDerivative(model.form());
        this.dyDx = new double[n * nr];
        this.dyDt = new double[n * Math.max(nl, 1)];
        double[] q0 = new double[m + nl];
        for (int a = 0; a < nr; a++) {
            double[] e = new double[nr];
            e[a] = 1;
            double[] y = reduced.fullState(e, q0);
            for (int i = 0; i < n; i++) {
                dyDx[i * nr + a] = y[i];
            }
        }
        for (int c = 0; c < nl; c++) {
            double[] q = q0.clone();
            q[m + c] = 1;
            double[] y = reduced.fullState(new double[nr], q);
            for (int i = 0; i < n; i++) {
                dyDt[i * nl + c] = y[i];
            }
        }
        checkLaws(where);
    }

    private static int[][] stoichiometry(Model model, List<String> ids, SourceLocation where) {
        int[][] s = new int[ids.size()][model.reactions().size()];
        for (int r = 0; r < model.reactions().size(); r++) {
            Reaction rx = model.reactions().get(r);
            add(s, ids, rx.reactants(), r, -1, where);
            add(s, ids, rx.products(), r, +1, where);
        }
        return s;
    }

    private static void add(int[][] s, List<String> ids, List<SpeciesRef> refs, int r, int sign,
                            SourceLocation where) {
        for (SpeciesRef ref : refs) {
            int i = ids.indexOf(ref.species());
            double st = Double.isNaN(ref.stoichiometry()) ? 1 : ref.stoichiometry();
            if (i < 0) {
                continue;
            }
            if (st != Math.rint(st) || ref.stoichiometryMath() != null) {
                throw new UserInputException(where.withElement(ref.species()), "species has a non-integer or "
                        + "variable stoichiometry; switching thresholds and dose responses need constant integer "
                        + "stoichiometries: change the model or remove the threshold/dose-response data");
            }
            s[i][r] += sign * (int) st;
        }
    }

    private void checkLaws(SourceLocation where) {
        double[] p = model.parameterValues();
        double[] y = new double[n];
        double[] pe = new double[m];
        model.initialValues(0, p, y, pe);
        double[] f = new double[n];
        model.rhs(0, y, pe, f);
        for (int c = 0; c < nl; c++) {
            long[] l = laws.coefficients(c);
            double s = 0;
            double a = 0;
            for (int i = 0; i < n; i++) {
                s += l[i] * f[i];
                a += Math.abs(l[i] * f[i]);
            }
            if (!(Math.abs(s) <= 1e-9 * (1 + a))) {
                throw new UserInputException(where, String.format(Locale.ROOT, "the stoichiometric conservation "
                        + "law %s is not conserved by the model's right-hand side (l^T f = %.3g); thresholds and "
                        + "dose responses need species-only dynamics in equal compartments", Arrays.toString(l), s));
            }
        }
    }

    /** Initial data of a condition with the control overridden. */
    static final class Start {
        /** Initial full state y0 (n). */
        double[] y0;
        /** Reduced parameters q = (p_eff, T) (m + nl); q[control] is the overriding value. */
        double[] q;
        /** dq/dθ (row-major, (m + nl) x np); null when not requested. */
        double[] dq;
    }

    /**
     * y0, q = (p_eff, T(y0)) and dq/dθ for condition c with declared parameter {@code control} set to
     * {@code controlValue}.
     */
    Start start(EvaluationContext ctx, int cond, int control, double controlValue, boolean sens) {
        int np = ctx.parameterCount();
        double[] pDecl = ctx.declaredParameters(cond);
        pDecl[control] = controlValue;
        Start s = new Start();
        s.y0 = new double[n];
        double[] pe = new double[m];
        model.initialValues(0, pDecl, s.y0, pe);
        pe[control] = controlValue;
        s.q = reduced.parameters(pe, s.y0);
        if (!sens) {
            return s;
        }
        double[] dDecl = ctx.declaredParameterJacobian(cond);
        Arrays.fill(dDecl, control * np, (control + 1) * np, 0.0);
        // d(y0, p_eff)/dθ = (∂init/∂p_decl) dp_decl/dθ; the initial block's derivative includes the identity
        // entries of unassigned parameters (as ExperimentBlock uses it).
        double[] dOut = new double[(n + m) * np];
        double[] vals = new double[initD.size()];
        initD.evaluate(s.y0, pDecl, vals);
        for (int e = 0; e < vals.length; e++) {
            int r = initD.rows[e];
            int k = initD.cols[e];
            double v = vals[e];
            for (int j = 0; j < np; j++) {
                dOut[r * np + j] += v * dDecl[k * np + j];
            }
        }
        Arrays.fill(dOut, (n + control) * np, (n + control + 1) * np, 0.0);
        s.dq = new double[(m + nl) * np];
        System.arraycopy(dOut, n * np, s.dq, 0, m * np);
        for (int c = 0; c < nl; c++) {
            long[] l = laws.coefficients(c);
            for (int i = 0; i < n; i++) {
                if (l[i] != 0) {
                    for (int j = 0; j < np; j++) {
                        s.dq[(m + c) * np + j] += l[i] * dOut[i * np + j];
                    }
                }
            }
        }
        return s;
    }

    /**
     * Sensitivity of the full steady state to θ by the implicit function theorem on the reduced system:
     * {@code dx/dθ = -J_r^{-1} (∂F/∂q) dq/dθ}, {@code dy/dθ = ∂y/∂x dx/dθ + ∂y/∂T dT/dθ}.
     *
     * @param x  reduced steady state
     * @param q  reduced parameters
     * @param dq dq/dθ ((m + nl) x np)
     * @return dy/dθ (n x np, row-major)
     * @throws ObjectiveException when the reduced Jacobian is singular (a fold)
     */
    double[] stateSensitivity(double[] x, double[] q, double[] dq, int np, String what) {
        int mq = m + nl;
        double[] jac = new double[nr * nr];
        double[] jp = new double[nr * mq];
        reduced.jacobianY(0, x, q, jac);
        reduced.jacobianP(0, x, q, jp);
        DenseLu lu = new DenseLu(nr);
        if (!lu.factor(jac) || lu.isSingular()) {
            throw new ObjectiveException(what + ": singular Jacobian at the steady state (at a fold)");
        }
        double[] dx = new double[nr * np];
        double[] col = new double[nr];
        for (int j = 0; j < np; j++) {
            boolean any = false;
            for (int a = 0; a < nr; a++) {
                double s = 0;
                for (int k = 0; k < mq; k++) {
                    double d = dq[k * np + j];
                    if (d != 0) {
                        s += jp[a * mq + k] * d;
                    }
                }
                col[a] = -s;
                any |= s != 0;
            }
            if (!any) {
                continue;
            }
            lu.solve(col);
            for (int a = 0; a < nr; a++) {
                dx[a * np + j] = col[a];
            }
        }
        double[] dy = new double[n * np];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < np; j++) {
                double s = 0;
                for (int a = 0; a < nr; a++) {
                    s += dyDx[i * nr + a] * dx[a * np + j];
                }
                for (int c = 0; c < nl; c++) {
                    s += dyDt[i * nl + c] * dq[(m + c) * np + j];
                }
                dy[i * np + j] = s;
            }
        }
        return dy;
    }

    /**
     * The attractor reached from reduced state x0 at reduced parameters q: backward-Euler pseudo-time stepping with
     * time steps from 1e-3, grown by 1.5 after steps that change the state by less than 2% (relative), a step
     * rejected and the time step quartered when it changes the state by more than 10% or makes a species negative
     * (so it follows the dynamics into the basin of x0, through the slow passage past a fold, rather than jumping to
     * a saddle or a non-physical root the way plain Newton can), until the step reaches 1e8, then a Newton polish.
     *
     * @throws ObjectiveException when the stepping does not settle (|F| above 1e-8 at the end)
     */
    double[] attractor(double[] x0, double[] q, String what) {
        double[] x = x0.clone();
        double[] xp = new double[nr];
        double[] f = new double[nr];
        double[] jac = new double[nr * nr];
        double[] g = new double[nr];
        DenseLu lu = new DenseLu(nr);
        double dt = 1e-3;
        int rejected = 0;
        int accepted = 0;
        while (dt <= 1e8) {
            System.arraycopy(x, 0, xp, 0, nr);
            boolean converged = false;
            for (int it = 0; it < 20 && !converged; it++) {
                reduced.rhs(0, x, q, f);
                reduced.jacobianY(0, x, q, jac);
                double step = 0;
                for (int a = 0; a < nr; a++) {
                    g[a] = x[a] - xp[a] - dt * f[a];
                    for (int b = 0; b < nr; b++) {
                        jac[a * nr + b] = (a == b ? 1 : 0) - dt * jac[a * nr + b];
                    }
                }
                if (!lu.factor(jac) || lu.isSingular()) {
                    break;
                }
                lu.solve(g);
                for (int a = 0; a < nr; a++) {
                    x[a] -= g[a];
                    step = Math.max(step, Math.abs(g[a]) / (1 + Math.abs(x[a])));
                }
                converged = step < 1e-12;
            }
            double change = 0;
            for (int a = 0; a < nr; a++) {
                change = Math.max(change, Math.abs(x[a] - xp[a]) / (1 + Math.abs(xp[a])));
            }
            boolean negative = converged && change <= 0.1 && !physical(x, q);
            if (!converged || change > 0.1 || negative) {
                System.arraycopy(xp, 0, x, 0, nr);
                dt *= 0.25;
                if (dt < 1e-12 || ++rejected > 200) {
                    throw new ObjectiveException(what + ": pseudo-time stepping to a steady state failed" + (negative
                            ? " (each step drove a species below 0: at these values the steady state has a negative "
                            + "species, e.g. from a negative rate or control value; use values for which the model "
                            + "stays non-negative)" : ""));
                }
                continue;
            }
            if (change < 0.02) {
                dt *= 1.5;
            }
            if (++accepted > 20000) {
                throw new ObjectiveException(what + ": pseudo-time stepping did not settle in 20000 steps");
            }
        }
        try {
            x = new org.switchfit.continuation.SteadyStateSolver(1e-13, 1e-14, 30, 0, 1e-3, 0)
                    .solve(reduced, x, q).state();
        } catch (org.switchfit.continuation.ContinuationException e) {
            reduced.rhs(0, x, q, f);
            double r = 0;
            for (double v : f) {
                r = Math.max(r, Math.abs(v));
            }
            if (!(r <= 1e-8)) {
                throw new ObjectiveException(what + ": no steady state reached (max|f| = " + r + ")", e);
            }
        }
        return x;
    }

    /**
     * Newton polish of x at q (no pseudo-time) with stability classification; null when Newton does not converge.
     */
    org.switchfit.continuation.SteadyState newton(double[] x, double[] q) {
        try {
            return new org.switchfit.continuation.SteadyStateSolver(1e-13, 1e-14, 30, 0, 1e-3, nr)
                    .solve(reduced, x, q);
        } catch (org.switchfit.continuation.ContinuationException e) {
            return null;
        }
    }

    /** True when the full state of (x, q) has no species below -1e-9 times the largest magnitude. */
    boolean physical(double[] x, double[] q) {
        double[] y = reduced.fullState(x, q);
        double big = 0;
        for (double v : y) {
            big = Math.max(big, Math.abs(v));
        }
        for (double v : y) {
            if (v < -1e-9 * big) {
                return false;
            }
        }
        return true;
    }

    /** Condition index of an experiment id. */
    int condition(String experiment, SourceLocation loc) {
        List<Condition> cs = problem.conditions();
        for (int c = 0; c < cs.size(); c++) {
            if (cs.get(c).id().equals(experiment)) {
                return c;
            }
        }
        throw new UserInputException(loc, String.format(Locale.ROOT, "refers to experiment '%s', which the problem "
                + "file does not declare; declare it or correct the id", experiment));
    }

    /** Index of the control parameter in the compiled model. */
    int control(String id, SourceLocation loc) {
        int k = model.parameterIndex(id);
        if (k < 0 || model.form().stateIndex(id) >= 0) {
            throw new UserInputException(loc, String.format(Locale.ROOT, "control '%s' is not a parameter of model "
                    + "%s; use a model parameter id", id, problem.modelFile()));
        }
        return k;
    }
}
