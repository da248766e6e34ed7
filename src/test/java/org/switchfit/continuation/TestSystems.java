package org.switchfit.continuation;

import org.switchfit.ode.OdeSystem;

/** Hand-written test systems (a few lines each) with analytic Jacobians. */
final class TestSystems {
    private TestSystems() {
    }

    /** x' = -x^3 + q x + p; parameters (p, q). */
    static final OdeSystem CUBIC = new OdeSystem() {
        @Override
        public int stateCount() {
            return 1;
        }

        @Override
        public int parameterCount() {
            return 2;
        }

        @Override
        public void rhs(double t, double[] y, double[] p, double[] d) {
            d[0] = -y[0] * y[0] * y[0] + p[1] * y[0] + p[0];
        }

        @Override
        public void jacobianY(double t, double[] y, double[] p, double[] j) {
            j[0] = -3 * y[0] * y[0] + p[1];
        }

        @Override
        public void jacobianP(double t, double[] y, double[] p, double[] j) {
            j[0] = 1;
            j[1] = y[0];
        }
    };

    /** x' = a + b x^2 / (K^2 + x^2) - d x; parameters (a, b, K, d). */
    static final OdeSystem FEEDBACK = new OdeSystem() {
        @Override
        public int stateCount() {
            return 1;
        }

        @Override
        public int parameterCount() {
            return 4;
        }

        @Override
        public void rhs(double t, double[] y, double[] p, double[] d) {
            double x = y[0];
            d[0] = p[0] + p[1] * x * x / (p[2] * p[2] + x * x) - p[3] * x;
        }

        @Override
        public void jacobianY(double t, double[] y, double[] p, double[] j) {
            double x = y[0];
            double k2 = p[2] * p[2];
            double den = k2 + x * x;
            j[0] = p[1] * 2 * x * k2 / (den * den) - p[3];
        }

        @Override
        public void jacobianP(double t, double[] y, double[] p, double[] j) {
            double x = y[0];
            double den = p[2] * p[2] + x * x;
            j[0] = 1;
            j[1] = x * x / den;
            j[2] = -p[1] * x * x * 2 * p[2] / (den * den);
            j[3] = -x;
        }
    };

    /**
     * Brusselator u' = a - (b + 1) u + u^2 v, v' = b u - u^2 v; parameters (a, b).
     * Equilibrium (a, b / a); Hopf at b = 1 + a^2 (closed form: trace of J = b - 1 - a^2, det = a^2 > 0).
     */
    static final OdeSystem BRUSSELATOR = new OdeSystem() {
        @Override
        public int stateCount() {
            return 2;
        }

        @Override
        public int parameterCount() {
            return 2;
        }

        @Override
        public void rhs(double t, double[] y, double[] p, double[] d) {
            double u = y[0];
            double v = y[1];
            d[0] = p[0] - (p[1] + 1) * u + u * u * v;
            d[1] = p[1] * u - u * u * v;
        }

        @Override
        public void jacobianY(double t, double[] y, double[] p, double[] j) {
            double u = y[0];
            double v = y[1];
            j[0] = -(p[1] + 1) + 2 * u * v;
            j[1] = u * u;
            j[2] = p[1] - 2 * u * v;
            j[3] = -u * u;
        }

        @Override
        public void jacobianP(double t, double[] y, double[] p, double[] j) {
            j[0] = 1;
            j[1] = -y[0];
            j[2] = 0;
            j[3] = y[0];
        }
    };

    /**
     * Phosphorylation cycle with positive feedback on the kinase, states (S, Sp), S + Sp conserved:
     * Sp' = (k0 + k1 Sp^2 / (K^2 + Sp^2)) S - k2 Sp, S' = -Sp'. Parameters (k0, k1, K, k2).
     * Stoichiometry (one phosphorylation, one dephosphorylation reaction): S: (-1, 1), Sp: (1, -1).
     */
    static final OdeSystem PHOSPHO_FEEDBACK = new OdeSystem() {
        @Override
        public int stateCount() {
            return 2;
        }

        @Override
        public int parameterCount() {
            return 4;
        }

        @Override
        public void rhs(double t, double[] y, double[] p, double[] d) {
            double s = y[0];
            double x = y[1];
            double act = p[0] + p[1] * x * x / (p[2] * p[2] + x * x);
            double net = act * s - p[3] * x;
            d[0] = -net;
            d[1] = net;
        }

        @Override
        public void jacobianY(double t, double[] y, double[] p, double[] j) {
            double s = y[0];
            double x = y[1];
            double k2 = p[2] * p[2];
            double den = k2 + x * x;
            double act = p[0] + p[1] * x * x / den;
            double dact = p[1] * 2 * x * k2 / (den * den);
            double dns = act;
            double dnx = dact * s - p[3];
            j[0] = -dns;
            j[1] = -dnx;
            j[2] = dns;
            j[3] = dnx;
        }

        @Override
        public void jacobianP(double t, double[] y, double[] p, double[] j) {
            double s = y[0];
            double x = y[1];
            double den = p[2] * p[2] + x * x;
            double[] g = {s, s * x * x / den, -s * p[1] * x * x * 2 * p[2] / (den * den), -x};
            for (int k = 0; k < 4; k++) {
                j[k] = -g[k];
                j[4 + k] = g[k];
            }
        }
    };

    static final int[][] PHOSPHO_STOICH = {{-1, 1}, {1, -1}};

    /** Central finite-difference check helper: max relative deviation of jacobianY from differences of rhs. */
    static double jacobianYError(OdeSystem sys, double[] y, double[] p) {
        int n = sys.stateCount();
        double[] jac = new double[n * n];
        sys.jacobianY(0, y, p, jac);
        double[] fp = new double[n];
        double[] fm = new double[n];
        double worst = 0;
        for (int j = 0; j < n; j++) {
            double h = 1e-6 * Math.max(1, Math.abs(y[j]));
            double[] yp = y.clone();
            double[] ym = y.clone();
            yp[j] += h;
            ym[j] -= h;
            sys.rhs(0, yp, p, fp);
            sys.rhs(0, ym, p, fm);
            for (int i = 0; i < n; i++) {
                double fd = (fp[i] - fm[i]) / (2 * h);
                worst = Math.max(worst, Math.abs(fd - jac[i * n + j]) / Math.max(1, Math.abs(fd)));
            }
        }
        return worst;
    }

    /** Same for jacobianP. */
    static double jacobianPError(OdeSystem sys, double[] y, double[] p) {
        int n = sys.stateCount();
        int m = sys.parameterCount();
        double[] jac = new double[n * m];
        sys.jacobianP(0, y, p, jac);
        double[] fp = new double[n];
        double[] fm = new double[n];
        double worst = 0;
        for (int k = 0; k < m; k++) {
            double h = 1e-6 * Math.max(1, Math.abs(p[k]));
            double[] pp = p.clone();
            double[] pm = p.clone();
            pp[k] += h;
            pm[k] -= h;
            sys.rhs(0, y, pp, fp);
            sys.rhs(0, y, pm, fm);
            for (int i = 0; i < n; i++) {
                double fd = (fp[i] - fm[i]) / (2 * h);
                worst = Math.max(worst, Math.abs(fd - jac[i * m + k]) / Math.max(1, Math.abs(fd)));
            }
        }
        return worst;
    }
}
