package org.switchfit.expr;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.function.Function;

/**
 * An immutable expression tree node. Leaves are constants, time, and references to states ({@code y[i]}),
 * parameters ({@code p[k]}), block locals and, at model level, named symbols. Factory methods apply light
 * simplification: constant folding of arithmetic and neutral/absorbing elements (x+0, x*1, x*0, x^1, x^0, --x).
 * Nodes are shared freely; equality is structural. Thread-safe.
 */
public final class Expr {
    private static final Expr[] NO_ARGS = new Expr[0];
    /** The constant 0. */
    public static final Expr ZERO = new Expr(Op.CONST, 0.0, -1, null, null);
    /** The constant 1. */
    public static final Expr ONE = new Expr(Op.CONST, 1.0, -1, null, null);
    /** The time variable t. */
    public static final Expr TIME = new Expr(Op.TIME, 0.0, -1, "time", null);

    private final Op op;
    private final double value;
    private final int index;
    private final String name;
    private final Expr[] args;
    private final int size;
    private int hash;

    private Expr(Op op, double value, int index, String name, Expr[] args) {
        this.op = op;
        this.value = value;
        this.index = index;
        this.name = name;
        this.args = args == null ? NO_ARGS : args;
        int s = 1;
        for (Expr a : this.args) {
            s += a.size;
        }
        this.size = s;
    }

    // ---------------------------------------------------------------- accessors

    public Op op() {
        return op;
    }

    /** Value of a constant. */
    public double value() {
        return value;
    }

    /** Index of a state, parameter or local reference; -1 otherwise. */
    public int index() {
        return index;
    }

    /** Name of a reference (kept for messages), or null. */
    public String name() {
        return name;
    }

    public int argCount() {
        return args.length;
    }

    public Expr arg(int i) {
        return args[i];
    }

    /** Copy of the arguments. */
    public List<Expr> args() {
        return List.of(args);
    }

    /** Number of nodes in this tree (shared subtrees counted each time). */
    public int size() {
        return size;
    }

    public boolean isConst() {
        return op == Op.CONST;
    }

    public boolean isConst(double v) {
        return op == Op.CONST && Double.compare(value, v) == 0;
    }

    // ---------------------------------------------------------------- leaves

    public static Expr constant(double v) {
        if (Double.compare(v, 0.0) == 0) {
            return ZERO;
        }
        if (v == 1.0) {
            return ONE;
        }
        return new Expr(Op.CONST, v, -1, null, null);
    }

    public static Expr state(int i, String name) {
        return new Expr(Op.STATE, 0.0, i, name, null);
    }

    public static Expr param(int k, String name) {
        return new Expr(Op.PARAM, 0.0, k, name, null);
    }

    public static Expr local(int l, String name) {
        return new Expr(Op.LOCAL, 0.0, l, name, null);
    }

    /** A model-level named symbol (resolved to a state, parameter or local before compilation). */
    public static Expr symbol(String name) {
        return new Expr(Op.SYMBOL, 0.0, -1, Objects.requireNonNull(name), null);
    }

    // ---------------------------------------------------------------- arithmetic with simplification

    public static Expr add(Expr a, Expr b) {
        return add(List.of(a, b));
    }

    /** Sum with nested sums flattened, constants folded and zeros dropped. */
    public static Expr add(List<Expr> terms) {
        List<Expr> out = new ArrayList<>();
        double c = 0.0;
        boolean hasConst = false;
        for (Expr t : terms) {
            if (t.op == Op.ADD) {
                for (Expr u : t.args) {
                    out.add(u);
                }
            } else if (t.op == Op.CONST) {
                c += t.value;
                hasConst = true;
            } else {
                out.add(t);
            }
        }
        if (hasConst && (c != 0.0 || out.isEmpty())) {
            out.add(constant(c));
        }
        if (out.isEmpty()) {
            return ZERO;
        }
        if (out.size() == 1) {
            return out.get(0);
        }
        return new Expr(Op.ADD, 0.0, -1, null, out.toArray(NO_ARGS));
    }

    public static Expr sub(Expr a, Expr b) {
        if (b.isConst(0.0)) {
            return a;
        }
        if (a.isConst() && b.isConst()) {
            return constant(a.value - b.value);
        }
        if (a.isConst(0.0)) {
            return neg(b);
        }
        if (a.equals(b) && !containsNaNRisk(a)) {
            return ZERO;
        }
        return new Expr(Op.SUB, 0.0, -1, null, new Expr[] {a, b});
    }

    public static Expr mul(Expr a, Expr b) {
        return mul(List.of(a, b));
    }

