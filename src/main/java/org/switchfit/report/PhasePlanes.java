package org.switchfit.report;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.Integrators;
import org.switchfit.ode.OdeSystem;
import org.switchfit.ode.SolverSettings;

/**
 * Computes the content of {@code phaseplane.json} from a model at fixed parameters: the nullclines of two chosen
 * states, the steady states in the window and a few trajectories. The fit (or demo) calls it once at the best
 * parameters and writes the result with {@link FitDirectory#write}; the report only draws it.
 *
 * <p>Method. The right-hand side is evaluated on a {@link #GRID} x {@link #GRID} grid over the window with the
 * other states held at {@code yRef}; each nullcline is the zero contour of f_x (resp. f_y), traced cell by cell
 * with linear interpolation on the cell edges (marching squares, Lorensen and Cline 1987, SIGGRAPH 21(4):163-169,
 * doi:10.1145/37402.37422). Steady states: Newton's method on (f_x, f_y) from the centre of every cell where both
 * change sign, with the 2x2 Jacobian block; stable when its trace is negative and its determinant positive.
 * Trajectories: the full system integrated with BDF from each start (other states starting at yRef), projected onto
 * the plane. For models with exactly two states everything is exact up to the grid resolution; with more states the
 * nullclines and steady states are those of the two-dimensional slice at yRef, which the projected trajectories
 * need not follow. Stateless; not for hot paths (allocates freely).
 */
public final class PhasePlanes {
    private PhasePlanes() {
    }

    /** Grid points per axis for the nullcline contours. */
    public static final int GRID = 161;
    /** Output points per trajectory. */
    static final int TRAJECTORY_POINTS = 200;
    private static final int NEWTON_ITERATIONS = 50;

    /**
     * The phase plane of states {@code xIndex} and {@code yIndex}.
     *
     * @param sys      the model (right-hand side and Jacobian)
     * @param p        parameters (length {@code sys.parameterCount()}), read only
     * @param yRef     reference state: the held values of the other states (length n), read only
     * @param stateIds state ids, length n
     * @param xIndex   state on the x axis
     * @param yIndex   state on the y axis, different from xIndex
     * @param xRange   window {@code [min, max]} in x, min &lt; max
     * @param yRange   window {@code [min, max]} in y, min &lt; max
     * @param duration time span of each trajectory, positive
     * @param starts   trajectory starts {@code {x, y}}; null for the four corners and four edge midpoints of the
     *                 window
     * @return the file content; a trajectory whose integration fails is cut at the failure
     */
    public static PhasePlaneFile compute(OdeSystem sys, double[] p, double[] yRef, List<String> stateIds, int xIndex,
                                         int yIndex, double[] xRange, double[] yRange, double duration,
                                         double[][] starts) {
        int n = sys.stateCount();
        if (xIndex == yIndex || xIndex < 0 || yIndex < 0 || xIndex >= n || yIndex >= n) {
            throw new IllegalArgumentException("need two different state indices in [0, " + n + "), got " + xIndex
                    + " and " + yIndex);
        }
        if (!(xRange[0] < xRange[1]) || !(yRange[0] < yRange[1]) || !(duration > 0)) {
            throw new IllegalArgumentException("windows must be [min, max] with min < max and duration > 0");
        }
        if (yRef.length != n || stateIds.size() != n) {
            throw new IllegalArgumentException("yRef and stateIds need " + n + " entries");
        }
        Slice s = new Slice(sys, p, yRef, xIndex, yIndex);
        int g = GRID;
        double[] xs = new double[g];
        double[] ys = new double[g];
        for (int i = 0; i < g; i++) {
            xs[i] = xRange[0] + (xRange[1] - xRange[0]) * i / (g - 1);
            ys[i] = yRange[0] + (yRange[1] - yRange[0]) * i / (g - 1);
        }
        double[][] fx = new double[g][g];
        double[][] fy = new double[g][g];
        double[] f = new double[2];
        for (int i = 0; i < g; i++) {
            for (int j = 0; j < g; j++) {
                s.eval(xs[i], ys[j], f);
                fx[i][j] = f[0];
                fy[i][j] = f[1];
            }
        }
        PhasePlaneFile.Curve xNull = contour(xs, ys, fx);
        PhasePlaneFile.Curve yNull = contour(xs, ys, fy);
        List<PhasePlaneFile.SteadyPoint> steady = steadyStates(s, xs, ys, fx, fy);
        if (starts == null) {
            double xm = 0.5 * (xRange[0] + xRange[1]);
            double ym = 0.5 * (yRange[0] + yRange[1]);
            starts = new double[][] {{xRange[0], yRange[0]}, {xRange[1], yRange[0]}, {xRange[0], yRange[1]},
                {xRange[1], yRange[1]}, {xm, yRange[0]}, {xm, yRange[1]}, {xRange[0], ym}, {xRange[1], ym}};
        }
        List<PhasePlaneFile.Curve> traj = new ArrayList<>();
        for (double[] st : starts) {
            traj.add(trajectory(sys, p, yRef, xIndex, yIndex, st, duration));
        }
        Map<String, Double> held = new LinkedHashMap<>();
        for (int k = 0; k < n; k++) {
            if (k != xIndex && k != yIndex) {
                held.put(stateIds.get(k), yRef[k]);
            }
        }
        return new PhasePlaneFile(stateIds.get(xIndex), stateIds.get(yIndex), xRange, yRange, xNull, yNull, steady,
                traj, held);
    }

