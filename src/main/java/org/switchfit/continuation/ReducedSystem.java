package org.switchfit.continuation;

import java.util.Arrays;
import org.switchfit.ode.OdeSystem;

/**
 * A system reduced by its conservation laws: states are the independent species x (see
 * {@link ConservationLaws#independentSpecies()}), parameters are the original p followed by the totals T, one per
 * law: {@code q = (p_0..p_{m-1}, T_0..T_{L-1})}. Dependent species are reconstructed as
 * {@code y_f = (T_c - Σ_i l_c[i] x_i) / l_c[f]}; the reduced right-hand side is f restricted to the independent
 * rows. At a regular point of the full system on its stoichiometric class the reduced Jacobian
 * {@code J_r = J_II + J_ID ∂y_D/∂x_I} is non-singular (standard result, e.g. Reder 1988, J. Theor. Biol.
 * 135:175-201, doi:10.1016/S0022-5193(88)80073-0).
 *
 * <p>Treating totals as parameters makes "continue in a total" and "sensitivity of a fold to a total" ordinary
 * parameter operations. Immutable and thread-safe; scratch arrays live in a per-thread workspace, so calls
 * allocate nothing after the first on each thread.
 */
public final class ReducedSystem implements OdeSystem {
    private final OdeSystem full;
    private final ConservationLaws laws;
    private final int n;
    private final int m;
    private final int nr;
    private final int nl;
    private final int[] ind;
    private final int[] dep;
    /** dy_dep[c] / dx[a] = -l_c[ind[a]] / l_c[dep[c]], flat [c * nr + a]. */
    private final double[] depByInd;
    private final double[] invLead;
    private final ThreadLocal<Work> work;

    private static final class Work {
        final double[] y;
        final double[] p;
        final double[] f;
        final double[] jy;
        final double[] jp;

        Work(int n, int m) {
            y = new double[n];
            p = new double[m];
            f = new double[n];
            jy = new double[n * n];
            jp = new double[n * Math.max(m, 1)];
        }
    }

    ReducedSystem(OdeSystem full, ConservationLaws laws) {
        this.full = full;
        this.laws = laws;
        this.n = full.stateCount();
        this.m = full.parameterCount();
        this.ind = laws.independentSpecies();
        this.dep = laws.dependentSpecies();
        this.nr = ind.length;
        this.nl = dep.length;
        this.depByInd = new double[nl * nr];
        this.invLead = new double[nl];
        for (int c = 0; c < nl; c++) {
            double lead = laws.coefficient(c, dep[c]);
            invLead[c] = 1.0 / lead;
            for (int a = 0; a < nr; a++) {
                depByInd[c * nr + a] = -laws.coefficient(c, ind[a]) / lead;
            }
        }
        int nn = n;
        int mm = m;
        this.work = ThreadLocal.withInitial(() -> new Work(nn, mm));
    }

    /** The full system. */
    public OdeSystem full() {
        return full;
    }

    /** The laws used. */
    public ConservationLaws laws() {
        return laws;
    }

    /** Number of parameters of the full system (totals start at this index). */
    public int originalParameterCount() {
        return m;
    }

    /** Index into the reduced parameter vector of the total of law c. */
    public int totalIndex(int c) {
        return m + c;
    }

    /** Reduced parameters (p, T) with the totals of the full state y. */
    public double[] parameters(double[] p, double[] y) {
        double[] q = Arrays.copyOf(p, m + nl);
        double[] t = laws.totals(y);
        System.arraycopy(t, 0, q, m, nl);
        return q;
    }

    /** Reduced parameters (p, T) with explicitly given totals (length {@link ConservationLaws#lawCount()}). */
    public double[] parametersWithTotals(double[] p, double[] totals) {
        if (totals.length != nl || p.length != m) {
            throw new IllegalArgumentException(String.format(java.util.Locale.ROOT,
                    "expected %d parameters and %d totals, got %d and %d", m, nl, p.length, totals.length));
        }
        double[] q = Arrays.copyOf(p, m + nl);
        System.arraycopy(totals, 0, q, m, nl);
        return q;
    }

