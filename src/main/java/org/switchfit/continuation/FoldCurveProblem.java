package org.switchfit.continuation;

import org.switchfit.ode.OdeSystem;

/**
 * The fold curve as a curve problem in u = (y, v, λ1, λ2), 2n + 2 unknowns:
 * {@code H = (f(y, λ), J(y, λ) v, c^T v - 1)}, 2n + 1 equations (Kuznetsov 2004, Elements of Applied
 * Bifurcation Theory, 3rd ed., sec. 10.2.1, the standard extended system with two free parameters). The
 * normalisation vector c is reset to the current v between steps. Second-derivative blocks of the Jacobian by
 * differences of the analytic J (see {@link FoldMath}). Owns scratch; one thread.
 */
final class FoldCurveProblem implements CurveProblem {
    final OdeSystem sys;
    final int n;
    final int m;
    final int c1;
    final int c2;
    final double[] p;
    final double[] c;
    private final double[] y;
    private final double[] v;
    private final double[] jy;
    private final double[] jp;
    private final double[] dj;
    private final double[] djp;
    private final double[] ys;
    private final double[] js;
    private final double[] ps;
    private final double[] tmp;

    FoldCurveProblem(OdeSystem sys, double[] p, int c1, int c2, double[] c) {
        this.sys = sys;
        this.n = sys.stateCount();
        this.m = sys.parameterCount();
        this.c1 = c1;
        this.c2 = c2;
        this.p = p.clone();
        this.c = c.clone();
        y = new double[n];
        v = new double[n];
        jy = new double[n * n];
        jp = new double[n * m];
        dj = new double[n * n];
        djp = new double[n * n];
        ys = new double[n];
        js = new double[n * n];
        ps = new double[m];
        tmp = new double[n];
    }

    @Override
    public int equationCount() {
        return 2 * n + 1;
    }

    void load(double[] u) {
        System.arraycopy(u, 0, y, 0, n);
        System.arraycopy(u, n, v, 0, n);
        p[c1] = u[2 * n];
        p[c2] = u[2 * n + 1];
    }

    @Override
    public void evaluate(double[] u, double[] h) {
        load(u);
        sys.rhs(0, y, p, tmp);
        System.arraycopy(tmp, 0, h, 0, n);
        sys.jacobianY(0, y, p, jy);
        FoldMath.multiply(jy, v, tmp, n);
        System.arraycopy(tmp, 0, h, n, n);
        double s = -1;
        for (int i = 0; i < n; i++) {
            s += c[i] * v[i];
        }
        h[2 * n] = s;
    }

    @Override
    public void jacobian(double[] u, double[] jac) {
        load(u);
        int w = 2 * n + 2;
        java.util.Arrays.fill(jac, 0, (2 * n + 1) * w, 0);
        sys.jacobianY(0, y, p, jy);
        sys.jacobianP(0, y, p, jp);
        FoldMath.directionalJacobian(sys, y, p, v, dj, ys, js);
        for (int i = 0; i < n; i++) {
            int r1 = i * w;
            int r2 = (n + i) * w;
            for (int j = 0; j < n; j++) {
                jac[r1 + j] = jy[i * n + j];
                jac[r2 + j] = dj[i * n + j];
                jac[r2 + n + j] = jy[i * n + j];
            }
            jac[r1 + 2 * n] = jp[i * m + c1];
            jac[r1 + 2 * n + 1] = jp[i * m + c2];
        }
        int[] ctl = {c1, c2};
        for (int k = 0; k < 2; k++) {
            FoldMath.parameterJacobianDerivative(sys, y, p, ctl[k], djp, ps, js);
            FoldMath.multiply(djp, v, tmp, n);
            for (int i = 0; i < n; i++) {
                jac[(n + i) * w + 2 * n + k] = tmp[i];
            }
        }
        for (int i = 0; i < n; i++) {
            jac[2 * n * w + n + i] = c[i];
        }
    }

    @Override
    public int[][] pattern() {
        int[][] jp = sys.jacobianPattern();
        if (!LinearSolvers.isSparse(n, jp)) {
            return null;
        }
        int[][] out = new int[2 * n + 1][];
        for (int i = 0; i < n; i++) {
            out[i] = LinearSolvers.union(jp[i], 0, null, 0, 2 * n, 2 * n + 1);
            // D_v J has the structure of J (derivatives of structural zeros vanish).
            out[n + i] = LinearSolvers.union(jp[i], 0, jp[i], n, 2 * n, 2 * n + 1);
        }
        out[2 * n] = LinearSolvers.denseRow(n, 2 * n);
        return out;
    }

    /** Parameters at u (a copy). */
    double[] parametersAt(double[] u) {
        double[] q = p.clone();
        q[c1] = u[2 * n];
        q[c2] = u[2 * n + 1];
        return q;
    }
}
