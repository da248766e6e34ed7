package org.switchfit.testsystems;

import org.switchfit.ode.OdeSystem;

/**
 * Classic stiff test problems with analytic Jacobians, shared by the integrator tests (test scope) and the JMH
 * benchmarks (the {@code jmh} profile compiles this folder into the benchmark jar).
 */
public final class StiffSystems {

    private StiffSystems() {
    }

    /** Robertson (1966) kinetics; p = {0.04, 3e7, 1e4}, y0 = (1, 0, 0). */
    public static final OdeSystem ROBERTSON = new OdeSystem() {
        public int stateCount() {
            return 3;
        }

        public int parameterCount() {
            return 3;
        }

        public void rhs(double t, double[] y, double[] p, double[] d) {
            double r1 = p[0] * y[0];
            double r2 = p[1] * y[1] * y[1];
            double r3 = p[2] * y[1] * y[2];
            d[0] = -r1 + r3;
            d[1] = r1 - r2 - r3;
            d[2] = r2;
        }

        public void jacobianY(double t, double[] y, double[] p, double[] j) {
            j[0] = -p[0];
            j[1] = p[2] * y[2];
            j[2] = p[2] * y[1];
            j[3] = p[0];
            j[4] = -2 * p[1] * y[1] - p[2] * y[2];
            j[5] = -p[2] * y[1];
            j[6] = 0;
            j[7] = 2 * p[1] * y[1];
            j[8] = 0;
        }

        public void jacobianP(double t, double[] y, double[] p, double[] j) {
            j[0] = -y[0];
            j[1] = 0;
            j[2] = y[1] * y[2];
            j[3] = y[0];
            j[4] = -y[1] * y[1];
            j[5] = -y[1] * y[2];
            j[6] = 0;
            j[7] = y[1] * y[1];
            j[8] = 0;
        }
    };

    /**
     * HIRES (Schaefer 1975, plant physiology; as in Hairer &amp; Wanner, Solving ODEs II, Sec. IV.10), 8 states, no
     * parameters; y0 = (1, 0, 0, 0, 0, 0, 0, 0.0057), t in [0, 321.8122].
     */
    public static final OdeSystem HIRES = new OdeSystem() {
        public int stateCount() {
            return 8;
        }

        public int parameterCount() {
            return 0;
        }

        public void rhs(double t, double[] y, double[] p, double[] f) {
            f[0] = -1.71 * y[0] + 0.43 * y[1] + 8.32 * y[2] + 0.0007;
            f[1] = 1.71 * y[0] - 8.75 * y[1];
            f[2] = -10.03 * y[2] + 0.43 * y[3] + 0.035 * y[4];
            f[3] = 8.32 * y[1] + 1.71 * y[2] - 1.12 * y[3];
            f[4] = -1.745 * y[4] + 0.43 * y[5] + 0.43 * y[6];
            f[5] = -280.0 * y[5] * y[7] + 0.69 * y[3] + 1.71 * y[4] - 0.43 * y[5] + 0.69 * y[6];
            f[6] = 280.0 * y[5] * y[7] - 1.81 * y[6];
            f[7] = -f[6];
        }

        public void jacobianY(double t, double[] y, double[] p, double[] j) {
            java.util.Arrays.fill(j, 0.0);
            j[0] = -1.71;
            j[1] = 0.43;
            j[2] = 8.32;
            j[8] = 1.71;
            j[9] = -8.75;
            j[18] = -10.03;
            j[19] = 0.43;
            j[20] = 0.035;
            j[25] = 8.32;
            j[26] = 1.71;
            j[27] = -1.12;
            j[36] = -1.745;
            j[37] = 0.43;
            j[38] = 0.43;
            j[43] = 0.69;
            j[44] = 1.71;
            j[45] = -0.43 - 280.0 * y[7];
            j[46] = 0.69;
            j[47] = -280.0 * y[5];
            j[53] = 280.0 * y[7];
            j[54] = -1.81;
            j[55] = 280.0 * y[5];
            j[61] = -280.0 * y[7];
            j[62] = 1.81;
            j[63] = -280.0 * y[5];
        }

        public void jacobianP(double t, double[] y, double[] p, double[] j) {
        }
    };

