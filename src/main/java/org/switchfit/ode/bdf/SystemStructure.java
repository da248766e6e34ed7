package org.switchfit.ode.bdf;

import java.lang.ref.WeakReference;
import java.util.Collections;
import java.util.Map;
import java.util.WeakHashMap;
import org.switchfit.linalg.DenseLu;
import org.switchfit.linalg.LuPlan;
import org.switchfit.linalg.LuSolver;
import org.switchfit.linalg.SparsePattern;
import org.switchfit.ode.OdeSystem;

/**
 * Per-system structural data shared by all sessions on that system: the LU plan (dense/sparse choice and the
 * sparse symbolic analysis) and the Jacobian pattern in compressed-row form (for sensitivity products J s).
 * Immutable; cached per system instance with weak keys so repeated integrations of one model (fitting,
 * multistart) pay the ordering cost once. Thread-safe.
 */
final class SystemStructure {

    private static final Map<OdeSystem, SystemStructure> CACHE = Collections.synchronizedMap(new WeakHashMap<>());

    /** Identity check: the cache must not share structures between merely equal() systems. */
    private final WeakReference<OdeSystem> owner;
    final LuPlan plan;
    /** Row i of the pattern occupies colIndex[rowStart[i] .. rowStart[i+1]). */
    final int[] rowStart;
    final int[] colIndex;

    private SystemStructure(OdeSystem owner, LuPlan plan, int[] rowStart, int[] colIndex) {
        this.owner = new WeakReference<>(owner);
        this.plan = plan;
        this.rowStart = rowStart;
        this.colIndex = colIndex;
    }

    /**
     * A new LU workspace for the iteration matrix M = I - gamma J. Dense: {@link DenseLu} with the exact-zero pivot
     * test, as the Newton iteration needs no more (a useless correction from a nearly singular M fails the
     * convergence test, which then shrinks the step). The default relative test (pivot below about 8 eps n max|m_ij|)
     * misjudges badly scaled but regular matrices: with one Jacobian entry of 1e19 and a state whose own rate is
     * 1e-8, I - gamma J has a unit pivot beside entries of gamma 1e19, so every step with gamma above a few 1e-6
     * counted as singular and the steps stayed near 1e-5 for good (measured on the PEtab benchmark
     * Fujita_SciSignal2010 at parameters on its bounds: 500000 steps reached t = 0.74 of 3600). Sparse: the
     * plan's solver.
     */
    LuSolver newIterationSolver() {
        return plan.isSparse() ? plan.newSolver() : DenseLu.withPivotThreshold(plan.size(), 0.0);
    }

    static SystemStructure of(OdeSystem sys) {
        SystemStructure s = CACHE.get(sys);
        if (s == null || s.owner.get() != sys) {
            s = analyze(sys);
            CACHE.put(sys, s);
        }
        return s;
    }

    private static SystemStructure analyze(OdeSystem sys) {
        int n = sys.stateCount();
        int[][] pattern = sys.jacobianPattern();
        long nnz = SparsePattern.countWithDiagonal(n, pattern);
        int[] rowStart = new int[n + 1];
        int[] colIndex = new int[Math.toIntExact(nnz)];
        int pos = 0;
        for (int i = 0; i < n; i++) {
            rowStart[i] = pos;
            for (int j : pattern[i]) {
                colIndex[pos++] = j;
            }
        }
        rowStart[n] = pos;
        return new SystemStructure(sys, LuPlan.of(n, pattern), rowStart, java.util.Arrays.copyOf(colIndex, pos));
    }
}
