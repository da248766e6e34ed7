package org.switchfit.linalg;

/**
 * An immutable, thread-safe decision "dense or sparse LU" for one matrix structure, with the sparse symbolic
 * analysis done once. Create one per structure (for example per compiled model) and call {@link #newSolver()} per
 * thread or per integration: workspaces are cheap, the analysis is not.
 */
public final class LuPlan {

    private final int n;
    private final SparseLu.Symbolic symbolic;

    private LuPlan(int n, SparseLu.Symbolic symbolic) {
        this.n = n;
        this.symbolic = symbolic;
    }

    /**
     * Plans for n x n matrices with the given structure ({@link LuSolvers#useSparse} decides the kernel).
     *
     * @param n       dimension
     * @param pattern row-wise structure (diagonal implied) or null for dense
     */
    public static LuPlan of(int n, int[][] pattern) {
        if (n < 0) {
            throw new IllegalArgumentException("dimension must be >= 0, got " + n);
        }
        boolean sparse = pattern != null && LuSolvers.useSparse(n, pattern);
        return new LuPlan(n, sparse ? SparseLu.analyze(n, pattern) : null);
    }

    /** True when the plan uses the sparse kernel. */
    public boolean isSparse() {
        return symbolic != null;
    }

    /** Dimension n. */
    public int size() {
        return n;
    }

    /** A new workspace following this plan. */
    public LuSolver newSolver() {
        return symbolic != null ? new SparseLu(symbolic) : new DenseLu(n);
    }
}
