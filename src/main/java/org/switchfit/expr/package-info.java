/**
 * Immutable expression trees, simplification, symbolic derivatives, a reference interpreter and compilation to JVM bytecode.
 *
 * <p>Layering: may import project packages {util} only.
 */
package org.switchfit.expr;
