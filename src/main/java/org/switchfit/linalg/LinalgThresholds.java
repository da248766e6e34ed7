package org.switchfit.linalg;

/**
 * Switch-over thresholds between dense and sparse kernels, all in one place so tuning touches one file.
 *
 * <p>Measured with the JMH benchmark {@code LuBenchmark} (factor I - cJ plus one solve; medians on a heavily
 * shared 2-core machine, JDK 17, 2026-12-02): n = 300 banded-with-feedback 4.9 ms dense vs 0.39 ms sparse,
 * n = 300 random 4 entries/row 3.7 ms vs 1.9 ms; n = 30: 12-18 us dense vs 6-12 us sparse. Sparse already wins
 * at n = 30 for patterns that sparse, but by less than the noise of that run, so the conservative n &gt;= 100 is
 * kept; re-measure on a quiet machine before lowering it.
 */
public final class LinalgThresholds {

    /** Smallest dimension for which a sparse LU is considered. */
    public static final int SPARSE_MIN_SIZE = 100;

    /** Largest structural density (non-zeros / n^2, diagonal included) for which a sparse LU is chosen. */
    public static final double SPARSE_MAX_DENSITY = 0.10;

    /**
     * Relative pivot threshold of {@link DenseLu}: a pivot with |u_kk| &lt;= SINGULAR_REL * n * max|a_ij| counts as
     * zero (a multiple of machine epsilon, about 1e-15 n).
     */
    public static final double SINGULAR_REL = 8 * Math.ulp(1.0);

    private LinalgThresholds() {
    }
}