    /** Independent-species part x of a full state y. */
    public double[] reducedState(double[] y) {
        double[] x = new double[nr];
        for (int a = 0; a < nr; a++) {
            x[a] = y[ind[a]];
        }
        return x;
    }

    /** Writes into {@code yOut} (length n) the full state reconstructed from x and reduced parameters q. */
    public void fullState(double[] x, double[] q, double[] yOut) {
        for (int a = 0; a < nr; a++) {
            yOut[ind[a]] = x[a];
        }
        for (int c = 0; c < nl; c++) {
            double s = q[m + c] * invLead[c];
            int row = c * nr;
            for (int a = 0; a < nr; a++) {
                s += depByInd[row + a] * x[a];
            }
            yOut[dep[c]] = s;
        }
    }

    /** The full state as a new array. */
    public double[] fullState(double[] x, double[] q) {
        double[] y = new double[n];
        fullState(x, q, y);
        return y;
    }

    @Override
    public int stateCount() {
        return nr;
    }

    @Override
    public int parameterCount() {
        return m + nl;
    }

    @Override
    public void rhs(double t, double[] x, double[] q, double[] dxdt) {
        Work w = work.get();
        fullState(x, q, w.y);
        System.arraycopy(q, 0, w.p, 0, m);
        full.rhs(t, w.y, w.p, w.f);
        for (int a = 0; a < nr; a++) {
            dxdt[a] = w.f[ind[a]];
        }
    }

    @Override
    public void jacobianY(double t, double[] x, double[] q, double[] jac) {
        Work w = work.get();
        fullState(x, q, w.y);
        System.arraycopy(q, 0, w.p, 0, m);
        full.jacobianY(t, w.y, w.p, w.jy);
        double[] jy = w.jy;
        for (int a = 0; a < nr; a++) {
            int fr = ind[a] * n;
            int out = a * nr;
            for (int b = 0; b < nr; b++) {
                jac[out + b] = jy[fr + ind[b]];
            }
            for (int c = 0; c < nl; c++) {
                double jd = jy[fr + dep[c]];
                if (jd != 0) {
                    int row = c * nr;
                    for (int b = 0; b < nr; b++) {
                        jac[out + b] += jd * depByInd[row + b];
                    }
                }
            }
        }
    }

    @Override
    public void jacobianP(double t, double[] x, double[] q, double[] jac) {
        Work w = work.get();
        fullState(x, q, w.y);
        System.arraycopy(q, 0, w.p, 0, m);
        int mq = m + nl;
        if (m > 0) {
            full.jacobianP(t, w.y, w.p, w.jp);
        }
        full.jacobianY(t, w.y, w.p, w.jy);
        for (int a = 0; a < nr; a++) {
            int out = a * mq;
            int fr = ind[a];
            for (int k = 0; k < m; k++) {
                jac[out + k] = w.jp[fr * m + k];
            }
            for (int c = 0; c < nl; c++) {
                jac[out + m + c] = w.jy[fr * n + dep[c]] * invLead[c];
            }
        }
    }

    @Override
    public int[][] jacobianPattern() {
        int[][] fp = full.jacobianPattern();
        boolean[] touched = new boolean[n];
        int[] pos = new int[n];
        Arrays.fill(pos, -1);
        for (int a = 0; a < nr; a++) {
            pos[ind[a]] = a;
        }
        int[][] out = new int[nr][];
        for (int a = 0; a < nr; a++) {
            Arrays.fill(touched, false);
            for (int j : fp[ind[a]]) {
                if (pos[j] >= 0) {
                    touched[pos[j]] = true;
                } else {
                    for (int c = 0; c < nl; c++) {
                        if (dep[c] == j) {
                            for (int b = 0; b < nr; b++) {
                                if (depByInd[c * nr + b] != 0) {
                                    touched[b] = true;
                                }
                            }
                        }
                    }
                }
            }
            int cnt = 0;
            for (int b = 0; b < nr; b++) {
                if (touched[b]) {
                    cnt++;
                }
            }
            out[a] = new int[cnt];
            cnt = 0;
            for (int b = 0; b < nr; b++) {
                if (touched[b]) {
                    out[a][cnt++] = b;
                }
            }
        }
        return out;
    }
}
