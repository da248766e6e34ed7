package org.switchfit.model;

import org.switchfit.expr.Expr;

/** Sets the value of {@code symbol} at the start of a simulation. */
public record InitialAssignment(String symbol, Expr math) {
}
