package org.switchfit.expr;

/**
 * Node kinds of an {@link Expr}. Arity: -1 means n-ary (at least one argument), otherwise the fixed count.
 * Relational and logical operators yield 1.0 (true) or 0.0 (false); any non-zero value counts as true.
 */
public enum Op {
    CONST(0), TIME(0), STATE(0), PARAM(0), LOCAL(0), SYMBOL(0),
    ADD(-1), MUL(-1), SUB(2), DIV(2), POW(2), NEG(1),
    SQRT(1), EXP(1), LN(1), LOG10(1), ABS(1), FLOOR(1), CEIL(1), FACTORIAL(1),
    SIN(1), COS(1), TAN(1), SEC(1), CSC(1), COT(1),
    SINH(1), COSH(1), TANH(1), SECH(1), CSCH(1), COTH(1),
    ASIN(1), ACOS(1), ATAN(1), ASEC(1), ACSC(1), ACOT(1),
    ASINH(1), ACOSH(1), ATANH(1), ASECH(1), ACSCH(1), ACOTH(1),
    MIN(-1), MAX(-1), QUOTIENT(2), REM(2),
    /** a / b where b != 0, and 0 where b == 0 (the flux of a fast reaction whose equilibrium is degenerate). */
    DIV_OR_ZERO(2),
    EQ(2), NEQ(2), LT(2), LE(2), GT(2), GE(2),
    AND(-1), OR(-1), XOR(-1), NOT(1),
    /** Arguments value0, cond0, value1, cond1, ..., [otherwise]. */
    PIECEWISE(-1),
    /** Model-level only: value of argument 0 at time t - argument 1. */
    DELAY(2),
    /** Model-level only: time derivative of a symbol. */
    RATEOF(1);

    private final int arity;

    Op(int arity) {
        this.arity = arity;
    }

    /** Fixed argument count, or -1 for n-ary. */
    public int arity() {
        return arity;
    }

    /** True for leaves (constants, time, variable references). */
    public boolean isLeaf() {
        return ordinal() <= SYMBOL.ordinal();
    }

    /** True for relational operators. */
    public boolean isRelational() {
        return this == EQ || this == NEQ || this == LT || this == LE || this == GT || this == GE;
    }

    /** True for operators whose value is boolean (relational and logical). */
    public boolean isBoolean() {
        return isRelational() || this == AND || this == OR || this == XOR || this == NOT;
    }
}
