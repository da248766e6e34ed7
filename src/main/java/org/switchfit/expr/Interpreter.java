package org.switchfit.expr;

/**
 * Reference tree-walking evaluator: slow, obviously correct, and the oracle for generated code. Evaluation order
 * and operations match {@link BlockCompiler} exactly, so results agree bit for bit.
 */
public final class Interpreter {
    private Interpreter() {
    }

    /**
     * Evaluates {@code e} with time t, states y, parameters p and locals w (arrays may be null when unused).
     *
     * @throws IllegalStateException for model-level nodes (SYMBOL, DELAY, RATEOF)
     */
    public static double evaluate(Expr e, double t, double[] y, double[] p, double[] w) {
        switch (e.op()) {
            case CONST:
                return e.value();
            case TIME:
                return t;
            case STATE:
                return y[e.index()];
            case PARAM:
                return p[e.index()];
            case LOCAL:
                return w[e.index()];
            case DELAY:
                if (e.arg(0).isConst()) {
                    return MathRuntime.delayed(e.arg(0).value(), t - evaluate(e.arg(1), t, y, p, w));
                }
                throw new IllegalStateException("unresolved model-level node " + e);
            case SYMBOL:
            case RATEOF:
                throw new IllegalStateException("unresolved model-level node " + e);
            case ADD: {
                double s = evaluate(e.arg(0), t, y, p, w);
                for (int i = 1; i < e.argCount(); i++) {
                    s = s + evaluate(e.arg(i), t, y, p, w);
                }
                return s;
            }
            case MUL: {
                double s = evaluate(e.arg(0), t, y, p, w);
                for (int i = 1; i < e.argCount(); i++) {
                    s = s * evaluate(e.arg(i), t, y, p, w);
                }
                return s;
            }
            case SUB:
                return evaluate(e.arg(0), t, y, p, w) - evaluate(e.arg(1), t, y, p, w);
            case DIV:
                return evaluate(e.arg(0), t, y, p, w) / evaluate(e.arg(1), t, y, p, w);
            case POW: {
                double a = evaluate(e.arg(0), t, y, p, w);
                if (e.arg(1).isConst(2.0)) {
                    return a * a;
                }
                return Math.pow(a, evaluate(e.arg(1), t, y, p, w));
            }
            case NEG:
                return -evaluate(e.arg(0), t, y, p, w);
            case MIN: {
                double s = evaluate(e.arg(0), t, y, p, w);
                for (int i = 1; i < e.argCount(); i++) {
                    s = Math.min(s, evaluate(e.arg(i), t, y, p, w));
                }
                return s;
            }
            case MAX: {
                double s = evaluate(e.arg(0), t, y, p, w);
                for (int i = 1; i < e.argCount(); i++) {
                    s = Math.max(s, evaluate(e.arg(i), t, y, p, w));
                }
                return s;
            }
            case QUOTIENT:
                return MathRuntime.quotient(evaluate(e.arg(0), t, y, p, w), evaluate(e.arg(1), t, y, p, w));
            case REM:
                return MathRuntime.rem(evaluate(e.arg(0), t, y, p, w), evaluate(e.arg(1), t, y, p, w));
            case DIV_OR_ZERO:
                return MathRuntime.div_or_zero(evaluate(e.arg(0), t, y, p, w), evaluate(e.arg(1), t, y, p, w));
            case PIECEWISE: {
                int n = e.argCount();
                for (int i = 0; i + 1 < n; i += 2) {
                    if (truth(e.arg(i + 1), t, y, p, w)) {
                        return evaluate(e.arg(i), t, y, p, w);
                    }
                }
                return n % 2 == 1 ? evaluate(e.arg(n - 1), t, y, p, w) : Double.NaN;
            }
            default:
                break;
        }
        if (e.op().isBoolean()) {
            return truth(e, t, y, p, w) ? 1.0 : 0.0;
        }
        double x = evaluate(e.arg(0), t, y, p, w);
        switch (e.op()) {
            case SQRT: return Math.sqrt(x);
            case EXP: return Math.exp(x);
            case LN: return Math.log(x);
            case LOG10: return Math.log10(x);
            case ABS: return Math.abs(x);
            case FLOOR: return Math.floor(x);
            case CEIL: return Math.ceil(x);
            case FACTORIAL: return MathRuntime.factorial(x);
            case SIN: return Math.sin(x);
            case COS: return Math.cos(x);
            case TAN: return Math.tan(x);
            case SEC: return MathRuntime.sec(x);
            case CSC: return MathRuntime.csc(x);
            case COT: return MathRuntime.cot(x);
            case SINH: return Math.sinh(x);
            case COSH: return Math.cosh(x);
            case TANH: return Math.tanh(x);
            case SECH: return MathRuntime.sech(x);
            case CSCH: return MathRuntime.csch(x);
            case COTH: return MathRuntime.coth(x);
            case ASIN: return Math.asin(x);
            case ACOS: return Math.acos(x);
            case ATAN: return Math.atan(x);
            case ASEC: return MathRuntime.asec(x);
            case ACSC: return MathRuntime.acsc(x);
            case ACOT: return MathRuntime.acot(x);
            case ASINH: return MathRuntime.asinh(x);
            case ACOSH: return MathRuntime.acosh(x);
            case ATANH: return MathRuntime.atanh(x);
            case ASECH: return MathRuntime.asech(x);
            case ACSCH: return MathRuntime.acsch(x);
            case ACOTH: return MathRuntime.acoth(x);
            default:
                throw new IllegalStateException("no evaluation rule for " + e.op());
        }
    }

