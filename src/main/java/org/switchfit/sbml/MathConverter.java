package org.switchfit.sbml;

import java.util.ArrayList;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import org.sbml.jsbml.ASTNode;
import org.sbml.jsbml.FunctionDefinition;
import org.switchfit.expr.Expr;
import org.switchfit.expr.Op;
import org.switchfit.model.OdeForm;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UnsupportedConstructException;
import org.switchfit.util.UserInputException;

/**
 * Converts JSBML abstract syntax trees into {@link Expr} trees with model-level symbols. Function definitions are
 * inlined (arguments substituted for bound variables); n-ary relations become conjunctions of pairs; implies
 * becomes (not a) or b; log with base b becomes ln(x)/ln(b); root of degree n becomes x^(1/n).
 */
final class MathConverter {
    private final org.sbml.jsbml.Model model;
    private final String file;
    private final String prefix;

    MathConverter(org.sbml.jsbml.Model model, String file) {
        this(model, file, "");
    }

    /** A converter that prefixes every model symbol (used when flattening submodels). */
    MathConverter(org.sbml.jsbml.Model model, String file, String prefix) {
        this.model = model;
        this.file = file;
        this.prefix = prefix;
    }

    /**
     * @param node    the AST
     * @param rename  symbol renames (local parameters of a kinetic law), may be empty
     * @param element id of the element holding the math, for messages
     */
    Expr convert(ASTNode node, Map<String, String> rename, String element) {
        if (node == null) {
            throw new UserInputException(SourceLocation.ofElement(file, element), "has no math; add a MathML "
                    + "expression");
        }
        return conv(node, rename, new HashMap<>(), element, 0);
    }

