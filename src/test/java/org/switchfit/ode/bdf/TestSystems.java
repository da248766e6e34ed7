package org.switchfit.ode.bdf;

import org.switchfit.ode.OdeSystem;
import org.switchfit.testsystems.StiffSystems;

/** Small ODE systems with hand-written Jacobians for the integrator tests. */
final class TestSystems {

    private TestSystems() {
    }

    /** y' = -k y, p = {k}. */
    static final OdeSystem DECAY = new OdeSystem() {
        public int stateCount() {
            return 1;
        }

        public int parameterCount() {
            return 1;
        }

        public void rhs(double t, double[] y, double[] p, double[] d) {
            d[0] = -p[0] * y[0];
        }

        public void jacobianY(double t, double[] y, double[] p, double[] j) {
            j[0] = -p[0];
        }

        public void jacobianP(double t, double[] y, double[] p, double[] j) {
            j[0] = -y[0];
        }
    };

    /** A &lt;-&gt; B: a' = -k1 a + k2 b, b' = k1 a - k2 b; p = {k1, k2}. */
    static final OdeSystem REVERSIBLE = new OdeSystem() {
        public int stateCount() {
            return 2;
        }

        public int parameterCount() {
            return 2;
        }

        public void rhs(double t, double[] y, double[] p, double[] d) {
            double r = p[0] * y[0] - p[1] * y[1];
            d[0] = -r;
            d[1] = r;
        }

        public void jacobianY(double t, double[] y, double[] p, double[] j) {
            j[0] = -p[0];
            j[1] = p[1];
            j[2] = p[0];
            j[3] = -p[1];
        }

        public void jacobianP(double t, double[] y, double[] p, double[] j) {
            j[0] = -y[0];
            j[1] = y[1];
            j[2] = y[0];
            j[3] = -y[1];
        }
    };

    /** Robertson kinetics, shared with the benchmarks: see {@link StiffSystems#ROBERTSON}. */
    static final OdeSystem ROBERTSON = StiffSystems.ROBERTSON;

    /** Linear y' = A y with A = p (row-major 2x2), so df/dp_k = y_(k mod 2) in row k / 2. */
    static final OdeSystem LINEAR2 = new OdeSystem() {
        public int stateCount() {
            return 2;
        }

        public int parameterCount() {
            return 4;
        }

        public void rhs(double t, double[] y, double[] p, double[] d) {
            d[0] = p[0] * y[0] + p[1] * y[1];
            d[1] = p[2] * y[0] + p[3] * y[1];
        }

        public void jacobianY(double t, double[] y, double[] p, double[] j) {
            System.arraycopy(p, 0, j, 0, 4);
        }

        public void jacobianP(double t, double[] y, double[] p, double[] j) {
            j[0] = y[0];
            j[1] = y[1];
            j[2] = 0;
            j[3] = 0;
            j[4] = 0;
            j[5] = 0;
            j[6] = y[0];
            j[7] = y[1];
        }
    };

    /** Van der Pol in the scaled form y1' = y2, y2' = ((1 - y1^2) y2 - y1) / eps; p = {eps}. */
    static final OdeSystem VAN_DER_POL = new OdeSystem() {
        public int stateCount() {
            return 2;
        }

        public int parameterCount() {
            return 1;
        }

        public void rhs(double t, double[] y, double[] p, double[] d) {
            d[0] = y[1];
            d[1] = ((1 - y[0] * y[0]) * y[1] - y[0]) / p[0];
        }

        public void jacobianY(double t, double[] y, double[] p, double[] j) {
            j[0] = 0;
            j[1] = 1;
            j[2] = (-2 * y[0] * y[1] - 1) / p[0];
            j[3] = (1 - y[0] * y[0]) / p[0];
        }

        public void jacobianP(double t, double[] y, double[] p, double[] j) {
            j[0] = 0;
            j[1] = -((1 - y[0] * y[0]) * y[1] - y[0]) / (p[0] * p[0]);
        }
    };

    /** HIRES, shared with the benchmarks: see {@link StiffSystems#HIRES}. */
    static final OdeSystem HIRES = StiffSystems.HIRES;

    /**
     * Linear chain of n species, x_i &lt;-&gt; x_{i+1} with rate constant k both ways (symmetric tridiagonal A), plus
     * decay -d x_i of every species; p = {k, d}. Structural pattern is tridiagonal.
     */
    static OdeSystem chain(int n) {
        int[][] pattern = new int[n][];
        for (int i = 0; i < n; i++) {
            int lo = Math.max(0, i - 1);
            int hi = Math.min(n - 1, i + 1);
            pattern[i] = new int[hi - lo + 1];
            for (int j = lo; j <= hi; j++) {
                pattern[i][j - lo] = j;
            }
        }
        return new OdeSystem() {
            public int stateCount() {
                return n;
            }

            public int parameterCount() {
                return 2;
            }

            public void rhs(double t, double[] y, double[] p, double[] d) {
                for (int i = 0; i < n; i++) {
                    double v = -p[1] * y[i];
                    if (i > 0) {
                        v += p[0] * (y[i - 1] - y[i]);
                    }
                    if (i < n - 1) {
                        v += p[0] * (y[i + 1] - y[i]);
                    }
                    d[i] = v;
                }
            }

            public void jacobianY(double t, double[] y, double[] p, double[] j) {
                java.util.Arrays.fill(j, 0.0);
                for (int i = 0; i < n; i++) {
                    double diag = -p[1];
                    if (i > 0) {
                        j[i * n + i - 1] = p[0];
                        diag -= p[0];
                    }
                    if (i < n - 1) {
                        j[i * n + i + 1] = p[0];
                        diag -= p[0];
                    }
                    j[i * n + i] = diag;
                }
            }

            public void jacobianP(double t, double[] y, double[] p, double[] j) {
                for (int i = 0; i < n; i++) {
                    double v = 0;
                    if (i > 0) {
                        v += y[i - 1] - y[i];
                    }
                    if (i < n - 1) {
                        v += y[i + 1] - y[i];
                    }
                    j[i * 2] = v;
                    j[i * 2 + 1] = -y[i];
                }
            }

            @Override
            public int[][] jacobianPattern() {
                return pattern;
            }
        };
    }

    /** Brusselator with diffusion, shared with the benchmarks: see {@link StiffSystems#brusselator}. */
    static OdeSystem brusselator(int nPoints) {
        return StiffSystems.brusselator(nPoints);
    }

    /** Initial state of {@link #brusselator}. */
    static double[] brusselatorStart(int nPoints) {
        return StiffSystems.brusselatorStart(nPoints);
    }

    /** The same system with the default (dense) pattern, forcing the dense LU path. */
    static OdeSystem densePattern(OdeSystem s) {
        return new OdeSystem() {
            public int stateCount() {
                return s.stateCount();
            }

            public int parameterCount() {
                return s.parameterCount();
            }

            public void rhs(double t, double[] y, double[] p, double[] d) {
                s.rhs(t, y, p, d);
            }

            public void jacobianY(double t, double[] y, double[] p, double[] j) {
                s.jacobianY(t, y, p, j);
            }

            public void jacobianP(double t, double[] y, double[] p, double[] j) {
                s.jacobianP(t, y, p, j);
            }
        };
    }
}
