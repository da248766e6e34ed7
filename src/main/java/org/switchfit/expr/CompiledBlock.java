package org.switchfit.expr;

/**
 * A {@link Block} compiled to JVM bytecode. Immutable and thread-safe; allocates nothing per call (split blocks use
 * a per-thread scratch array).
 */
public interface CompiledBlock {

    /** Writes the block's outputs into {@code out[0..outputCount)}; reads t, y and p only. */
    void eval(double t, double[] y, double[] p, double[] out);
}