    private Expr conv(ASTNode n, Map<String, String> rename, Map<String, Expr> scope, String el, int depth) {
        if (depth > 200) {
            throw new UserInputException(SourceLocation.ofElement(file, el), "function definitions call each other "
                    + "recursively; SBML forbids recursion");
        }
        ASTNode.Type t = n.getType();
        int nc = n.getChildCount();
        List<Expr> a = new ArrayList<>();
        if (t != ASTNode.Type.FUNCTION && t != ASTNode.Type.LAMBDA) {
            for (int i = 0; i < nc; i++) {
                a.add(conv(n.getChild(i), rename, scope, el, depth));
            }
        }
        switch (t) {
            case INTEGER:
                return Expr.constant(n.getInteger());
            case REAL:
            case REAL_E:
                return Expr.constant(n.getReal());
            case RATIONAL:
                return Expr.constant((double) n.getNumerator() / n.getDenominator());
            case CONSTANT_E:
                return Expr.constant(Math.E);
            case CONSTANT_PI:
                return Expr.constant(Math.PI);
            case CONSTANT_TRUE:
                return Expr.ONE;
            case CONSTANT_FALSE:
                return Expr.ZERO;
            case NAME_TIME:
                return Expr.TIME;
            case NAME_AVOGADRO:
                return Expr.constant(OdeForm.AVOGADRO);
            case NAME: {
                String nm = n.getName();
                Expr bound = scope.get(nm);
                if (bound != null) {
                    return bound;
                }
                String r = rename.get(nm);
                return Expr.symbol(r != null ? r : prefix + nm);
            }
            case PLUS:
            case SUM:
                return a.isEmpty() ? Expr.ZERO : Expr.add(a);
            case TIMES:
            case PRODUCT:
                return a.isEmpty() ? Expr.ONE : Expr.mul(a);
            case MINUS:
                if (a.size() == 1) {
                    return Expr.neg(a.get(0));
                }
                return Expr.sub(a.get(0), a.get(1));
            case DIVIDE:
                return Expr.div(a.get(0), a.get(1));
            case POWER:
            case FUNCTION_POWER:
                return Expr.pow(a.get(0), a.get(1));
            case FUNCTION_ROOT:
                if (a.size() == 1) {
                    return Expr.call(Op.SQRT, a.get(0));
                }
                if (a.get(0).isConst(2.0)) {
                    return Expr.call(Op.SQRT, a.get(1));
                }
                return Expr.pow(a.get(1), Expr.div(Expr.ONE, a.get(0)));
            case FUNCTION_LOG:
                if (a.size() == 1 || a.get(0).isConst(10.0)) {
                    return Expr.call(Op.LOG10, a.get(a.size() - 1));
                }
                return Expr.div(Expr.call(Op.LN, a.get(1)), Expr.call(Op.LN, a.get(0)));
            case FUNCTION_PIECEWISE:
                if (a.isEmpty()) {
                    return Expr.constant(Double.NaN);
                }
                return Expr.call(Op.PIECEWISE, a.toArray(new Expr[0]));
            case RELATIONAL_EQ:
                return chain(Op.EQ, a);
            case RELATIONAL_NEQ:
                return Expr.call(Op.NEQ, a.get(0), a.get(1));
            case RELATIONAL_LT:
                return chain(Op.LT, a);
            case RELATIONAL_LEQ:
                return chain(Op.LE, a);
            case RELATIONAL_GT:
                return chain(Op.GT, a);
            case RELATIONAL_GEQ:
                return chain(Op.GE, a);
            case LOGICAL_AND:
                return a.isEmpty() ? Expr.ONE : Expr.call(Op.AND, a.toArray(new Expr[0]));
            case LOGICAL_OR:
                return a.isEmpty() ? Expr.ZERO : Expr.call(Op.OR, a.toArray(new Expr[0]));
            case LOGICAL_XOR:
                return a.isEmpty() ? Expr.ZERO : Expr.call(Op.XOR, a.toArray(new Expr[0]));
            case LOGICAL_NOT:
                return Expr.call(Op.NOT, a.get(0));
            case LOGICAL_IMPLIES:
                return Expr.call(Op.OR, Expr.call(Op.NOT, a.get(0)), a.get(1));
            case FUNCTION_DELAY:
                return Expr.call(Op.DELAY, a.get(0), a.get(1));
            case FUNCTION_RATE_OF:
                return Expr.call(Op.RATEOF, a.get(0));
            case FUNCTION_MIN:
                return Expr.call(Op.MIN, a.toArray(new Expr[0]));
            case FUNCTION_MAX:
                return Expr.call(Op.MAX, a.toArray(new Expr[0]));
            case FUNCTION:
                return inline(n, rename, scope, el, depth);
            default:
                break;
        }
        Op op = unary(t);
        if (op == null) {
            if (t == ASTNode.Type.FUNCTION_CSYMBOL) {
                // a csymbol function of an SBML package (distrib's normal, uniform, ...): name it by its URL
                String url = n.getDefinitionURL() == null ? "" : n.getDefinitionURL();
                int slash = url.lastIndexOf('/');
                String fn = n.getName() != null ? n.getName() : slash >= 0 ? url.substring(slash + 1) : url;
                String pkg = url.contains("/distrib/") ? "the SBML package 'distrib'" : "an SBML package";
                throw new UnsupportedConstructException(SourceLocation.ofElement(file, el), "the function '" + fn
                        + "' of " + pkg + " (csymbol " + url + ")", "replace it with core SBML math, e.g. a "
                        + "parameter holding a sampled value");
            }
            throw new UnsupportedConstructException(SourceLocation.ofElement(file, el),
                    "the MathML construct " + t, "rewrite the expression with standard SBML MathML");
        }
        if ((op == Op.QUOTIENT || op == Op.REM) && a.size() == 2) {
            return Expr.call(op, a.get(0), a.get(1));
        }
        if (a.size() != 1) {
            throw new UserInputException(SourceLocation.ofElement(file, el), t + " needs one argument, got "
                    + a.size() + "; correct the MathML");
        }
        return Expr.call(op, a.get(0));
    }

