package org.switchfit.ode;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.switchfit.expr.Block;
import org.switchfit.expr.Expr;
import org.switchfit.expr.Op;

/**
 * The piecewise conditions of a right-hand side that can change value during a simulation: conditions of
 * {@code piecewise} nodes in the derivatives, or in runtime locals (assignment rules, reaction rates) the derivatives
 * use, that depend on time or on the states (directly or through such locals). Each becomes a switching function
 * ({@link ModelCompiler#switching}) the integration stops at, so no step crosses a discontinuity of f and the
 * sensitivities can take the jump of a parameter-dependent switching time ({@link Simulator}). Conditions on
 * parameters only cannot change and get none; conditions using {@code delay()} are left out (their values during
 * root location would need the history ahead of the recorded one).
 *
 * <p>Compound conditions contribute their atoms (relations), each a switch of its own. {@link #forced} gives the
 * right-hand side with atom k replaced by {@code p[m + k] > 0}, so f can be
 * evaluated on either side of a switch at the switching point itself, where the condition's own value is
 * ambiguous.
 */
final class RhsSwitches {
    private RhsSwitches() {
    }

    /**
     * The varying atoms of the piecewise conditions of {@code rt} used by its outputs (see {@link #atoms}), without
     * repeats, in order of appearance.
     */
    static List<Expr> conditions(Block rt) {
        int nl = rt.localCount();
        boolean[] varying = new boolean[nl];
        for (int l = 0; l < nl; l++) {
            varying[l] = varies(rt.local(l), varying);
        }
        boolean[] used = usedLocals(rt);
        List<Expr> out = new ArrayList<>();
        for (int l = 0; l < nl; l++) {
            if (used[l]) {
                collect(rt.local(l), varying, out);
            }
        }
        for (Expr o : rt.outputs()) {
            collect(o, varying, out);
        }
        return out;
    }

    /**
     * Whether the outputs of {@code rt} (the derivatives) depend on time explicitly, directly or through the
     * runtime locals they use: then the system has no steady states in the usual sense.
     */
    static boolean usesTime(Block rt) {
        int nl = rt.localCount();
        boolean[] timed = new boolean[nl];
        for (int l = 0; l < nl; l++) {
            boolean[] t = timed;
            timed[l] = rt.local(l).contains(x -> x.op() == Op.TIME || x.op() == Op.LOCAL && t[x.index()]);
        }
        for (Expr o : rt.outputs()) {
            if (o.contains(x -> x.op() == Op.TIME || x.op() == Op.LOCAL && timed[x.index()])) {
                return true;
            }
        }
        return false;
    }

    /**
     * The first floor, ceiling, quotient or rem (SBML's rem/quotient, and mod through them) in the right-hand side
     * whose argument varies with time or the states, or null. Such a function jumps wherever its argument crosses
     * an integer (a multiple of the divisor); these jumps are no piecewise conditions, so no switching function
     * stops the integration there, a step can pass a jump unseen and the result then depends on the output grid
     * (x' = rem(floor(t/12), 2) - 0.1 x gave x = 0 at t = 24, 48, ...). Models using one of time only are refused
     * until such jumps become switches. Functions of the states are left alone: the error control usually catches
     * their jumps, and the SBML Test Suite (cases 00028, 00173, 00196, 00197, 00269: ceiling(p1 S1)) passes so.
     */
    static Expr discontinuousFunction(Block rt) {
        int nl = rt.localCount();
        boolean[] varying = new boolean[nl];
        boolean[] stateful = new boolean[nl];
        for (int l = 0; l < nl; l++) {
            varying[l] = varies(rt.local(l), varying);
            stateful[l] = onStates(rt.local(l), stateful);
        }
        boolean[] used = usedLocals(rt);
        Expr[] found = new Expr[1];
        java.util.function.Consumer<Expr> scan = e -> e.forEach(x -> {
            if (found[0] == null && (x.op() == Op.FLOOR || x.op() == Op.CEIL || x.op() == Op.QUOTIENT
                    || x.op() == Op.REM) && varies(x, varying) && !onStates(x, stateful)) {
                found[0] = x;
            }
        });
        for (int l = 0; l < nl && found[0] == null; l++) {
            if (used[l]) {
                scan.accept(rt.local(l));
            }
        }
        for (Expr o : rt.outputs()) {
            scan.accept(o);
        }
        return found[0];
    }

