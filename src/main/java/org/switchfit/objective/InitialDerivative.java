package org.switchfit.objective;

import java.util.ArrayList;
import java.util.List;
import org.switchfit.expr.BlockCompiler;
import org.switchfit.expr.CompiledBlock;
import org.switchfit.expr.Derivative;
import org.switchfit.expr.Expr;
import org.switchfit.model.OdeForm;

/**
 * Sparse derivative of the initial block (y0 followed by p_eff, n + m outputs) with respect to the declared
 * parameters (m): entry e is {@code ∂out_{rows[e]}/∂p_{cols[e]}}. Immutable and thread-safe.
 */
final class InitialDerivative {
    final int[] rows;
    final int[] cols;
    private final CompiledBlock block;

    InitialDerivative(OdeForm form) {
        List<Expr> vars = new ArrayList<>();
        for (int k = 0; k < form.parameterCount(); k++) {
            vars.add(Expr.param(k, form.parameterIds().get(k)));
        }
        Derivative.Sparse s = Derivative.jacobian(form.initial(), vars);
        rows = s.rows();
        cols = s.cols();
        int[] pos = new int[rows.length];
        for (int e = 0; e < pos.length; e++) {
            pos[e] = e;
        }
        block = BlockCompiler.compileAll(List.of(s.block()), List.of(pos)).get(0);
    }

    int size() {
        return rows.length;
    }

    /** Writes the entries at declared parameters {@code pDeclared} (time 0) into {@code out}. */
    void evaluate(double[] y, double[] pDeclared, double[] out) {
        block.eval(0.0, y, pDeclared, out);
    }
}
