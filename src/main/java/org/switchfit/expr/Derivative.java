package org.switchfit.expr;

import java.util.ArrayList;
import java.util.BitSet;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.function.Function;

/**
 * Symbolic differentiation. {@link #of} differentiates one tree with respect to a variable leaf (time, a state,
 * a parameter or a symbol); locals are differentiated through a caller-supplied chain-rule callback.
 * {@link #jacobian} differentiates a whole block, adding derivative locals only where dependencies exist.
 * Derivatives of non-smooth functions follow the branch in force (abs, min, max, piecewise); floor, ceiling,
 * factorial, relational and logical nodes have derivative 0.
 */
public final class Derivative {
    private static final double LN10 = Math.log(10.0);

    private Derivative() {
    }

    /**
     * d e / d var.
     *
     * @param var   a TIME, STATE, PARAM or SYMBOL leaf
     * @param local maps a LOCAL leaf to its derivative with respect to var (return {@link Expr#ZERO} if none);
     *              may be null when e has no locals
     */
    public static Expr of(Expr e, Expr var, Function<Expr, Expr> local) {
        switch (e.op()) {
            case CONST:
                return Expr.ZERO;
            case TIME:
            case STATE:
            case PARAM:
            case SYMBOL:
                return e.sameVariable(var) ? Expr.ONE : Expr.ZERO;
            case LOCAL:
                if (var.op() == Op.LOCAL) {
                    return e.sameVariable(var) ? Expr.ONE : Expr.ZERO;
                }
                return local == null ? Expr.ZERO : local.apply(e);
            default:
                break;
        }
        Expr[] a = argArray(e);
        int n = a.length;
        Expr[] d = new Expr[n];
        boolean anyNonZero = false;
        for (int i = 0; i < n; i++) {
            d[i] = of(a[i], var, local);
            anyNonZero |= !d[i].isConst(0.0);
        }
        if (!anyNonZero) {
            return Expr.ZERO;
        }
        Expr x = n > 0 ? a[0] : null;
        Expr dx = n > 0 ? d[0] : null;
        switch (e.op()) {
            case ADD:
                return Expr.add(List.of(d));
            case SUB:
                return Expr.sub(d[0], d[1]);
            case NEG:
                return Expr.neg(dx);
            case MUL: {
                List<Expr> terms = new ArrayList<>();
                for (int i = 0; i < n; i++) {
                    if (d[i].isConst(0.0)) {
                        continue;
                    }
                    List<Expr> f = new ArrayList<>();
                    for (int j = 0; j < n; j++) {
                        f.add(j == i ? d[i] : a[j]);
                    }
                    terms.add(Expr.mul(f));
                }
                return Expr.add(terms);
            }
            case DIV_OR_ZERO:
                // as u/v where v != 0; 0 where v == 0, where the value is 0 too
                return Expr.sub(Expr.call(Op.DIV_OR_ZERO, d[0], a[1]),
                        Expr.call(Op.DIV_OR_ZERO, Expr.mul(a[0], d[1]), Expr.pow(a[1], Expr.constant(2.0))));
            case DIV:
                // (u/v)' = u'/v - u v' / v^2
                return Expr.sub(Expr.div(d[0], a[1]),
                        Expr.div(Expr.mul(a[0], d[1]), Expr.pow(a[1], Expr.constant(2.0))));
            case POW: {
                Expr u = a[0];
                Expr v = a[1];
                if (d[1].isConst(0.0)) {
                    // v u^(v-1) u'
                    return Expr.mul(List.of(v, Expr.pow(u, Expr.sub(v, Expr.ONE)), d[0]));
                }
                Expr lnU = Expr.call(Op.LN, u);
                if (d[0].isConst(0.0)) {
                    return Expr.mul(List.of(e, lnU, d[1]));
                }
                return Expr.mul(e, Expr.add(Expr.mul(d[1], lnU), Expr.div(Expr.mul(v, d[0]), u)));
            }
            case SQRT:
                return Expr.div(dx, Expr.mul(Expr.constant(2.0), e));
            case EXP:
                return Expr.mul(e, dx);
            case LN:
                return Expr.div(dx, x);
            case LOG10:
                return Expr.div(dx, Expr.mul(x, Expr.constant(LN10)));
            case ABS:
                return Expr.call(Op.PIECEWISE, Expr.neg(dx), Expr.call(Op.LT, x, Expr.ZERO), dx);
            case SIN:
                return Expr.mul(Expr.call(Op.COS, x), dx);
            case COS:
                return Expr.neg(Expr.mul(Expr.call(Op.SIN, x), dx));
            case TAN:
                return Expr.div(dx, sq(Expr.call(Op.COS, x)));
            case SEC:
                return Expr.mul(List.of(e, Expr.call(Op.TAN, x), dx));
            case CSC:
                return Expr.neg(Expr.mul(List.of(e, Expr.call(Op.COT, x), dx)));
            case COT:
                return Expr.neg(Expr.mul(sq(Expr.call(Op.CSC, x)), dx));
            case SINH:
                return Expr.mul(Expr.call(Op.COSH, x), dx);
            case COSH:
                return Expr.mul(Expr.call(Op.SINH, x), dx);
            case TANH:
                return Expr.mul(Expr.sub(Expr.ONE, sq(e)), dx);
            case SECH:
                return Expr.neg(Expr.mul(List.of(e, Expr.call(Op.TANH, x), dx)));
            case CSCH:
                return Expr.neg(Expr.mul(List.of(e, Expr.call(Op.COTH, x), dx)));
            case COTH:
                return Expr.neg(Expr.mul(sq(Expr.call(Op.CSCH, x)), dx));
            case ASIN:
                return Expr.div(dx, Expr.call(Op.SQRT, Expr.sub(Expr.ONE, sq(x))));
            case ACOS:
                return Expr.neg(Expr.div(dx, Expr.call(Op.SQRT, Expr.sub(Expr.ONE, sq(x)))));
            case ATAN:
                return Expr.div(dx, Expr.add(Expr.ONE, sq(x)));
            case ACOT:
                return Expr.neg(Expr.div(dx, Expr.add(Expr.ONE, sq(x))));
            case ASEC:
                return Expr.div(dx, Expr.mul(Expr.call(Op.ABS, x), Expr.call(Op.SQRT, Expr.sub(sq(x), Expr.ONE))));
            case ACSC:
                return Expr.neg(Expr.div(dx,
                        Expr.mul(Expr.call(Op.ABS, x), Expr.call(Op.SQRT, Expr.sub(sq(x), Expr.ONE)))));
            case ASINH:
                return Expr.div(dx, Expr.call(Op.SQRT, Expr.add(sq(x), Expr.ONE)));
            case ACOSH:
                return Expr.div(dx, Expr.call(Op.SQRT, Expr.sub(sq(x), Expr.ONE)));
            case ATANH:
            case ACOTH:
                return Expr.div(dx, Expr.sub(Expr.ONE, sq(x)));
            case ASECH:
                return Expr.neg(Expr.div(dx, Expr.mul(x, Expr.call(Op.SQRT, Expr.sub(Expr.ONE, sq(x))))));
            case ACSCH:
                return Expr.neg(Expr.div(dx,
                        Expr.mul(Expr.call(Op.ABS, x), Expr.call(Op.SQRT, Expr.add(Expr.ONE, sq(x))))));
            case MIN:
            case MAX: {
                Expr acc = a[0];
                Expr dacc = d[0];
                for (int i = 1; i < n; i++) {
                    Op cmp = e.op() == Op.MIN ? Op.LE : Op.GE;
                    dacc = Expr.call(Op.PIECEWISE, dacc, Expr.call(cmp, acc, a[i]), d[i]);
                    acc = Expr.call(e.op(), acc, a[i]);
                }
                return dacc;
            }
            case PIECEWISE: {
                Expr[] pw = a.clone();
                for (int i = 0; i + 1 < n; i += 2) {
                    pw[i] = of(a[i], var, local);
                }
                if (n % 2 == 1) {
                    pw[n - 1] = of(a[n - 1], var, local);
                }
                return Expr.call(Op.PIECEWISE, pw);
            }
            case REM:
                return Expr.sub(d[0], Expr.mul(d[1], Expr.call(Op.QUOTIENT, a[0], a[1])));
            case FLOOR:
            case CEIL:
            case FACTORIAL:
            case QUOTIENT:
            case DELAY: // dependence on past states is not part of the instantaneous Jacobian
                return Expr.ZERO;
            default:
                if (e.op().isBoolean()) {
                    return Expr.ZERO;
                }
                throw new IllegalArgumentException("cannot differentiate " + e.op());
        }
    }

