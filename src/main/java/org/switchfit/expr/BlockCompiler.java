package org.switchfit.expr;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.concurrent.atomic.AtomicLong;
import org.codehaus.commons.compiler.CompileException;
import org.codehaus.janino.SimpleCompiler;

/**
 * Compiles {@link Block}s to bytecode with Janino: straight-line Java source, one class per block, all blocks of a
 * call in one compilation unit. Small blocks become one method with Java locals; big blocks are split into methods
 * of bounded size (well under HotSpot's 8000-byte huge-method limit, from memory) that share locals through a
 * per-thread scratch array. Evaluation order equals the {@link Interpreter}'s, so results agree bit for bit.
 */
public final class BlockCompiler {
    /** Node budget of a block compiled as a single method (about 4 bytecode bytes per node, common practice). */
    static final int SINGLE_METHOD_NODES = 1200;
    /** Node budget per method of a split block. */
    static final int CHUNK_NODES = 1000;

    private static final AtomicLong COUNTER = new AtomicLong();

    private BlockCompiler() {
    }

    /** Compiles one block. */
    public static CompiledBlock compile(Block block) {
        return compileAll(List.of(block)).get(0);
    }

    /**
     * Compiles several blocks in one compilation unit (one Janino run).
     *
     * @throws IllegalStateException when Janino rejects the generated source (a bug)
     */
    public static List<CompiledBlock> compileAll(List<Block> blocks) {
        return compileAll(blocks, null);
    }

    /**
     * Compiles several blocks; {@code positions.get(b)}, when not null, maps output k of block b to the array slot
     * it is written to ({@code out[positions[k]]}), for scattering sparse derivatives into dense arrays.
     */
    public static List<CompiledBlock> compileAll(List<Block> blocks, List<int[]> positions) {
        String outer = "SwitchfitGen" + COUNTER.incrementAndGet();
        StringBuilder src = new StringBuilder();
        src.append("public final class ").append(outer).append(" {\n");
        for (int b = 0; b < blocks.size(); b++) {
            appendBlockClass(src, "B" + b, blocks.get(b), positions == null ? null : positions.get(b));
        }
        src.append("}\n");
        SimpleCompiler sc = new SimpleCompiler();
        sc.setParentClassLoader(BlockCompiler.class.getClassLoader());
        try {
            sc.cook(src.toString());
            List<CompiledBlock> out = new ArrayList<>();
            for (int b = 0; b < blocks.size(); b++) {
                Class<?> c = sc.getClassLoader().loadClass(outer + "$B" + b);
                out.add((CompiledBlock) c.getDeclaredConstructor().newInstance());
            }
            return out;
        } catch (CompileException e) {
            throw new IllegalStateException("generated code does not compile: " + e.getMessage(), e);
        } catch (ReflectiveOperationException e) {
            throw new IllegalStateException("cannot instantiate generated code: " + e, e);
        }
    }

    /** Java source of one block as a static nested class (visible for tests and debugging). */
    public static String source(Block block) {
        StringBuilder sb = new StringBuilder();
        appendBlockClass(sb, "B", block, null);
        return sb.toString();
    }