    /** Zero contour of v over the grid as segments separated by NaN (marching squares). */
    static PhasePlaneFile.Curve contour(double[] xs, double[] ys, double[][] v) {
        List<Double> cx = new ArrayList<>();
        List<Double> cy = new ArrayList<>();
        double[] px = new double[4];
        double[] py = new double[4];
        for (int i = 0; i + 1 < xs.length; i++) {
            for (int j = 0; j + 1 < ys.length; j++) {
                double a = v[i][j];
                double b = v[i + 1][j];
                double c = v[i + 1][j + 1];
                double d = v[i][j + 1];
                int k = 0;
                // edges in order: bottom (a-b), right (b-c), top (d-c), left (a-d)
                k = crossing(a, b, xs[i], xs[i + 1], ys[j], ys[j], px, py, k);
                k = crossing(b, c, xs[i + 1], xs[i + 1], ys[j], ys[j + 1], px, py, k);
                k = crossing(d, c, xs[i], xs[i + 1], ys[j + 1], ys[j + 1], px, py, k);
                k = crossing(a, d, xs[i], xs[i], ys[j], ys[j + 1], px, py, k);
                for (int e = 0; e + 1 < k; e += 2) {
                    cx.add(px[e]);
                    cy.add(py[e]);
                    cx.add(px[e + 1]);
                    cy.add(py[e + 1]);
                    cx.add(Double.NaN);
                    cy.add(Double.NaN);
                }
            }
        }
        double[] x = new double[cx.size()];
        double[] y = new double[cy.size()];
        for (int i = 0; i < x.length; i++) {
            x[i] = cx.get(i);
            y[i] = cy.get(i);
        }
        return new PhasePlaneFile.Curve(x, y);
    }

    /** Adds the zero crossing on edge (v0 at (x0, y0)) - (v1 at (x1, y1)) when the sign changes; returns the count. */
    private static int crossing(double v0, double v1, double x0, double x1, double y0, double y1, double[] px,
                                double[] py, int k) {
        if (k >= 4 || !Double.isFinite(v0) || !Double.isFinite(v1) || (v0 < 0) == (v1 < 0)) {
            return k;
        }
        double w = v0 / (v0 - v1);
        px[k] = x0 + w * (x1 - x0);
        py[k] = y0 + w * (y1 - y0);
        return k + 1;
    }

    private static boolean changes(double a, double b, double c, double d) {
        boolean neg = a < 0 || b < 0 || c < 0 || d < 0;
        boolean pos = a >= 0 || b >= 0 || c >= 0 || d >= 0;
        return neg && pos;
    }