    /** Product with nested products flattened, constants folded, ones dropped, zero absorbing. */
    public static Expr mul(List<Expr> factors) {
        List<Expr> out = new ArrayList<>();
        double c = 1.0;
        boolean hasConst = false;
        for (Expr f : factors) {
            if (f.op == Op.MUL) {
                for (Expr u : f.args) {
                    out.add(u);
                }
            } else if (f.op == Op.CONST) {
                c *= f.value;
                hasConst = true;
            } else {
                out.add(f);
            }
        }
        if (hasConst && c == 0.0) {
            return ZERO;
        }
        if (hasConst && (c != 1.0 || out.isEmpty())) {
            if (c == -1.0 && !out.isEmpty()) {
                Expr rest = out.size() == 1 ? out.get(0) : new Expr(Op.MUL, 0.0, -1, null, out.toArray(NO_ARGS));
                return neg(rest);
            }
            out.add(0, constant(c));
        }
        if (out.isEmpty()) {
            return ONE;
        }
        if (out.size() == 1) {
            return out.get(0);
        }
        return new Expr(Op.MUL, 0.0, -1, null, out.toArray(NO_ARGS));
    }

    public static Expr div(Expr a, Expr b) {
        if (b.isConst(1.0)) {
            return a;
        }
        if (a.isConst() && b.isConst()) {
            return constant(a.value / b.value);
        }
        if (a.isConst(0.0) && !b.isConst()) {
            return ZERO;
        }
        return new Expr(Op.DIV, 0.0, -1, null, new Expr[] {a, b});
    }

    public static Expr pow(Expr a, Expr b) {
        if (b.isConst(1.0)) {
            return a;
        }
        if (b.isConst(0.0)) {
            return ONE;
        }
        if (a.isConst() && b.isConst()) {
            return constant(Math.pow(a.value, b.value));
        }
        return new Expr(Op.POW, 0.0, -1, null, new Expr[] {a, b});
    }

    public static Expr neg(Expr a) {
        if (a.isConst()) {
            return constant(-a.value);
        }
        if (a.op == Op.NEG) {
            return a.args[0];
        }
        return new Expr(Op.NEG, 0.0, -1, null, new Expr[] {a});
    }

    /** A function or operator node of the given kind; folds constants for pure numeric functions. */
    public static Expr call(Op op, Expr... args) {
        switch (op) {
            case ADD:
                return add(Arrays.asList(args));
            case MUL:
                return mul(Arrays.asList(args));
            case SUB:
                return sub(args[0], args[1]);
            case DIV:
                return div(args[0], args[1]);
            case POW:
                return pow(args[0], args[1]);
            case NEG:
                return neg(args[0]);
            default:
                break;
        }
        if (op.isLeaf()) {
            throw new IllegalArgumentException("call() needs an operator, got leaf kind " + op);
        }
        if (op.arity() >= 0 && args.length != op.arity()) {
            throw new IllegalArgumentException(op + " takes " + op.arity() + " arguments, got " + args.length);
        }
        if (op.arity() < 0 && args.length == 0) {
            throw new IllegalArgumentException(op + " needs at least one argument");
        }
        Expr e = new Expr(op, 0.0, -1, null, args.clone());
        if (op != Op.DELAY && op != Op.RATEOF && op != Op.PIECEWISE && allConst(args)) {
            return constant(Interpreter.evaluate(e, 0.0, null, null, null));
        }
        if (op == Op.PIECEWISE) {
            return simplifyPiecewise(e);
        }
        return e;
    }

    private static Expr simplifyPiecewise(Expr e) {
        // drop leading pieces whose condition is constant false; take a piece whose condition is constant true
        List<Expr> keep = new ArrayList<>();
        int n = e.args.length;
        for (int i = 0; i + 1 < n; i += 2) {
            Expr cond = e.args[i + 1];
            if (cond.isConst()) {
                if (cond.value != 0.0) {
                    if (keep.isEmpty()) {
                        return e.args[i];
                    }
                    keep.add(e.args[i]);
                    return new Expr(Op.PIECEWISE, 0.0, -1, null, keep.toArray(NO_ARGS));
                }
                continue;
            }
            keep.add(e.args[i]);
            keep.add(cond);
        }
        if (n % 2 == 1) {
            if (keep.isEmpty()) {
                return e.args[n - 1];
            }
            keep.add(e.args[n - 1]);
        }
        if (keep.isEmpty()) {
            return constant(Double.NaN);
        }
        return new Expr(Op.PIECEWISE, 0.0, -1, null, keep.toArray(NO_ARGS));
    }

    private static boolean allConst(Expr[] args) {
        for (Expr a : args) {
            if (!a.isConst()) {
                return false;
            }
        }
        return true;
    }

    private static boolean containsNaNRisk(Expr a) {
        // x - x is 0 only when x is finite; keep the subtraction unless a is a plain variable
        return !(a.op == Op.STATE || a.op == Op.PARAM || a.op == Op.LOCAL || a.op == Op.SYMBOL
                || a.op == Op.TIME);
    }

