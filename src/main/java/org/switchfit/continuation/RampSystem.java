package org.switchfit.continuation;

import org.switchfit.ode.OdeSystem;

/**
 * A system whose control parameter is driven as an extra state: states (y, λ), {@code λ' = rate},
 * {@code y' = f(y, p with p[control] = λ)}. The parameter entry p[control] itself is ignored. Immutable and
 * thread-safe; scratch parameters live in a per-thread workspace.
 */
final class RampSystem implements OdeSystem {
    private final OdeSystem sys;
    private final int control;
    private final double rate;
    private final int n;
    private final int m;
    private final ThreadLocal<double[][]> work;

    RampSystem(OdeSystem sys, int control, double rate) {
        this.sys = sys;
        this.control = control;
        this.rate = rate;
        this.n = sys.stateCount();
        this.m = sys.parameterCount();
        int nn = n;
        int mm = m;
        this.work = ThreadLocal.withInitial(() -> new double[][] {new double[mm], new double[nn * mm],
            new double[nn * nn]});
    }

    @Override
    public int stateCount() {
        return n + 1;
    }

    @Override
    public int parameterCount() {
        return m;
    }

    private double[] params(double[] y, double[] p) {
        double[] q = work.get()[0];
        System.arraycopy(p, 0, q, 0, m);
        q[control] = y[n];
        return q;
    }

    @Override
    public void rhs(double t, double[] y, double[] p, double[] dydt) {
        // The inner system writes n entries; y may be longer (it reads only its first n).
        sys.rhs(t, y, params(y, p), dydt);
        dydt[n] = rate;
    }

    @Override
    public void jacobianY(double t, double[] y, double[] p, double[] jac) {
        double[][] w = work.get();
        double[] q = params(y, p);
        sys.jacobianY(t, y, q, w[2]);
        sys.jacobianP(t, y, q, w[1]);
        int n1 = n + 1;
        for (int i = 0; i < n; i++) {
            System.arraycopy(w[2], i * n, jac, i * n1, n);
            jac[i * n1 + n] = w[1][i * m + control];
        }
        java.util.Arrays.fill(jac, n * n1, n1 * n1, 0);
    }

    @Override
    public void jacobianP(double t, double[] y, double[] p, double[] jac) {
        sys.jacobianP(t, y, params(y, p), jac);
        for (int i = 0; i < n; i++) {
            jac[i * m + control] = 0;
        }
        java.util.Arrays.fill(jac, n * m, (n + 1) * m, 0);
    }
}
