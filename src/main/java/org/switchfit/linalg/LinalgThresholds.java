package org.switchfit.linalg;

/**
 * Switch-over thresholds between dense and sparse kernels, all in one place so tuning touches one file.
 * Values chosen from the JMH benchmark {@code LuBenchmark} (dense vs sparse at n = 30 and 300) on a 2-core
 * machine; re-measure before changing them.
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