    /** Returns a node of the same kind with new arguments (re-simplified). */
    public Expr withArgs(Expr[] newArgs) {
        if (op.isLeaf()) {
            return this;
        }
        return call(op, newArgs);
    }

    // ---------------------------------------------------------------- traversal

    /**
     * Rewrites bottom-up: leaves are passed to {@code leafMap} (return the leaf itself to keep it); inner nodes are
     * rebuilt when an argument changed.
     */
    public Expr mapLeaves(Function<Expr, Expr> leafMap) {
        if (op.isLeaf()) {
            return leafMap.apply(this);
        }
        Expr[] na = null;
        for (int i = 0; i < args.length; i++) {
            Expr a = args[i].mapLeaves(leafMap);
            if (a != args[i]) {
                if (na == null) {
                    na = args.clone();
                }
                na[i] = a;
            }
        }
        return na == null ? this : call(op, na);
    }

    /**
     * Rewrites top-down: {@code f} may return a replacement for a node (not visited further) or null to descend.
     */
    public Expr rewrite(Function<Expr, Expr> f) {
        Expr r = f.apply(this);
        if (r != null) {
            return r;
        }
        if (op.isLeaf()) {
            return this;
        }
        Expr[] na = null;
        for (int i = 0; i < args.length; i++) {
            Expr a = args[i].rewrite(f);
            if (a != args[i]) {
                if (na == null) {
                    na = args.clone();
                }
                na[i] = a;
            }
        }
        return na == null ? this : call(op, na);
    }

    /** Calls {@code visitor} on every node, parents before children. */
    public void forEach(java.util.function.Consumer<Expr> visitor) {
        visitor.accept(this);
        for (Expr a : args) {
            a.forEach(visitor);
        }
    }

    /** True when some node satisfies the predicate. */
    public boolean contains(java.util.function.Predicate<Expr> pred) {
        if (pred.test(this)) {
            return true;
        }
        for (Expr a : args) {
            if (a.contains(pred)) {
                return true;
            }
        }
        return false;
    }

    /** True when this tree references the given leaf kind and index (or symbol name for SYMBOL). */
    public boolean references(Op kind, int idx, String nm) {
        return contains(e -> e.op == kind && (kind == Op.SYMBOL ? e.name.equals(nm) : e.index == idx));
    }

    /** True when this is the same variable leaf as {@code other}. */
    public boolean sameVariable(Expr other) {
        if (op != other.op) {
            return false;
        }
        if (op == Op.SYMBOL) {
            return name.equals(other.name);
        }
        if (op == Op.TIME) {
            return true;
        }
        return (op == Op.STATE || op == Op.PARAM || op == Op.LOCAL) && index == other.index;
    }

    // ---------------------------------------------------------------- equality, printing

    @Override
    public boolean equals(Object o) {
        if (this == o) {
            return true;
        }
        if (!(o instanceof Expr)) {
            return false;
        }
        Expr e = (Expr) o;
        if (op != e.op || size != e.size || index != e.index || Double.compare(value, e.value) != 0
                || !Objects.equals(name, e.name) || hashCode() != e.hashCode()) {
            return false;
        }
        return Arrays.equals(args, e.args);
    }

    @Override
    public int hashCode() {
        int h = hash;
        if (h == 0) {
            h = Objects.hash(op, value, index, name) * 31 + Arrays.hashCode(args);
            if (h == 0) {
                h = 1;
            }
            hash = h;
        }
        return h;
    }

    /** Readable infix form, for messages and debugging. */
    @Override
    public String toString() {
        StringBuilder sb = new StringBuilder();
        print(sb);
        return sb.toString();
    }

    private void print(StringBuilder sb) {
        switch (op) {
            case CONST:
                sb.append(value);
                return;
            case TIME:
                sb.append("time");
                return;
            case STATE:
            case PARAM:
            case LOCAL:
            case SYMBOL:
                sb.append(name != null ? name : op.name().toLowerCase(java.util.Locale.ROOT) + index);
                return;
            case ADD:
            case MUL:
            case SUB:
            case DIV:
            case POW: {
                String sym = op == Op.ADD ? " + " : op == Op.MUL ? " * " : op == Op.SUB ? " - "
                        : op == Op.DIV ? " / " : "^";
                sb.append('(');
                for (int i = 0; i < args.length; i++) {
                    if (i > 0) {
                        sb.append(sym);
                    }
                    args[i].print(sb);
                }
                sb.append(')');
                return;
            }
            case NEG:
                sb.append("-(");
                args[0].print(sb);
                sb.append(')');
                return;
            default:
                sb.append(op.name().toLowerCase(java.util.Locale.ROOT)).append('(');
                for (int i = 0; i < args.length; i++) {
                    if (i > 0) {
                        sb.append(", ");
                    }
                    args[i].print(sb);
                }
                sb.append(')');
        }
    }
}