    /** Which runtime locals the outputs use, directly or through other locals. */
    private static boolean[] usedLocals(Block rt) {
        int nl = rt.localCount();
        boolean[] used = new boolean[nl];
        for (Expr o : rt.outputs()) {
            markLocals(o, used);
        }
        for (int l = nl - 1; l >= 0; l--) {
            if (used[l]) {
                markLocals(rt.local(l), used);
            }
        }
        return used;
    }

    private static void markLocals(Expr e, boolean[] used) {
        e.forEach(x -> {
            if (x.op() == Op.LOCAL) {
                used[x.index()] = true;
            }
        });
    }

    /**
     * Whether each condition depends on time only (no states, directly or through locals, and no delay): its
     * switching time can be found before integrating.
     */
    static boolean[] timeOnly(Block rt, List<Expr> conditions) {
        int nl = rt.localCount();
        boolean[] stateful = new boolean[nl];
        for (int l = 0; l < nl; l++) {
            stateful[l] = onStates(rt.local(l), stateful);
        }
        boolean[] out = new boolean[conditions.size()];
        for (int k = 0; k < out.length; k++) {
            out[k] = !onStates(conditions.get(k), stateful);
        }
        return out;
    }

    private static boolean onStates(Expr e, boolean[] stateful) {
        return e.contains(x -> x.op() == Op.STATE || x.op() == Op.DELAY || x.op() == Op.LOCAL && stateful[x.index()]);
    }

    private static boolean varies(Expr e, boolean[] varying) {
        return e.contains(x -> x.op() == Op.TIME || x.op() == Op.STATE || x.op() == Op.DELAY
                || x.op() == Op.LOCAL && varying[x.index()]);
    }

    private static void collect(Expr e, boolean[] varying, List<Expr> out) {
        e.forEach(x -> {
            if (x.op() != Op.PIECEWISE) {
                return;
            }
            int na = x.argCount();
            for (int i = 1; i < na; i += 2) {
                atoms(x.arg(i), varying, out);
            }
        });
    }

    /**
     * Adds the varying atoms of condition c ({@link ModelCompiler#atoms}: the operands of and, or, xor and not,
     * down to the relations). A compound condition as one switching function (min or max of its parts) keeps the
     * same sign on both sides of a short window, such as a pulse {@code t > 10 && t < 10.5}, so a step, or the
     * sampling that looks ahead for time switches, could pass the whole window unseen; each atom changes sign at its
     * own crossing.
     */
    private static void atoms(Expr c, boolean[] varying, List<Expr> out) {
        List<Expr> at = new ArrayList<>();
        ModelCompiler.atoms(c, at);
        for (Expr a : at) {
            if (varies(a, varying) && !a.contains(d -> d.op() == Op.DELAY) && !out.contains(a)) {
                out.add(a);
            }
        }
    }

    /**
     * The outputs of {@code rt} with condition k replaced by {@code p[m + k] > 0} (pruned): evaluate with a parameter
     * array {@code [p (m) | mode_0 .. mode_{K-1}]}, mode +1 for true and -1 for false.
     */
    static Block forced(Block rt, List<Expr> conditions, int m) {
        Map<Expr, Expr> replace = new HashMap<>();
        for (int k = 0; k < conditions.size(); k++) {
            replace.put(conditions.get(k), Expr.call(Op.GT, Expr.param(m + k, "switch" + k), Expr.ZERO));
        }
        List<Expr> locals = new ArrayList<>();
        for (Expr l : rt.locals()) {
            locals.add(l.rewrite(replace::get));
        }
        List<Expr> outputs = new ArrayList<>();
        for (Expr o : rt.outputs()) {
            outputs.add(o.rewrite(replace::get));
        }
        return new Block(rt.localNames(), locals, outputs).prune();
    }
}
