package org.switchfit.model;

import org.switchfit.expr.Expr;

/** An assignment, rate or algebraic rule. {@code variable} is null for algebraic rules (0 = math). */
public record Rule(Kind kind, String variable, Expr math, String elementId) {
    /** Rule kinds. */
    public enum Kind { ASSIGNMENT, RATE, ALGEBRAIC }
}
