package org.switchfit.ode;

import java.util.ArrayList;
import java.util.List;
import org.switchfit.expr.Block;
import org.switchfit.expr.BlockCompiler;
import org.switchfit.expr.CompiledBlock;
import org.switchfit.expr.Derivative;
import org.switchfit.expr.Expr;
import org.switchfit.model.OdeForm;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Named model outputs (species amounts or concentrations, compartment sizes, parameter values, reaction rates)
 * compiled for evaluation at (t, y, p), with their derivatives with respect to y and p. Immutable, thread-safe.
 *
 * <p>Output names: {@code id} gives the SBML value of the quantity (species: concentration unless
 * hasOnlySubstanceUnits; reaction: rate); {@code amount(S)} and {@code concentration(S)} force a species form.
 */
public final class ModelOutputs {
    private final List<String> names;
    private final Block block;
    private final CompiledBlock compiled;
    private final int n;
    private final int m;
    private volatile CompiledBlock[] derivs;

    private ModelOutputs(List<String> names, Block block, int n, int m) {
        this.names = List.copyOf(names);
        this.block = block;
        this.compiled = BlockCompiler.compile(block);
        this.n = n;
        this.m = m;
    }

    /**
     * Compiles outputs by name (see class doc).
     *
     * @throws UserInputException for unknown names
     */
    public static ModelOutputs of(CompiledModel model, List<String> names) {
        OdeForm f = model.form();
        List<Expr> exprs = new ArrayList<>();
        for (String nm : names) {
            exprs.add(expression(f, nm));
        }
        Block b = f.runtime().withOutputs(exprs).prune();
        return new ModelOutputs(names, b, f.stateCount(), f.parameterCount());
    }

    /** The runtime expression of one output name. */
    public static Expr expression(OdeForm f, String name) {
        String nm = name.strip();
        if (nm.startsWith("amount(") && nm.endsWith(")")) {
            return f.amount(nm.substring(7, nm.length() - 1).strip());
        }
        if (nm.startsWith("concentration(") && nm.endsWith(")")) {
            return f.concentration(nm.substring(14, nm.length() - 1).strip());
        }
        if (!f.quantityIds().contains(nm)) {
            throw new UserInputException(SourceLocation.ofElement(f.model().source(), nm), "is not a species, "
                    + "compartment, parameter or reaction of the model; use one of its ids");
        }
        return f.symbolValue(nm);
    }

    public List<String> names() {
        return names;
    }

    public int count() {
        return names.size();
    }

    /** Writes the outputs at (t, y, p) into out[0..count). */
    public void evaluate(double t, double[] y, double[] p, double[] out) {
        compiled.eval(t, y, p, out);
    }

    /** Writes {@code dOut[k * n + j] = d out_k / d y_j} (dense, zeros included). */
    public void derivativeY(double t, double[] y, double[] p, double[] dOut) {
        java.util.Arrays.fill(dOut, 0, count() * n, 0.0);
        derivatives()[0].eval(t, y, p, dOut);
    }

    /** Writes {@code dOut[k * m + j] = d out_k / d p_j} (dense, zeros included; direct dependence only). */
    public void derivativeP(double t, double[] y, double[] p, double[] dOut) {
        java.util.Arrays.fill(dOut, 0, count() * m, 0.0);
        derivatives()[1].eval(t, y, p, dOut);
    }

    private CompiledBlock[] derivatives() {
        CompiledBlock[] d = derivs;
        if (d == null) {
            synchronized (this) {
                if (derivs == null) {
                    List<Expr> ys = new ArrayList<>();
                    for (int j = 0; j < n; j++) {
                        ys.add(Expr.state(j, "y" + j));
                    }
                    List<Expr> ps = new ArrayList<>();
                    for (int j = 0; j < m; j++) {
                        ps.add(Expr.param(j, "p" + j));
                    }
                    Derivative.Sparse dy = Derivative.jacobian(block, ys);
                    Derivative.Sparse dp = Derivative.jacobian(block, ps);
                    int[] py = new int[dy.rows().length];
                    for (int k = 0; k < py.length; k++) {
                        py[k] = dy.rows()[k] * n + dy.cols()[k];
                    }
                    int[] pp = new int[dp.rows().length];
                    for (int k = 0; k < pp.length; k++) {
                        pp[k] = dp.rows()[k] * m + dp.cols()[k];
                    }
                    derivs = BlockCompiler.compileAll(List.of(dy.block(), dp.block()), List.of(py, pp))
                            .toArray(new CompiledBlock[0]);
                }
                d = derivs;
            }
        }
        return d;
    }
}
