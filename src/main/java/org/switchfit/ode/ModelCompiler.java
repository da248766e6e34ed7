package org.switchfit.ode;

import java.util.ArrayList;
import java.util.List;
import org.switchfit.expr.Expr;
import org.switchfit.expr.Op;
import org.switchfit.model.BoundEvent;
import org.switchfit.model.Model;
import org.switchfit.model.OdeForm;

/**
 * Compiles a {@link Model} into a {@link CompiledModel}. Event triggers become continuous switching functions whose
 * sign follows the trigger: {@code a > b}, {@code a >= b} give a - b; {@code a < b}, {@code a <= b} give b - a;
 * and gives min, or gives max, not gives the negation; any other condition c gives +1 when c holds, else -1 (a
 * jump that root bracketing still locates). The relations of compound triggers are root functions too (see
 * {@link #compile(OdeForm)}).
 */
public final class ModelCompiler {
    private ModelCompiler() {
    }

    /** Builds the ODE form and compiles it. */
    public static CompiledModel compile(Model model) {
        return compile(OdeForm.of(model));
    }

    /**
     * Compiles an ODE form. The event root functions are the events' switching functions, one per event in model
     * order, followed by the atoms of compound triggers ({@link #atoms}), each a root of its own that belongs to
     * its event: min or max of the parts keeps one sign on both sides of a short window ({@code S > 0.18 && S <
     * 0.19}, a pulse {@code time > 10 && time < 10.01}), so a step could pass the whole window unseen.
     */
    public static CompiledModel compile(OdeForm form) {
        List<Expr> sw = new ArrayList<>();
        List<BoundEvent> events = form.events();
        for (BoundEvent e : events) {
            sw.add(switching(e.trigger()));
        }
        List<Integer> owner = new ArrayList<>();
        for (int e = 0; e < events.size(); e++) {
            List<Expr> at = new ArrayList<>();
            atoms(events.get(e).trigger(), at);
            if (at.size() < 2) {
                continue;
            }
            for (Expr a : at) {
                sw.add(switching(a));
                owner.add(e);
            }
        }
        int[] atomEvent = owner.stream().mapToInt(Integer::intValue).toArray();
        return new CompiledModel(form, sw, atomEvent);
    }

    /** The operands of and, or, xor and not in c, recursively, down to the relations, without repeats. */
    static void atoms(Expr c, List<Expr> out) {
        switch (c.op()) {
            case AND:
            case OR:
            case XOR:
            case NOT:
                for (int a = 0; a < c.argCount(); a++) {
                    atoms(c.arg(a), out);
                }
                return;
            default:
                if (!out.contains(c)) {
                    out.add(c);
                }
        }
    }

    /** The switching function of a boolean expression. */
    public static Expr switching(Expr c) {
        switch (c.op()) {
            case GT:
            case GE:
                return Expr.sub(c.arg(0), c.arg(1));
            case LT:
            case LE:
                return Expr.sub(c.arg(1), c.arg(0));
            case AND:
            case OR: {
                Expr[] a = new Expr[c.argCount()];
                for (int i = 0; i < a.length; i++) {
                    a[i] = switching(c.arg(i));
                }
                return a.length == 1 ? a[0] : Expr.call(c.op() == Op.AND ? Op.MIN : Op.MAX, a);
            }
            case NOT:
                return Expr.neg(switching(c.arg(0)));
            case CONST:
                return Expr.constant(c.value() != 0.0 ? 1.0 : -1.0);
            default:
                return Expr.call(Op.PIECEWISE, Expr.ONE, c, Expr.constant(-1.0));
        }
    }
}
