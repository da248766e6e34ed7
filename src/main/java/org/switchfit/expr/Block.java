package org.switchfit.expr;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;

/**
 * A straight-line program: ordered local definitions {@code w[l] = locals[l]} (each may use earlier locals, t, y
 * and p), then outputs {@code out[k] = outputs[k]}. Immutable.
 */
public final class Block {
    private final List<String> localNames;
    private final List<Expr> locals;
    private final List<Expr> outputs;

    /**
     * @param localNames names of the locals (for messages and generated comments)
     * @param locals     local definitions; local l may reference locals 0..l-1 only
     * @param outputs    output expressions
     * @throws IllegalArgumentException when a local references itself or a later local, or a model-level node
     */
    public Block(List<String> localNames, List<Expr> locals, List<Expr> outputs) {
        if (localNames.size() != locals.size()) {
            throw new IllegalArgumentException("local names and definitions differ in length");
        }
        this.localNames = List.copyOf(localNames);
        this.locals = List.copyOf(locals);
        this.outputs = List.copyOf(outputs);
        for (int l = 0; l < locals.size(); l++) {
            check(locals.get(l), l);
        }
        for (Expr o : outputs) {
            check(o, locals.size());
        }
    }

    /** A block without locals. */
    public static Block of(List<Expr> outputs) {
        return new Block(List.of(), List.of(), outputs);
    }

    private static void check(Expr e, int maxLocal) {
        e.forEach(x -> {
            if (x.op() == Op.LOCAL && (x.index() < 0 || x.index() >= maxLocal)) {
                throw new IllegalArgumentException("local " + x.name() + " (#" + x.index()
                        + ") used before its definition (#" + maxLocal + ")");
            }
            if (x.op() == Op.SYMBOL || x.op() == Op.RATEOF || x.op() == Op.DELAY && !x.arg(0).isConst()) {
                throw new IllegalArgumentException("unresolved model-level node in block: " + x);
            }
        });
    }

    public int localCount() {
        return locals.size();
    }

    public Expr local(int l) {
        return locals.get(l);
    }

    public String localName(int l) {
        return localNames.get(l);
    }

    public List<Expr> locals() {
        return locals;
    }

    public List<String> localNames() {
        return localNames;
    }

    public int outputCount() {
        return outputs.size();
    }

    public Expr output(int k) {
        return outputs.get(k);
    }

    public List<Expr> outputs() {
        return outputs;
    }

    /** Same locals with different outputs. */
    public Block withOutputs(List<Expr> newOutputs) {
        return new Block(localNames, locals, newOutputs);
    }

    /** Total node count of locals and outputs. */
    public int size() {
        int s = 0;
        for (Expr e : locals) {
            s += e.size();
        }
        for (Expr e : outputs) {
            s += e.size();
        }
        return s;
    }

    /** Removes locals that no output needs (directly or through other locals) and renumbers the rest. */
    public Block prune() {
        int n = locals.size();
        boolean[] used = new boolean[n];
        for (Expr o : outputs) {
            markLocals(o, used);
        }
        for (int l = n - 1; l >= 0; l--) {
            if (used[l]) {
                markLocals(locals.get(l), used);
            }
        }
        int[] map = new int[n];
        List<String> names = new ArrayList<>();
        List<Expr> defs = new ArrayList<>();
        int c = 0;
        for (int l = 0; l < n; l++) {
            if (used[l]) {
                map[l] = c++;
            } else {
                map[l] = -1;
            }
        }
        if (c == n) {
            return this;
        }
        for (int l = 0; l < n; l++) {
            if (used[l]) {
                names.add(localNames.get(l));
                defs.add(renumber(locals.get(l), map));
            }
        }
        List<Expr> outs = new ArrayList<>();
        for (Expr o : outputs) {
            outs.add(renumber(o, map));
        }
        return new Block(names, defs, outs);
    }

    private static void markLocals(Expr e, boolean[] used) {
        e.forEach(x -> {
            if (x.op() == Op.LOCAL) {
                used[x.index()] = true;
            }
        });
    }

    private static Expr renumber(Expr e, int[] map) {
        return e.mapLeaves(x -> x.op() == Op.LOCAL && map[x.index()] != x.index()
                ? Expr.local(map[x.index()], x.name()) : x);
    }

    @Override
    public String toString() {
        StringBuilder sb = new StringBuilder();
        for (int l = 0; l < locals.size(); l++) {
            sb.append(localNames.get(l)).append(" := ").append(locals.get(l)).append('\n');
        }
        for (int k = 0; k < outputs.size(); k++) {
            sb.append("out[").append(k).append("] = ").append(outputs.get(k)).append('\n');
        }
        return sb.toString();
    }

    /** Unmodifiable empty list helper for callers. */
    static <T> List<T> none() {
        return Collections.emptyList();
    }
}
