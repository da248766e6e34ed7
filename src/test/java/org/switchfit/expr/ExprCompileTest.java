package org.switchfit.expr;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.List;
import java.util.Random;
import org.junit.jupiter.api.Test;

/** Generated code against the reference interpreter, and symbolic derivatives against finite differences. */
class ExprCompileTest {
    private static final long SEED = 20261202L;

    private static final Expr Y0 = Expr.state(0, "a");
    private static final Expr Y1 = Expr.state(1, "b");
    private static final Expr P0 = Expr.param(0, "k");

    /** One expression per unary function, each applied to an argument inside its domain for inputs in (0.1, 0.9). */
    private static List<Expr> functionZoo() {
        List<Expr> list = new ArrayList<>();
        Expr x = Expr.div(Y0, Expr.add(Expr.ONE, Expr.mul(Y1, Y1))); // in (0.05, 0.9)
        for (Op op : Op.values()) {
            if (op.arity() == 1 && !op.isBoolean() && op != Op.NEG && op != Op.RATEOF) {
                Expr arg = x;
                if (op == Op.ACOSH || op == Op.ASEC || op == Op.ACSC || op == Op.ACOTH) {
                    arg = Expr.add(Expr.constant(1.5), x); // domain |x| > 1
                }
                if (op == Op.FACTORIAL) {
                    arg = Expr.mul(Expr.constant(5.0), x);
                }
                list.add(Expr.mul(P0, Expr.call(op, arg)));
            }
        }
        list.add(Expr.pow(Y0, Expr.constant(2.0)));
        list.add(Expr.pow(Y0, Y1));
        list.add(Expr.pow(Expr.constant(2.5), Y1));
        list.add(Expr.call(Op.MIN, Y0, Y1, P0));
        list.add(Expr.call(Op.MAX, Y0, Expr.neg(Y1), P0));
        list.add(Expr.call(Op.QUOTIENT, Expr.mul(Expr.constant(10), Y0), Y1));
        list.add(Expr.call(Op.REM, Expr.mul(Expr.constant(10), Y0), Y1));
        list.add(Expr.call(Op.DIV_OR_ZERO, Y0, Expr.sub(Y1, P0)));
        list.add(Expr.call(Op.PIECEWISE, Y0, Expr.call(Op.GT, Y0, Y1), Expr.mul(Y1, P0)));
        list.add(Expr.call(Op.PIECEWISE, Y0, Expr.call(Op.AND, Expr.call(Op.GT, Y0, P0),
                Expr.call(Op.NOT, Expr.call(Op.LE, Y1, P0))), Expr.sub(Y1, Expr.TIME)));
        list.add(Expr.call(Op.OR, Expr.call(Op.EQ, Y0, Y1), Expr.call(Op.XOR, Expr.call(Op.LT, Y0, P0),
                Expr.call(Op.GE, Y1, Expr.TIME)), Expr.call(Op.NEQ, Y0, Expr.ZERO)));
        list.add(Expr.div(Expr.sub(Y0, Y1), Expr.add(List.of(Y0, Y1, P0, Expr.TIME))));
        return list;
    }

    @Test
    void compiledEqualsInterpreterBitForBit() {
        List<Expr> zoo = functionZoo();
        Block block = new Block(List.of("s"), List.of(Expr.add(Y0, Y1)),
                append(zoo, Expr.mul(Expr.local(0, "s"), P0)));
        CompiledBlock cb = BlockCompiler.compile(block);
        Random rnd = new Random(SEED);
        double[] out = new double[block.outputCount()];
        double[] ref = new double[block.outputCount()];
        double[] w = new double[1];
        for (int trial = 0; trial < 200; trial++) {
            double t = rnd.nextDouble();
            double[] y = {0.1 + 0.8 * rnd.nextDouble(), 0.1 + 0.8 * rnd.nextDouble()};
            double[] p = {0.1 + 0.8 * rnd.nextDouble()};
            cb.eval(t, y, p, out);
            Interpreter.evaluate(block, t, y, p, w, ref);
            for (int k = 0; k < out.length; k++) {
                // same operations in the same order: identical doubles expected (seed printed on failure)
                assertEquals(Double.doubleToLongBits(ref[k]), Double.doubleToLongBits(out[k]),
                        "seed " + SEED + " output " + k + " " + block.output(k));
            }
        }
    }

    @Test
    void bigBlockIsSplitAndStillAgrees() {
        // 400 chained locals of ~10 nodes each: above the single-method budget, so the split path runs
        List<String> names = new ArrayList<>();
        List<Expr> locals = new ArrayList<>();
        Expr prev = Y0;
        for (int l = 0; l < 400; l++) {
            names.add("v" + l);
            locals.add(Expr.add(Expr.mul(prev, Expr.constant(0.999)), Expr.call(Op.SIN, Expr.mul(Y1, P0))));
            prev = Expr.local(l, "v" + l);
        }
        Block block = new Block(names, locals, List.of(prev, Expr.local(17, "v17")));
        assertTrue(block.size() > BlockCompiler.SINGLE_METHOD_NODES, "test must exercise the split path");
        assertTrue(BlockCompiler.source(block).contains("private static void m1("), "expected several methods");
        CompiledBlock cb = BlockCompiler.compile(block);
        double[] y = {0.3, 0.7};
        double[] p = {1.3};
        double[] out = new double[2];
        double[] ref = new double[2];
        cb.eval(0.0, y, p, out);
        Interpreter.evaluate(block, 0.0, y, p, new double[400], ref);
        assertEquals(ref[0], out[0], 0.0);
        assertEquals(ref[1], out[1], 0.0);
    }