    private static void appendBlockClass(StringBuilder sb, String name, Block block, int[] pos) {
        sb.append("public static final class ").append(name)
                .append(" implements org.switchfit.expr.CompiledBlock {\n");
        sb.append("public void eval(double t, double[] y, double[] p, double[] out) {\n");
        if (block.size() <= SINGLE_METHOD_NODES) {
            Gen g = new Gen(false);
            for (int l = 0; l < block.localCount(); l++) {
                sb.append("final double l").append(l).append(" = ");
                g.expr(sb, block.local(l));
                sb.append(";\n");
            }
            for (int k = 0; k < block.outputCount(); k++) {
                sb.append("out[").append(pos == null ? k : pos[k]).append("] = ");
                g.expr(sb, block.output(k));
                sb.append(";\n");
            }
            sb.append("}\n}\n");
            return;
        }
        Gen g = new Gen(true);
        sb.append("final double[] w = org.switchfit.expr.MathRuntime.workspace(")
                .append(Math.max(block.localCount(), 1)).append(");\n");
        List<StringBuilder> methods = new ArrayList<>();
        StringBuilder cur = null;
        int budget = 0;
        int total = block.localCount() + block.outputCount();
        for (int s = 0; s < total; s++) {
            Expr e = s < block.localCount() ? block.local(s) : block.output(s - block.localCount());
            if (cur == null || budget + e.size() > CHUNK_NODES) {
                cur = new StringBuilder();
                methods.add(cur);
                budget = 0;
            }
            budget += e.size();
            if (s < block.localCount()) {
                cur.append("w[").append(s).append("] = ");
            } else {
                int k = s - block.localCount();
                cur.append("out[").append(pos == null ? k : pos[k]).append("] = ");
            }
            g.expr(cur, e);
            cur.append(";\n");
        }
        for (int m = 0; m < methods.size(); m++) {
            sb.append("m").append(m).append("(t, y, p, w, out);\n");
        }
        sb.append("}\n");
        for (int m = 0; m < methods.size(); m++) {
            sb.append("private static void m").append(m)
                    .append("(double t, double[] y, double[] p, double[] w, double[] out) {\n")
                    .append(methods.get(m)).append("}\n");
        }
        sb.append("}\n");
    }

    /** Expression printer. */
    private static final class Gen {
        private final boolean split;

        Gen(boolean split) {
            this.split = split;
        }

        void expr(StringBuilder sb, Expr e) {
            switch (e.op()) {
                case CONST:
                    constant(sb, e.value());
                    return;
                case TIME:
                    sb.append('t');
                    return;
                case STATE:
                    sb.append("y[").append(e.index()).append(']');
                    return;
                case PARAM:
                    sb.append("p[").append(e.index()).append(']');
                    return;
                case LOCAL:
                    if (split) {
                        sb.append("w[").append(e.index()).append(']');
                    } else {
                        sb.append('l').append(e.index());
                    }
                    return;
                case ADD:
                    infix(sb, e, " + ");
                    return;
                case MUL:
                    infix(sb, e, " * ");
                    return;
                case SUB:
                    infix(sb, e, " - ");
                    return;
                case DIV:
                    infix(sb, e, " / ");
                    return;
                case NEG:
                    sb.append("(-");
                    expr(sb, e.arg(0));
                    sb.append(')');
                    return;
                case POW:
                    if (e.arg(1).isConst(2.0)) {
                        call(sb, "org.switchfit.expr.MathRuntime.sq", e.arg(0));
                    } else {
                        call(sb, "Math.pow", e.arg(0), e.arg(1));
                    }
                    return;
                case MIN:
                case MAX:
                    fold(sb, e, e.op() == Op.MIN ? "Math.min" : "Math.max");
                    return;
                case PIECEWISE: {
                    int n = e.argCount();
                    sb.append('(');
                    int open = 0;
                    for (int i = 0; i + 1 < n; i += 2) {
                        bool(sb, e.arg(i + 1));
                        sb.append(" ? ");
                        expr(sb, e.arg(i));
                        sb.append(" : (");
                        open++;
                    }
                    if (n % 2 == 1) {
                        expr(sb, e.arg(n - 1));
                    } else {
                        sb.append("Double.NaN");
                    }
                    for (int i = 0; i < open; i++) {
                        sb.append(')');
                    }
                    sb.append(')');
                    return;
                }
                case DELAY:
                    if (e.arg(0).isConst()) {
                        sb.append("org.switchfit.expr.MathRuntime.delayed(");
                        constant(sb, e.arg(0).value());
                        sb.append(", t - ");
                        expr(sb, e.arg(1));
                        sb.append(')');
                        return;
                    }
                    throw new IllegalStateException("unresolved model-level node " + e);
                case SYMBOL:
                case RATEOF:
                    throw new IllegalStateException("unresolved model-level node " + e);
                default:
                    break;
            }
            if (e.op().isBoolean()) {
                sb.append('(');
                bool(sb, e);
                sb.append(" ? 1.0 : 0.0)");
                return;
            }
            call(sb, function(e.op()), e.args().toArray(new Expr[0]));
        }