    private static Expr[] argArray(Expr e) {
        Expr[] a = new Expr[e.argCount()];
        for (int i = 0; i < a.length; i++) {
            a[i] = e.arg(i);
        }
        return a;
    }

    private static Expr sq(Expr x) {
        return Expr.pow(x, Expr.constant(2.0));
    }

    /**
     * Sparse Jacobian of a block's outputs with respect to variables.
     *
     * @param block derivative block: the original locals, then derivative locals; outputs are the structurally
     *              non-zero entries
     * @param rows  output index of each entry
     * @param cols  variable index of each entry
     */
    public record Sparse(Block block, int[] rows, int[] cols) {
    }

    /**
     * Differentiates every output of {@code b} with respect to each variable in {@code vars} (TIME, STATE, PARAM
     * leaves), applying the chain rule through locals. Entries that simplify to 0 are omitted.
     */
    public static Sparse jacobian(Block b, List<Expr> vars) {
        int nl = b.localCount();
        List<String> names = new ArrayList<>(b.localNames());
        List<Expr> defs = new ArrayList<>(b.locals());
        // which variables each local depends on, transitively
        Map<Long, Integer> varIndex = new HashMap<>();
        for (int j = 0; j < vars.size(); j++) {
            varIndex.put(key(vars.get(j)), j);
        }
        BitSet[] dep = new BitSet[nl];
        for (int l = 0; l < nl; l++) {
            dep[l] = dependencies(b.local(l), varIndex, dep);
        }
        BitSet[] outDeps = new BitSet[b.outputCount()];
        for (int k = 0; k < outDeps.length; k++) {
            outDeps[k] = dependencies(b.output(k), varIndex, dep);
        }
        List<Expr> outs = new ArrayList<>();
        List<Integer> rows = new ArrayList<>();
        List<Integer> cols = new ArrayList<>();
        for (int j = 0; j < vars.size(); j++) {
            final int vj = j;
            Expr var = vars.get(j);
            Map<Integer, Expr> memo = new HashMap<>();
            @SuppressWarnings("unchecked")
            Function<Expr, Expr>[] holder = new Function[1];
            holder[0] = leaf -> {
                int l = leaf.index();
                if (l >= nl || !dep[l].get(vj)) {
                    return Expr.ZERO;
                }
                Expr m = memo.get(l);
                if (m != null) {
                    return m;
                }
                Expr d = of(b.local(l), var, holder[0]);
                Expr r;
                if (d.isConst() || d.op() == Op.LOCAL || d.op() == Op.STATE || d.op() == Op.PARAM) {
                    r = d;
                } else {
                    int idx = defs.size();
                    String nm = "d_" + b.localName(l) + "_d_" + (var.name() == null ? var.op() + "" : var.name());
                    names.add(nm);
                    defs.add(d);
                    r = Expr.local(idx, nm);
                }
                memo.put(l, r);
                return r;
            };
            for (int k = 0; k < b.outputCount(); k++) {
                if (!outDeps[k].get(j)) {
                    continue;
                }
                Expr d = of(b.output(k), var, holder[0]);
                if (!d.isConst(0.0)) {
                    outs.add(d);
                    rows.add(k);
                    cols.add(j);
                }
            }
        }
        int[] r = new int[rows.size()];
        int[] c = new int[cols.size()];
        for (int i = 0; i < r.length; i++) {
            r[i] = rows.get(i);
            c[i] = cols.get(i);
        }
        return new Sparse(new Block(names, defs, outs).prune(), r, c);
    }

    /** Indices (into vars) of variables e depends on, using local dependency sets. */
    static BitSet dependencies(Expr e, Map<Long, Integer> varIndex, BitSet[] localDep) {
        BitSet s = new BitSet();
        e.forEach(x -> {
            if (x.op() == Op.LOCAL) {
                if (x.index() < localDep.length && localDep[x.index()] != null) {
                    s.or(localDep[x.index()]);
                }
            } else if (x.op() == Op.TIME || x.op() == Op.STATE || x.op() == Op.PARAM) {
                Integer j = varIndex.get(key(x));
                if (j != null) {
                    s.set(j);
                }
            }
        });
        return s;
    }

    private static long key(Expr v) {
        if (v.op() != Op.TIME && v.op() != Op.STATE && v.op() != Op.PARAM) {
            throw new IllegalArgumentException("jacobian variables must be TIME, STATE or PARAM leaves, got " + v);
        }
        return ((long) v.op().ordinal() << 32) | (v.op() == Op.TIME ? 0 : v.index());
    }
}