    private static List<PhasePlaneFile.SteadyPoint> steadyStates(Slice s, double[] xs, double[] ys, double[][] fx,
                                                                 double[][] fy) {
        List<PhasePlaneFile.SteadyPoint> out = new ArrayList<>();
        double dx = xs[1] - xs[0];
        double dy = ys[1] - ys[0];
        double[] f = new double[2];
        double[] jac = new double[4];
        for (int i = 0; i + 1 < xs.length; i++) {
            for (int j = 0; j + 1 < ys.length; j++) {
                if (!changes(fx[i][j], fx[i + 1][j], fx[i][j + 1], fx[i + 1][j + 1])
                        || !changes(fy[i][j], fy[i + 1][j], fy[i][j + 1], fy[i + 1][j + 1])) {
                    continue;
                }
                double x = xs[i] + 0.5 * dx;
                double y = ys[j] + 0.5 * dy;
                boolean ok = false;
                for (int it = 0; it < NEWTON_ITERATIONS; it++) {
                    s.eval(x, y, f);
                    s.jacobian(x, y, jac);
                    double det = jac[0] * jac[3] - jac[1] * jac[2];
                    if (!(Math.abs(det) > 0) || !Double.isFinite(det)) {
                        break;
                    }
                    double sx = (jac[3] * f[0] - jac[1] * f[1]) / det;
                    double sy = (-jac[2] * f[0] + jac[0] * f[1]) / det;
                    x -= sx;
                    y -= sy;
                    if (Math.abs(sx) <= 1e-12 * (Math.abs(x) + dx) && Math.abs(sy) <= 1e-12 * (Math.abs(y) + dy)) {
                        ok = true;
                        break;
                    }
                }
                if (!ok || x < xs[0] || x > xs[xs.length - 1] || y < ys[0] || y > ys[ys.length - 1]) {
                    continue;
                }
                boolean dup = false;
                for (PhasePlaneFile.SteadyPoint q : out) {
                    dup |= Math.abs(q.x() - x) <= 1e-6 * dx && Math.abs(q.y() - y) <= 1e-6 * dy;
                }
                if (!dup) {
                    s.jacobian(x, y, jac);
                    double tr = jac[0] + jac[3];
                    double det = jac[0] * jac[3] - jac[1] * jac[2];
                    out.add(new PhasePlaneFile.SteadyPoint(x, y, tr < 0 && det > 0));
                }
            }
        }
        return out;
    }

    private static PhasePlaneFile.Curve trajectory(OdeSystem sys, double[] p, double[] yRef, int xi, int yi,
                                                   double[] start, double duration) {
        double[] y = yRef.clone();
        y[xi] = start[0];
        y[yi] = start[1];
        double[] tx = new double[TRAJECTORY_POINTS + 1];
        double[] ty = new double[TRAJECTORY_POINTS + 1];
        java.util.Arrays.fill(tx, Double.NaN);
        java.util.Arrays.fill(ty, Double.NaN);
        tx[0] = start[0];
        ty[0] = start[1];
        try {
            IntegrationSession ses = Integrators.create(SolverSettings.defaults().withTolerances(1e-6, 1e-9))
                    .start(sys, 0.0, y, p.clone(), null, null, null);
            for (int k = 1; k <= TRAJECTORY_POINTS; k++) {
                ses.advance(duration * k / TRAJECTORY_POINTS, y, null);
                tx[k] = y[xi];
                ty[k] = y[yi];
            }
        } catch (IntegrationException e) {
            // keep the part computed so far (the rest stays NaN and is not drawn)
        }
        return new PhasePlaneFile.Curve(tx, ty);
    }

    /** The two-dimensional slice (f_x, f_y) of the system with the other states held. Not thread-safe. */
    private static final class Slice {
        private final OdeSystem sys;
        private final double[] p;
        private final double[] y;
        private final double[] dydt;
        private final double[] jac;
        private final int xi;
        private final int yi;
        private final int n;

        Slice(OdeSystem sys, double[] p, double[] yRef, int xi, int yi) {
            this.sys = sys;
            this.p = p.clone();
            this.y = yRef.clone();
            this.n = sys.stateCount();
            this.dydt = new double[n];
            this.jac = new double[n * n];
            this.xi = xi;
            this.yi = yi;
        }

        void eval(double x, double yv, double[] out) {
            y[xi] = x;
            y[yi] = yv;
            sys.rhs(0.0, y, p, dydt);
            out[0] = dydt[xi];
            out[1] = dydt[yi];
        }

        /** Writes the 2x2 block row-major: d f_x/dx, d f_x/dy, d f_y/dx, d f_y/dy. */
        void jacobian(double x, double yv, double[] out) {
            y[xi] = x;
            y[yi] = yv;
            sys.jacobianY(0.0, y, p, jac);
            out[0] = jac[xi * n + xi];
            out[1] = jac[xi * n + yi];
            out[2] = jac[yi * n + xi];
            out[3] = jac[yi * n + yi];
        }
    }
}