    /**
     * One-dimensional Brusselator with diffusion (Hairer &amp; Wanner, "Solving ODEs II", 2nd ed., Sec. IV.10, problem
     * BRUSS), N interior points, states interleaved y[2i] = u_i, y[2i+1] = v_i (banded pattern, bandwidth 2):
     * u_i' = A + u_i^2 v_i - (B + 1) u_i + c (u_{i-1} - 2 u_i + u_{i+1}), v_i' = B u_i - u_i^2 v_i + c (v_{i-1} - 2 v_i
     * + v_{i+1}), c = alpha (N + 1)^2, boundary u = 1, v = 3. Parameters p = {A, B, alpha}.
     */
    public static OdeSystem brusselator(int nPoints) {
        int n = 2 * nPoints;
        int[][] pattern = new int[n][];
        for (int r = 0; r < n; r++) {
            int i = r / 2;
            java.util.TreeSet<Integer> cols = new java.util.TreeSet<>();
            cols.add(2 * i);
            cols.add(2 * i + 1);
            if (i > 0) {
                cols.add(r - 2);
            }
            if (i < nPoints - 1) {
                cols.add(r + 2);
            }
            pattern[r] = cols.stream().mapToInt(Integer::intValue).toArray();
        }
        return new OdeSystem() {
            public int stateCount() {
                return n;
            }

            public int parameterCount() {
                return 3;
            }

            public void rhs(double t, double[] y, double[] p, double[] d) {
                double c = p[2] * (nPoints + 1) * (nPoints + 1);
                for (int i = 0; i < nPoints; i++) {
                    double u = y[2 * i];
                    double v = y[2 * i + 1];
                    double ul = i > 0 ? y[2 * i - 2] : 1.0;
                    double ur = i < nPoints - 1 ? y[2 * i + 2] : 1.0;
                    double vl = i > 0 ? y[2 * i - 1] : 3.0;
                    double vr = i < nPoints - 1 ? y[2 * i + 3] : 3.0;
                    d[2 * i] = p[0] + u * u * v - (p[1] + 1) * u + c * (ul - 2 * u + ur);
                    d[2 * i + 1] = p[1] * u - u * u * v + c * (vl - 2 * v + vr);
                }
            }

            public void jacobianY(double t, double[] y, double[] p, double[] j) {
                java.util.Arrays.fill(j, 0.0);
                double c = p[2] * (nPoints + 1) * (nPoints + 1);
                for (int i = 0; i < nPoints; i++) {
                    double u = y[2 * i];
                    double v = y[2 * i + 1];
                    int ru = 2 * i * n;
                    int rv = (2 * i + 1) * n;
                    j[ru + 2 * i] = 2 * u * v - (p[1] + 1) - 2 * c;
                    j[ru + 2 * i + 1] = u * u;
                    j[rv + 2 * i] = p[1] - 2 * u * v;
                    j[rv + 2 * i + 1] = -u * u - 2 * c;
                    if (i > 0) {
                        j[ru + 2 * i - 2] = c;
                        j[rv + 2 * i - 1] = c;
                    }
                    if (i < nPoints - 1) {
                        j[ru + 2 * i + 2] = c;
                        j[rv + 2 * i + 3] = c;
                    }
                }
            }

            public void jacobianP(double t, double[] y, double[] p, double[] j) {
                double c2 = (nPoints + 1) * (nPoints + 1);
                for (int i = 0; i < nPoints; i++) {
                    double u = y[2 * i];
                    double v = y[2 * i + 1];
                    double ul = i > 0 ? y[2 * i - 2] : 1.0;
                    double ur = i < nPoints - 1 ? y[2 * i + 2] : 1.0;
                    double vl = i > 0 ? y[2 * i - 1] : 3.0;
                    double vr = i < nPoints - 1 ? y[2 * i + 3] : 3.0;
                    int ru = 2 * i * 3;
                    int rv = (2 * i + 1) * 3;
                    j[ru] = 1.0;
                    j[ru + 1] = -u;
                    j[ru + 2] = c2 * (ul - 2 * u + ur);
                    j[rv] = 0.0;
                    j[rv + 1] = u;
                    j[rv + 2] = c2 * (vl - 2 * v + vr);
                }
            }

            @Override
            public int[][] jacobianPattern() {
                return pattern;
            }
        };
    }

    /** Initial state of {@link #brusselator}: u = 1 + sin(2 pi x_i), v = 3, x_i = i / (N + 1). */
    public static double[] brusselatorStart(int nPoints) {
        double[] y = new double[2 * nPoints];
        for (int i = 0; i < nPoints; i++) {
            y[2 * i] = 1 + Math.sin(2 * Math.PI * (i + 1) / (nPoints + 1));
            y[2 * i + 1] = 3.0;
        }
        return y;
    }

}
