package org.switchfit.ode;

/**
 * An ODE right-hand side {@code dy/dt = f(t, y, p)} with its Jacobians: the contract between model code
 * (compiled from a model) and every solver, sensitivity and continuation routine.
 *
 * <p>Array layouts (all flat, row-major, owned by the caller; implementations keep no reference):
 * <ul>
 *   <li>{@code y[i]}, {@code i < n = stateCount()}; {@code p[k]}, {@code k < m = parameterCount()}.</li>
 *   <li>{@code jacY[i * n + j] = ∂f_i/∂y_j}.</li>
 *   <li>{@code jacP[i * m + k] = ∂f_i/∂p_k}.</li>
 * </ul>
 * Implementations are immutable and thread-safe, and allocate nothing per call. The dense Jacobian methods write
 * every entry (zeros included).
 */
public interface OdeSystem {

    /** Number of states n. */
    int stateCount();

    /** Number of parameters m. */
    int parameterCount();

    /** Writes {@code dydt[0..n)} = f(t, y, p). */
    void rhs(double t, double[] y, double[] p, double[] dydt);

    /** Writes {@code jacY[i * n + j] = ∂f_i/∂y_j} for all i, j. */
    void jacobianY(double t, double[] y, double[] p, double[] jacY);

    /** Writes {@code jacP[i * m + k] = ∂f_i/∂p_k} for all i, k. */
    void jacobianP(double t, double[] y, double[] p, double[] jacP);

    /**
     * Writes selected columns of ∂f/∂p: {@code out[c * n + i] = ∂f_i/∂p_k} with {@code k = cols[c]}, and zeros for
     * {@code k = -1}. The default evaluates the whole {@link #jacobianP} into {@code work} and copies the columns;
     * systems that can produce a few columns without the dense n x m matrix override it (and may ignore work).
     *
     * @param cols parameter index per column, in [-1, m)
     * @param out  receives the columns (length &gt;= cols.length * n)
     * @param work scratch of length &gt;= {@link #jacobianPColumnsWork()} (content undefined on exit)
     */
    default void jacobianPColumns(double t, double[] y, double[] p, int[] cols, double[] out, double[] work) {
        int n = stateCount();
        int m = parameterCount();
        jacobianP(t, y, p, work);
        for (int c = 0; c < cols.length; c++) {
            int k = cols[c];
            int off = c * n;
            for (int i = 0; i < n; i++) {
                out[off + i] = k >= 0 ? work[i * m + k] : 0.0;
            }
        }
    }

    /** Length of the scratch {@link #jacobianPColumns} needs: n * m for the default, 0 when overridden without. */
    default int jacobianPColumnsWork() {
        return stateCount() * parameterCount();
    }

    /**
     * Structural non-zero pattern of ∂f/∂y: {@code pattern[i]} lists, in increasing order, the columns j for which
     * ∂f_i/∂y_j may be non-zero. The default claims a dense Jacobian.
     */
    default int[][] jacobianPattern() {
        int n = stateCount();
        int[][] pattern = new int[n][n];
        for (int i = 0; i < n; i++) {
            for (int j = 0; j < n; j++) {
                pattern[i][j] = j;
            }
        }
        return pattern;
    }
}
