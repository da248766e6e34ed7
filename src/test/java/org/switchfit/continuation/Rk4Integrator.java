package org.switchfit.continuation;

import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.Integrator;
import org.switchfit.ode.OdeSystem;
import org.switchfit.ode.RootFunctions;
import org.switchfit.ode.SolverStats;

/**
 * Test-scope fixed-step classical Runge-Kutta (RK4; Hairer, Norsett and Wanner, Solving ODEs I, 2nd ed. 1993,
 * sec. II.1): no roots, no sensitivities. Steps of h, the last one shortened to land on tOut.
 */
final class Rk4Integrator implements Integrator {
    private final double h;

    Rk4Integrator(double h) {
        this.h = h;
    }

    @Override
    public IntegrationSession start(OdeSystem sys, double t0, double[] y0, double[] p, RootFunctions roots,
                                    int[] sensParams, double[] s0) {
        if (roots != null || sensParams != null) {
            throw new UnsupportedOperationException("test RK4 has no roots or sensitivities");
        }
        return new Session(sys, t0, y0.clone(), p);
    }

    private final class Session implements IntegrationSession {
        private final OdeSystem sys;
        private final double[] p;
        private final double[] y;
        private final double[] k1;
        private final double[] k2;
        private final double[] k3;
        private final double[] k4;
        private final double[] tmp;
        private double t;
        private long steps;

        Session(OdeSystem sys, double t0, double[] y, double[] p) {
            this.sys = sys;
            this.t = t0;
            this.y = y;
            this.p = p;
            int n = y.length;
            k1 = new double[n];
            k2 = new double[n];
            k3 = new double[n];
            k4 = new double[n];
            tmp = new double[n];
        }

        @Override
        public double advance(double tOut, double[] yOut, double[] sOut) {
            int n = y.length;
            while (t < tOut) {
                double dt = Math.min(h, tOut - t);
                sys.rhs(t, y, p, k1);
                for (int i = 0; i < n; i++) {
                    tmp[i] = y[i] + 0.5 * dt * k1[i];
                }
                sys.rhs(t + 0.5 * dt, tmp, p, k2);
                for (int i = 0; i < n; i++) {
                    tmp[i] = y[i] + 0.5 * dt * k2[i];
                }
                sys.rhs(t + 0.5 * dt, tmp, p, k3);
                for (int i = 0; i < n; i++) {
                    tmp[i] = y[i] + dt * k3[i];
                }
                sys.rhs(t + dt, tmp, p, k4);
                for (int i = 0; i < n; i++) {
                    y[i] += dt / 6 * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]);
                }
                t = tOut - t <= h ? tOut : t + dt;
                steps++;
            }
            System.arraycopy(y, 0, yOut, 0, n);
            return t;
        }

        @Override
        public boolean stoppedAtRoot() {
            return false;
        }

        @Override
        public int[] rootsFound() {
            return new int[0];
        }

        @Override
        public double time() {
            return t;
        }

        @Override
        public void reset(double[] yNew, double[] s) {
            System.arraycopy(yNew, 0, y, 0, y.length);
        }

        @Override
        public SolverStats stats() {
            return new SolverStats(steps, 0, 4 * steps, 0, 0);
        }
    }
}
