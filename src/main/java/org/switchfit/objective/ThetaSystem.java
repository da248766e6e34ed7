package org.switchfit.objective;

import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.OdeSystem;

/**
 * The model ODE seen with nc extra parameter columns whose ∂f/∂(column c) = Σ_k ∂f/∂p_k · dp_k/dθ_c: lets the
 * staggered BDF sensitivities (one parameter index per column) integrate dy/dθ directly for θ that enter several
 * effective parameters (initial assignments, shared parameters). Parameter vector: {@code [p_eff (m) | nc unused]}.
 * Column c's non-zero dp/dθ_c entries are set with {@link #setColumn}. One instance per thread (holds scratch).
 */
final class ThetaSystem implements OdeSystem {
    private final CompiledModel model;
    private final int n;
    private final int m;
    private final int nc;
    private final double[] scratch;
    final int[][] colIndex;
    final double[][] colValue;
    final int[] colLength;
    /** True once scratch holds zeros off the structural non-zeros of ∂f/∂p. */
    private boolean scratchCleared;

    ThetaSystem(CompiledModel model, int nc) {
        this.model = model;
        this.n = model.stateCount();
        this.m = model.parameterCount();
        this.nc = nc;
        this.scratch = new double[n * m];
        this.colIndex = new int[nc][m];
        this.colValue = new double[nc][m];
        this.colLength = new int[nc];
    }

    /** Sets column c from a dense m x nc array {@code d[k * nc + c]}. */
    void setColumns(double[] d) {
        for (int c = 0; c < nc; c++) {
            int len = 0;
            for (int k = 0; k < m; k++) {
                double v = d[k * nc + c];
                if (v != 0.0) {
                    colIndex[c][len] = k;
                    colValue[c][len] = v;
                    len++;
                }
            }
            colLength[c] = len;
        }
    }

    @Override
    public int stateCount() {
        return n;
    }

    @Override
    public int parameterCount() {
        return m + nc;
    }

    @Override
    public void rhs(double t, double[] y, double[] p, double[] dydt) {
        model.rhs(t, y, p, dydt);
    }

    @Override
    public void jacobianY(double t, double[] y, double[] p, double[] jacY) {
        model.jacobianY(t, y, p, jacY);
    }

    @Override
    public void jacobianP(double t, double[] y, double[] p, double[] jacP) {
        model.jacobianP(t, y, p, scratch);
        int mt = m + nc;
        for (int i = 0; i < n; i++) {
            int row = i * m;
            int out = i * mt;
            System.arraycopy(scratch, row, jacP, out, m);
            for (int c = 0; c < nc; c++) {
                int[] idx = colIndex[c];
                double[] val = colValue[c];
                int len = colLength[c];
                double s = 0.0;
                for (int e = 0; e < len; e++) {
                    s += scratch[row + idx[e]] * val[e];
                }
                jacP[out + m + c] = s;
            }
        }
    }

    /**
     * Only the requested columns: the model's ∂f/∂p is evaluated on its non-zeros into the per-thread scratch
     * (cleared once, then only the same structural entries are overwritten), without the dense copy.
     */
    @Override
    public void jacobianPColumns(double t, double[] y, double[] p, int[] cols, double[] out, double[] work) {
        if (scratchCleared) {
            model.jacobianPNonzeros(t, y, p, scratch);
        } else {
            model.jacobianP(t, y, p, scratch);
            scratchCleared = true;
        }
        for (int c = 0; c < cols.length; c++) {
            int k = cols[c];
            int off = c * n;
            if (k < 0) {
                java.util.Arrays.fill(out, off, off + n, 0.0);
            } else if (k < m) {
                for (int i = 0; i < n; i++) {
                    out[off + i] = scratch[i * m + k];
                }
            } else {
                int[] idx = colIndex[k - m];
                double[] val = colValue[k - m];
                int len = colLength[k - m];
                for (int i = 0; i < n; i++) {
                    int row = i * m;
                    double sum = 0.0;
                    for (int e = 0; e < len; e++) {
                        sum += scratch[row + idx[e]] * val[e];
                    }
                    out[off + i] = sum;
                }
            }
        }
    }

    @Override
    public int jacobianPColumnsWork() {
        return 0;
    }

    @Override
    public int[][] jacobianPattern() {
        return model.jacobianPattern();
    }
}
