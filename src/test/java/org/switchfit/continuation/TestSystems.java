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

    /**
     * Goldbeter-Koshland cycle with explicit complexes and positive feedback of Sp on the kinase's catalytic step;
     * species (S, Sp, E, F, ES, FSp), reactions S+E->ES (k1 S E), ES->S+E (d1 ES), ES->Sp+E
     * (c1 (1 + alpha Sp^2/(K^2+Sp^2)) ES), Sp+F->FSp (k2 Sp F), FSp->Sp+F (d2 FSp), FSp->S+F (c2 FSp).
     * Parameters (k1, d1, c1, k2, d2, c2, alpha, K).
     */
    static final int[][] GK_STOICH = {
        {-1, 1, 0, 0, 0, 1},
        {0, 0, 1, -1, 1, 0},
        {-1, 1, 1, 0, 0, 0},
        {0, 0, 0, -1, 1, 1},
        {1, -1, -1, 0, 0, 0},
        {0, 0, 0, 1, -1, -1}};

    static final OdeSystem GK_FEEDBACK = new OdeSystem() {
        @Override
        public int stateCount() {
            return 6;
        }

        @Override
        public int parameterCount() {
            return 8;
        }

        private void rates(double[] y, double[] p, double[] v) {
            double sp = y[1];
            double h = sp * sp / (p[7] * p[7] + sp * sp);
            v[0] = p[0] * y[0] * y[2];
            v[1] = p[1] * y[4];
            v[2] = p[2] * (1 + p[6] * h) * y[4];
            v[3] = p[3] * y[1] * y[3];
            v[4] = p[4] * y[5];
            v[5] = p[5] * y[5];
        }

        @Override
        public void rhs(double t, double[] y, double[] p, double[] d) {
            double[] v = new double[6];
            rates(y, p, v);
            for (int i = 0; i < 6; i++) {
                double s = 0;
                for (int j = 0; j < 6; j++) {
                    s += GK_STOICH[i][j] * v[j];
                }
                d[i] = s;
            }
        }

        /** dv_j/dy_k, flat [j * 6 + k]. */
        private void rateJac(double[] y, double[] p, double[] dv) {
            java.util.Arrays.fill(dv, 0);
            double sp = y[1];
            double k2 = p[7] * p[7];
            double den = k2 + sp * sp;
            double h = sp * sp / den;
            double dh = 2 * sp * k2 / (den * den);
            dv[0] = p[0] * y[2];
            dv[2] = p[0] * y[0];
            dv[6 + 4] = p[1];
            dv[12 + 1] = p[2] * p[6] * dh * y[4];
            dv[12 + 4] = p[2] * (1 + p[6] * h);
            dv[18 + 1] = p[3] * y[3];
            dv[18 + 3] = p[3] * y[1];
            dv[24 + 5] = p[4];
            dv[30 + 5] = p[5];
        }

        @Override
        public void jacobianY(double t, double[] y, double[] p, double[] jac) {
            double[] dv = new double[36];
            rateJac(y, p, dv);
            for (int i = 0; i < 6; i++) {
                for (int k = 0; k < 6; k++) {
                    double s = 0;
                    for (int j = 0; j < 6; j++) {
                        s += GK_STOICH[i][j] * dv[j * 6 + k];
                    }
                    jac[i * 6 + k] = s;
                }
            }
        }

        @Override
        public void jacobianP(double t, double[] y, double[] p, double[] jac) {
            double sp = y[1];
            double k2 = p[7] * p[7];
            double den = k2 + sp * sp;
            double h = sp * sp / den;
            double[] dv = new double[6 * 8];
            dv[0] = y[0] * y[2];
            dv[8 + 1] = y[4];
            dv[16 + 2] = (1 + p[6] * h) * y[4];
            dv[16 + 6] = p[2] * h * y[4];
            dv[16 + 7] = p[2] * p[6] * (-2 * p[7] * sp * sp / (den * den)) * y[4];
            dv[24 + 3] = y[1] * y[3];
            dv[32 + 4] = y[5];
            dv[40 + 5] = y[5];
            for (int i = 0; i < 6; i++) {
                for (int k = 0; k < 8; k++) {
                    double s = 0;
                    for (int j = 0; j < 6; j++) {
                        s += GK_STOICH[i][j] * dv[j * 8 + k];
                    }
                    jac[i * 8 + k] = s;
                }
            }
        }
    };

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