        void bool(StringBuilder sb, Expr e) {
            switch (e.op()) {
                case EQ:
                    rel(sb, e, " == ");
                    return;
                case NEQ:
                    rel(sb, e, " != ");
                    return;
                case LT:
                    rel(sb, e, " < ");
                    return;
                case LE:
                    rel(sb, e, " <= ");
                    return;
                case GT:
                    rel(sb, e, " > ");
                    return;
                case GE:
                    rel(sb, e, " >= ");
                    return;
                case AND:
                case OR:
                case XOR: {
                    String sym = e.op() == Op.AND ? " && " : e.op() == Op.OR ? " || " : " ^ ";
                    sb.append('(');
                    for (int i = 0; i < e.argCount(); i++) {
                        if (i > 0) {
                            sb.append(sym);
                        }
                        bool(sb, e.arg(i));
                    }
                    sb.append(')');
                    return;
                }
                case NOT:
                    sb.append("(!");
                    bool(sb, e.arg(0));
                    sb.append(')');
                    return;
                default:
                    sb.append('(');
                    expr(sb, e);
                    sb.append(" != 0.0)");
            }
        }

        private void rel(StringBuilder sb, Expr e, String sym) {
            sb.append('(');
            expr(sb, e.arg(0));
            sb.append(sym);
            expr(sb, e.arg(1));
            sb.append(')');
        }

        private void infix(StringBuilder sb, Expr e, String sym) {
            sb.append('(');
            for (int i = 0; i < e.argCount(); i++) {
                if (i > 0) {
                    sb.append(sym);
                }
                expr(sb, e.arg(i));
            }
            sb.append(')');
        }

        private void fold(StringBuilder sb, Expr e, String fn) {
            // left fold: fn(fn(a, b), c)
            for (int i = 1; i < e.argCount(); i++) {
                sb.append(fn).append('(');
            }
            expr(sb, e.arg(0));
            for (int i = 1; i < e.argCount(); i++) {
                sb.append(", ");
                expr(sb, e.arg(i));
                sb.append(')');
            }
        }

        private void call(StringBuilder sb, String fn, Expr... args) {
            sb.append(fn).append('(');
            for (int i = 0; i < args.length; i++) {
                if (i > 0) {
                    sb.append(", ");
                }
                expr(sb, args[i]);
            }
            sb.append(')');
        }

        private static void constant(StringBuilder sb, double v) {
            if (Double.isNaN(v)) {
                sb.append("Double.NaN");
            } else if (v == Double.POSITIVE_INFINITY) {
                sb.append("Double.POSITIVE_INFINITY");
            } else if (v == Double.NEGATIVE_INFINITY) {
                sb.append("Double.NEGATIVE_INFINITY");
            } else if (v < 0 || (v == 0 && 1 / v < 0)) {
                sb.append('(').append(Double.toString(v)).append(')');
            } else {
                sb.append(Double.toString(v));
            }
        }

        private static String function(Op op) {
            String rt = "org.switchfit.expr.MathRuntime.";
            switch (op) {
                case SQRT: return "Math.sqrt";
                case EXP: return "Math.exp";
                case LN: return "Math.log";
                case LOG10: return "Math.log10";
                case ABS: return "Math.abs";
                case FLOOR: return "Math.floor";
                case CEIL: return "Math.ceil";
                case SIN: return "Math.sin";
                case COS: return "Math.cos";
                case TAN: return "Math.tan";
                case SINH: return "Math.sinh";
                case COSH: return "Math.cosh";
                case TANH: return "Math.tanh";
                case ASIN: return "Math.asin";
                case ACOS: return "Math.acos";
                case ATAN: return "Math.atan";
                case FACTORIAL:
                case SEC:
                case CSC:
                case COT:
                case SECH:
                case CSCH:
                case COTH:
                case ASEC:
                case ACSC:
                case ACOT:
                case ASINH:
                case ACOSH:
                case ATANH:
                case ASECH:
                case ACSCH:
                case ACOTH:
                case QUOTIENT:
                case REM:
                case DIV_OR_ZERO:
                    return rt + op.name().toLowerCase(Locale.ROOT);
                default:
                    throw new IllegalStateException("no code rule for " + op);
            }
        }
    }
}