    private static Expr chain(Op op, List<Expr> a) {
        if (a.size() == 2) {
            return Expr.call(op, a.get(0), a.get(1));
        }
        if (a.size() < 2) {
            return Expr.ONE;
        }
        Expr[] parts = new Expr[a.size() - 1];
        for (int i = 0; i + 1 < a.size(); i++) {
            parts[i] = Expr.call(op, a.get(i), a.get(i + 1));
        }
        return Expr.call(Op.AND, parts);
    }

    private Expr inline(ASTNode n, Map<String, String> rename, Map<String, Expr> scope, String el, int depth) {
        String fname = n.getName();
        FunctionDefinition fd = model == null ? null : model.getFunctionDefinition(fname);
        if (fd == null || fd.getMath() == null) {
            throw new UserInputException(SourceLocation.ofElement(file, el), "calls function '" + fname
                    + "', which is not defined; add a functionDefinition or correct the name");
        }
        ASTNode lambda = fd.getMath();
        int nc = lambda.getChildCount();
        int nargs = n.getChildCount();
        if (nc - 1 != nargs) {
            throw new UserInputException(SourceLocation.ofElement(file, el), "calls function '" + fname + "' with "
                    + nargs + " arguments but it takes " + (nc - 1) + "; correct the call");
        }
        Map<String, Expr> inner = new HashMap<>();
        for (int i = 0; i < nargs; i++) {
            ASTNode bv = lambda.getChild(i);
            String bname = bv.getName();
            if (bname == null && bv.getChildCount() > 0) {
                bname = bv.getChild(0).getName();
            }
            inner.put(bname, conv(n.getChild(i), rename, scope, el, depth));
        }
        return conv(lambda.getChild(nc - 1), Map.of(), inner, fname, depth + 1);
    }

    private static Op unary(ASTNode.Type t) {
        switch (t) {
            case FUNCTION_ABS: return Op.ABS;
            case FUNCTION_ARCCOS: return Op.ACOS;
            case FUNCTION_ARCCOSH: return Op.ACOSH;
            case FUNCTION_ARCCOT: return Op.ACOT;
            case FUNCTION_ARCCOTH: return Op.ACOTH;
            case FUNCTION_ARCCSC: return Op.ACSC;
            case FUNCTION_ARCCSCH: return Op.ACSCH;
            case FUNCTION_ARCSEC: return Op.ASEC;
            case FUNCTION_ARCSECH: return Op.ASECH;
            case FUNCTION_ARCSIN: return Op.ASIN;
            case FUNCTION_ARCSINH: return Op.ASINH;
            case FUNCTION_ARCTAN: return Op.ATAN;
            case FUNCTION_ARCTANH: return Op.ATANH;
            case FUNCTION_CEILING: return Op.CEIL;
            case FUNCTION_COS: return Op.COS;
            case FUNCTION_COSH: return Op.COSH;
            case FUNCTION_COT: return Op.COT;
            case FUNCTION_COTH: return Op.COTH;
            case FUNCTION_CSC: return Op.CSC;
            case FUNCTION_CSCH: return Op.CSCH;
            case FUNCTION_EXP: return Op.EXP;
            case FUNCTION_FACTORIAL: return Op.FACTORIAL;
            case FUNCTION_FLOOR: return Op.FLOOR;
            case FUNCTION_LN: return Op.LN;
            case FUNCTION_SEC: return Op.SEC;
            case FUNCTION_SECH: return Op.SECH;
            case FUNCTION_SIN: return Op.SIN;
            case FUNCTION_SINH: return Op.SINH;
            case FUNCTION_TAN: return Op.TAN;
            case FUNCTION_TANH: return Op.TANH;
            case FUNCTION_QUOTIENT: return Op.QUOTIENT;
            case FUNCTION_REM: return Op.REM;
            default: return null;
        }
    }
}