    /** Truth value of {@code e}: relational/logical nodes directly, anything else as value != 0. */
    public static boolean truth(Expr e, double t, double[] y, double[] p, double[] w) {
        switch (e.op()) {
            case EQ:
                return evaluate(e.arg(0), t, y, p, w) == evaluate(e.arg(1), t, y, p, w);
            case NEQ:
                return evaluate(e.arg(0), t, y, p, w) != evaluate(e.arg(1), t, y, p, w);
            case LT:
                return evaluate(e.arg(0), t, y, p, w) < evaluate(e.arg(1), t, y, p, w);
            case LE:
                return evaluate(e.arg(0), t, y, p, w) <= evaluate(e.arg(1), t, y, p, w);
            case GT:
                return evaluate(e.arg(0), t, y, p, w) > evaluate(e.arg(1), t, y, p, w);
            case GE:
                return evaluate(e.arg(0), t, y, p, w) >= evaluate(e.arg(1), t, y, p, w);
            case AND:
                for (int i = 0; i < e.argCount(); i++) {
                    if (!truth(e.arg(i), t, y, p, w)) {
                        return false;
                    }
                }
                return true;
            case OR:
                for (int i = 0; i < e.argCount(); i++) {
                    if (truth(e.arg(i), t, y, p, w)) {
                        return true;
                    }
                }
                return false;
            case XOR: {
                boolean r = false;
                for (int i = 0; i < e.argCount(); i++) {
                    r ^= truth(e.arg(i), t, y, p, w);
                }
                return r;
            }
            case NOT:
                return !truth(e.arg(0), t, y, p, w);
            default:
                return evaluate(e, t, y, p, w) != 0.0;
        }
    }

    /** Evaluates a block: locals in order into {@code w} (length &gt;= local count), then outputs into out. */
    public static void evaluate(Block b, double t, double[] y, double[] p, double[] w, double[] out) {
        for (int l = 0; l < b.localCount(); l++) {
            w[l] = evaluate(b.local(l), t, y, p, w);
        }
        for (int k = 0; k < b.outputCount(); k++) {
            out[k] = evaluate(b.output(k), t, y, p, w);
        }
    }
}
