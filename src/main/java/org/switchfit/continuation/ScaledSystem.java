package org.switchfit.continuation;

import java.util.Locale;
import org.switchfit.ode.OdeSystem;

/**
 * A system in scaled unknowns, for continuation when states and the control differ by many orders of magnitude
 * (a 500-species signalling model has states up to 1e9 and a ligand dose near 1e-9): states {@code z_i = y_i / d_i}
 * and control {@code μ = λ / s}, so the Euclidean arclength of {@link PseudoArclength} weighs relative changes.
 * This is the diagonal scaling of the unknowns recommended for continuation (Allgower and Georg 1990/2003,
 * Introduction to Numerical Continuation Methods, SIAM, sec. 6.1 on step length and scaling).
 *
 * <p>Right-hand side {@code g(z, μ) = D^-1 f(D z, λ = s μ)}, so {@code g_z = D^-1 J D} and
 * {@code g_μ = s D^-1 f_λ}; other parameters are unchanged. Zeros, folds (singular g_z iff singular J) and
 * stability (g_z is similar to J) are those of the original system. Immutable and thread-safe (scratch per
 * thread).
 */
public final class ScaledSystem implements OdeSystem {
    private final OdeSystem sys;
    private final double[] d;
    private final int control;
    private final double s;
    private final ThreadLocal<double[][]> work;

    /**
     * @param sys          system to scale
     * @param stateScale   d_i &gt; 0, one per state
     * @param control      index of the scaled parameter
     * @param controlScale s &gt; 0
     */
    public ScaledSystem(OdeSystem sys, double[] stateScale, int control, double controlScale) {
        int n = sys.stateCount();
        if (stateScale.length != n || control < 0 || control >= sys.parameterCount() || !(controlScale > 0)
                || !Double.isFinite(controlScale)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "need %d positive state scales, a control index in [0, %d) and a finite control scale > 0; "
                            + "got %d scales, index %d, scale %.3g", n, sys.parameterCount(), stateScale.length,
                    control, controlScale));
        }
        for (double v : stateScale) {
            if (!(v > 0) || !Double.isFinite(v)) {
                throw new IllegalArgumentException("state scales must be finite and > 0, got " + v);
            }
        }
        this.sys = sys;
        this.d = stateScale.clone();
        this.control = control;
        this.s = controlScale;
        int m = sys.parameterCount();
        this.work = ThreadLocal.withInitial(() -> new double[][] {new double[n], new double[m]});
    }

    /**
     * Scales from a reference state: {@code d_i = max(|y_i|, 1e-6 max_j |y_j|)} (1 when y is all zero), and
     * {@code s = max(|λ|, |lo|, |hi|)} over the start value and range of the control (1 when all are zero).
     */
    public static ScaledSystem around(OdeSystem sys, double[] y, int control, double lambda, double lo, double hi) {
        double max = 0;
        for (double v : y) {
            max = Math.max(max, Math.abs(v));
        }
        double floor = max > 0 ? 1e-6 * max : 1;
        double[] d = new double[y.length];
        for (int i = 0; i < y.length; i++) {
            d[i] = Math.max(Math.abs(y[i]), floor);
        }
        double sc = Math.max(Math.abs(lambda), Math.max(Math.abs(lo), Math.abs(hi)));
        return new ScaledSystem(sys, d, control, sc > 0 ? sc : 1);
    }

    /** Scaled state of y (new array). */
    public double[] scaleState(double[] y) {
        double[] z = new double[y.length];
        for (int i = 0; i < y.length; i++) {
            z[i] = y[i] / d[i];
        }
        return z;
    }

    /** Original state of z (new array). */
    public double[] unscaleState(double[] z) {
        double[] y = new double[z.length];
        for (int i = 0; i < z.length; i++) {
            y[i] = z[i] * d[i];
        }
        return y;
    }

    /** Scaled parameters of p (new array). */
    public double[] scaleParameters(double[] p) {
        double[] q = p.clone();
        q[control] = p[control] / s;
        return q;
    }

    /** Control value λ of a scaled control value μ. */
    public double unscaleControl(double mu) {
        return mu * s;
    }

    /** Scaled control value μ of λ. */
    public double scaleControl(double lambda) {
        return lambda / s;
    }

    private double[] state(double[] z) {
        double[] y = work.get()[0];
        for (int i = 0; i < z.length; i++) {
            y[i] = z[i] * d[i];
        }
        return y;
    }

    private double[] params(double[] q) {
        double[] p = work.get()[1];
        System.arraycopy(q, 0, p, 0, q.length);
        p[control] = q[control] * s;
        return p;
    }

    @Override
    public int stateCount() {
        return sys.stateCount();
    }

    @Override
    public int parameterCount() {
        return sys.parameterCount();
    }

    @Override
    public void rhs(double t, double[] z, double[] q, double[] out) {
        sys.rhs(t, state(z), params(q), out);
        for (int i = 0; i < out.length; i++) {
            out[i] /= d[i];
        }
    }

    @Override
    public void jacobianY(double t, double[] z, double[] q, double[] jac) {
        int n = d.length;
        sys.jacobianY(t, state(z), params(q), jac);
        for (int i = 0; i < n; i++) {
            double ri = 1 / d[i];
            int row = i * n;
            for (int j = 0; j < n; j++) {
                jac[row + j] *= ri * d[j];
            }
        }
    }

    @Override
    public void jacobianP(double t, double[] z, double[] q, double[] jac) {
        int n = d.length;
        int m = sys.parameterCount();
        sys.jacobianP(t, state(z), params(q), jac);
        for (int i = 0; i < n; i++) {
            double ri = 1 / d[i];
            int row = i * m;
            for (int k = 0; k < m; k++) {
                jac[row + k] *= k == control ? ri * s : ri;
            }
        }
    }

    @Override
    public int[][] jacobianPattern() {
        return sys.jacobianPattern();
    }
}