    @Test
    void derivativesMatchCentralDifferences() {
        Random rnd = new Random(SEED + 1);
        List<Expr> zoo = functionZoo();
        Expr[] vars = {Y0, Y1, P0, Expr.TIME};
        for (Expr e : zoo) {
            if (e.contains(x -> x.op() == Op.FLOOR || x.op() == Op.CEIL || x.op() == Op.FACTORIAL
                    || x.op() == Op.QUOTIENT || x.op().isBoolean() || x.op() == Op.MIN || x.op() == Op.MAX)) {
                continue; // piecewise constant or kinked: finite differences not meaningful at random points
            }
            for (int trial = 0; trial < 20; trial++) {
                double t = 0.1 + 0.8 * rnd.nextDouble();
                double[] y = {0.1 + 0.8 * rnd.nextDouble(), 0.1 + 0.8 * rnd.nextDouble()};
                double[] p = {0.1 + 0.8 * rnd.nextDouble()};
                for (Expr v : vars) {
                    Expr d = Derivative.of(e, v, null);
                    double analytic = Interpreter.evaluate(d, t, y, p, null);
                    double h = 1e-6;
                    double fd = (eval(e, v, t, y, p, h) - eval(e, v, t, y, p, -h)) / (2 * h);
                    // central differences: truncation O(h^2 f''') ~ 1e-12 and rounding ~ eps*|f|/h ~ 1e-10;
                    // 1e-6 relative/absolute leaves margin for large higher derivatives (common practice)
                    assertEquals(fd, analytic, 1e-6 * (1 + Math.abs(fd)), "d/d" + v + " of " + e);
                }
            }
        }
    }

    @Test
    void jacobianThroughLocalsMatchesInlinedDerivative() {
        // s = a*b; out0 = s^2 + k*a, out1 = k  =>  d out0/da = 2 s b + k, d out0/db = 2 s a, d out1/dk = 1
        Expr s = Expr.local(0, "s");
        Block b = new Block(List.of("s"), List.of(Expr.mul(Y0, Y1)),
                List.of(Expr.add(Expr.pow(s, Expr.constant(2)), Expr.mul(P0, Y0)), P0));
        Derivative.Sparse jac = Derivative.jacobian(b, List.of(Y0, Y1, P0));
        double[] y = {0.4, 1.7};
        double[] p = {2.5};
        double[] out = new double[jac.rows().length];
        BlockCompiler.compile(jac.block()).eval(0, y, p, out);
        double[][] dense = new double[2][3];
        for (int i = 0; i < out.length; i++) {
            dense[jac.rows()[i]][jac.cols()[i]] = out[i];
        }
        double sv = 0.4 * 1.7;
        assertEquals(2 * sv * 1.7 + 2.5, dense[0][0], 1e-15);
        assertEquals(2 * sv * 0.4, dense[0][1], 1e-15);
        assertEquals(0.4, dense[0][2], 1e-15);
        assertEquals(1.0, dense[1][2], 0.0);
        assertEquals(4, out.length, "zero entries must be omitted");
    }

    @Test
    void simplificationFoldsConstantsAndNeutralElements() {
        assertEquals(Y0, Expr.add(Y0, Expr.ZERO));
        assertEquals(Y0, Expr.mul(Expr.ONE, Y0));
        assertEquals(Expr.ZERO, Expr.mul(Y0, Expr.ZERO));
        assertEquals(Expr.constant(5.0), Expr.add(Expr.constant(2), Expr.constant(3)));
        assertEquals(Y0, Expr.neg(Expr.neg(Y0)));
        assertEquals(Y0, Expr.pow(Y0, Expr.ONE));
        assertEquals(Expr.constant(Math.sin(0.5)), Expr.call(Op.SIN, Expr.constant(0.5)));
    }

    private static double eval(Expr e, Expr v, double t, double[] y, double[] p, double h) {
        double[] yy = y.clone();
        double[] pp = p.clone();
        double tt = t;
        if (v.op() == Op.STATE) {
            yy[v.index()] += h;
        } else if (v.op() == Op.PARAM) {
            pp[v.index()] += h;
        } else {
            tt += h;
        }
        return Interpreter.evaluate(e, tt, yy, pp, null);
    }

    private static List<Expr> append(List<Expr> list, Expr e) {
        List<Expr> r = new ArrayList<>(list);
        r.add(e);
        return r;
    }
}
