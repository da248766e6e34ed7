package org.switchfit.ode;

import java.util.ArrayList;
import java.util.List;
import org.switchfit.expr.Block;
import org.switchfit.expr.BlockCompiler;
import org.switchfit.expr.CompiledBlock;
import org.switchfit.expr.Derivative;
import org.switchfit.expr.Expr;
import org.switchfit.model.BoundEvent;

/**
 * First derivatives of the event mathematics of a {@link CompiledModel} with respect to the states y, the
 * parameters p and the time t: per event its switching function g (see {@link ModelCompiler#switching}), its delay,
 * and per assignment the assigned value and the scale (compartment size) it is multiplied with; per
 * right-hand-side switch ({@link CompiledModel#rhsSwitchCount}) its switching function. They supply the
 * terms ∂g/∂y, ∂g/∂p, ∂g/∂t, ∂h/∂y, ... of the sensitivity jump conditions used by {@link Simulator}.
 *
 * <p>Layout: one evaluation writes {@link #entryCount()} sparse entries; entry e is ∂(row {@code rowOf[e]})/∂(var
 * {@code varOf[e]}), with variables numbered y_0..y_{n-1}, p_0..p_{m-1}, then t (index n + m). Rows are numbered
 * by {@link #switchingRow}, {@link #delayRow}, {@link #valueRow}, {@link #scaleRow}. The derivatives go through the
 * runtime locals (assignment rules, concentrations) by the chain rule ({@link Derivative#jacobian}).
 *
 * <p>Immutable and thread-safe; {@link #evaluate} allocates nothing.
 */
final class EventDerivatives {
    private final int n;
    private final int m;
    private final int[] gRow;
    private final int[] dRow;
    private final int[][] vRow;
    private final int[][] sRow;
    private final int[] rhsRow;
    private final int[][] entriesOfRow;
    private final int[] varOf;
    private final CompiledBlock block;

    private EventDerivatives(CompiledModel model) {
        this.n = model.stateCount();
        this.m = model.parameterCount();
        List<BoundEvent> events = model.form().events();
        List<Expr> sw = model.switchingExpressions();
        List<Expr> rows = new ArrayList<>();
        int ne = events.size();
        gRow = new int[ne];
        dRow = new int[ne];
        vRow = new int[ne][];
        sRow = new int[ne][];
        for (int e = 0; e < ne; e++) {
            BoundEvent ev = events.get(e);
            gRow[e] = rows.size();
            rows.add(sw.get(e));
            dRow[e] = -1;
            if (ev.delay() != null) {
                dRow[e] = rows.size();
                rows.add(ev.delay());
            }
            int nt = ev.targets().size();
            vRow[e] = new int[nt];
            sRow[e] = new int[nt];
            for (int i = 0; i < nt; i++) {
                BoundEvent.Target tg = ev.targets().get(i);
                vRow[e][i] = rows.size();
                rows.add(tg.value());
                sRow[e][i] = -1;
                if (tg.scale() != null) {
                    sRow[e][i] = rows.size();
                    rows.add(tg.scale());
                }
            }
        }
        List<Expr> rsw = model.rhsSwitchingExpressions();
        rhsRow = new int[rsw.size()];
        for (int k = 0; k < rsw.size(); k++) {
            rhsRow[k] = rows.size();
            rows.add(rsw.get(k));
        }
        List<Expr> vars = new ArrayList<>();
        for (int j = 0; j < n; j++) {
            vars.add(Expr.state(j, model.form().stateIds().get(j)));
        }
        for (int k = 0; k < m; k++) {
            vars.add(Expr.param(k, model.form().parameterIds().get(k)));
        }
        vars.add(Expr.TIME);
        Block b = model.form().runtime().withOutputs(rows).prune();
        Derivative.Sparse d = Derivative.jacobian(b, vars);
        int count = d.rows().length;
        varOf = d.cols().clone();
        int[] perRow = new int[rows.size()];
        for (int e = 0; e < count; e++) {
            perRow[d.rows()[e]]++;
        }
        entriesOfRow = new int[rows.size()][];
        for (int r = 0; r < perRow.length; r++) {
            entriesOfRow[r] = new int[perRow[r]];
            perRow[r] = 0;
        }
        for (int e = 0; e < count; e++) {
            int r = d.rows()[e];
            entriesOfRow[r][perRow[r]++] = e;
        }
        int[] pos = new int[count];
        for (int e = 0; e < count; e++) {
            pos[e] = e;
        }
        block = BlockCompiler.compileAll(List.of(d.block()), List.of(pos)).get(0);
    }

    /** Compiles the event derivatives of a model (a Janino compilation; callers cache the result). */
    static EventDerivatives of(CompiledModel model) {
        return new EventDerivatives(model);
    }

    /** Number of sparse entries written by {@link #evaluate}. */
    int entryCount() {
        return varOf.length;
    }

    /** Writes all entries at (t, y, p) into {@code out[0..entryCount())}. */
    void evaluate(double t, double[] y, double[] p, double[] out) {
        if (varOf.length > 0) {
            block.eval(t, y, p, out);
        }
    }

    int switchingRow(int event) {
        return gRow[event];
    }

    /** Row of the switching function of right-hand-side switch k ({@link CompiledModel#rhsSwitchCount}). */
    int rhsSwitchRow(int k) {
        return rhsRow[k];
    }

    /** Row of the event's delay, or -1 when it has none. */
    int delayRow(int event) {
        return dRow[event];
    }

    int valueRow(int event, int target) {
        return vRow[event][target];
    }

    /** Row of the target's scale, or -1 when it has none. */
    int scaleRow(int event, int target) {
        return sRow[event][target];
    }

    /**
     * Total θ-derivative of a row: {@code out[c] = ∂r/∂y · dy[c] + ∂r/∂p · dP[., c] + ∂r/∂t · dt[c]} for the nc
     * directions c, with {@code dy[c * n + i]}, {@code dP[k * nc + c]} and {@code dt[c]} (dt may be null: 0).
     *
     * @param entries values from {@link #evaluate}
     */
    void total(int row, double[] entries, double[] dy, double[] dP, double[] dt, int nc, double[] out) {
        java.util.Arrays.fill(out, 0, nc, 0.0);
        int[] es = entriesOfRow[row];
        for (int q = 0; q < es.length; q++) {
            int e = es[q];
            double v = entries[e];
            int var = varOf[e];
            if (var < n) {
                for (int c = 0; c < nc; c++) {
                    out[c] += v * dy[c * n + var];
                }
            } else if (var < n + m) {
                int k = var - n;
                for (int c = 0; c < nc; c++) {
                    out[c] += v * dP[k * nc + c];
                }
            } else if (dt != null) {
                for (int c = 0; c < nc; c++) {
                    out[c] += v * dt[c];
                }
            }
        }
    }

    /** Time derivative of a row along the flow: {@code ∂r/∂y · f + ∂r/∂t}. */
    double alongFlow(int row, double[] entries, double[] f) {
        double s = 0.0;
        int[] es = entriesOfRow[row];
        for (int q = 0; q < es.length; q++) {
            int e = es[q];
            int var = varOf[e];
            if (var < n) {
                s += entries[e] * f[var];
            } else if (var == n + m) {
                s += entries[e];
            }
        }
        return s;
    }
}
