package org.switchfit.continuation;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.Locale;
import org.switchfit.ode.OdeSystem;

/**
 * Two-parameter continuation of folds: Keller's pseudo-arclength method (see {@link PseudoArclength}) applied
 * to the extended system {@code (f, J v, c^T v - 1) = 0} in (y, v, λ1, λ2) (Kuznetsov 2004, Elements of Applied
 * Bifurcation Theory, 3rd ed., sec. 10.2.1). Cusps are detected where the normal-form coefficient
 * {@code a = w^T D²f(v, v)} (w^T v = 1, v continuous along the curve) changes sign (Kuznetsov 2004, sec. 8.2 and
 * 10.2.2) and located by the secant method on a along the curve. The curve stops at the box
 * [lower1, upper1] x [lower2, upper2] (end points corrected onto the box), after maxPoints per direction, or when
 * the step falls below minStep. Immutable and thread-safe; each call owns its workspace.
 */
public final class FoldCurves {

    private final ContinuationSettings settings;
    private final double lower2;
    private final double upper2;

    /**
     * @param settings bounds for the first parameter, steps, tolerance
     * @param lower2   lower bound of the second parameter
     * @param upper2   upper bound of the second parameter
     */
    public FoldCurves(ContinuationSettings settings, double lower2, double upper2) {
        if (!(lower2 < upper2)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "lower bound %.6g of the second parameter must be below its upper bound %.6g", lower2, upper2));
        }
        this.settings = settings;
        this.lower2 = lower2;
        this.upper2 = upper2;
    }

    /**
     * Traces the fold curve through {@code start} in both directions.
     *
     * @param p        parameters (control entries replaced by the fold's values and p[control2])
     * @param control2 index of the second free parameter
     */
    public FoldCurve trace(OdeSystem sys, Fold start, double[] p, int control2) {
        Half a = traceHalf(sys, start, p, control2, -1);
        Half b = traceHalf(sys, start, p, control2, +1);
        List<FoldCurve.Point> pts = new ArrayList<>();
        int na = a.points.size();
        for (int i = na - 1; i >= 1; i--) {
            pts.add(a.points.get(i));
        }
        pts.addAll(b.points);
        List<FoldCurve.Cusp> cusps = new ArrayList<>();
        List<FoldCurve.Cusp> ac = new ArrayList<>(a.cusps);
        Collections.reverse(ac);
        for (FoldCurve.Cusp c : ac) {
            cusps.add(new FoldCurve.Cusp(c.p1(), c.p2(), c.state(), na - 2 - c.afterPoint()));
        }
        for (FoldCurve.Cusp c : b.cusps) {
            cusps.add(new FoldCurve.Cusp(c.p1(), c.p2(), c.state(), c.afterPoint() + na - 1));
        }
        return new FoldCurve(start.control(), control2, pts, cusps, a.end, b.end);
    }

    private record Half(List<FoldCurve.Point> points, List<FoldCurve.Cusp> cusps, Branch.EndReason end) {
    }

    private Half traceHalf(OdeSystem sys, Fold start, double[] p, int control2, int direction) {
        int n = sys.stateCount();
        int c1 = start.control();
        double[] q = p.clone();
        q[c1] = start.parameter();
        double[] v0 = start.rightNull();
        FoldCurveProblem prob = new FoldCurveProblem(sys, q, c1, control2, v0);
        CurveCorrector cc = new CurveCorrector(prob, settings.tolerance(), settings.maxCorrectorSteps());
        int len = 2 * n + 2;
        double[] u = new double[len];
        System.arraycopy(start.state(), 0, u, 0, n);
        System.arraycopy(v0, 0, u, n, n);
        u[2 * n] = start.parameter();
        u[2 * n + 1] = q[control2];
        double[] ref = new double[len];
        ref[2 * n + 1] = direction;
        double[] t = new double[len];
        List<FoldCurve.Point> pts = new ArrayList<>();
        List<FoldCurve.Cusp> cusps = new ArrayList<>();
        double aPrev = quadratic(prob, u);
        pts.add(point(prob, u, aPrev));
        if (!cc.tangent(u, ref, t)) {
            return new Half(pts, cusps, Branch.EndReason.SINGULAR);
        }
        double h = settings.initialStep();
        double[] uPred = new double[len];
        double[] uNew = new double[len];
        double[] tNew = new double[len];
        while (pts.size() < settings.maxPoints()) {
            int iters = cc.step(u, t, h, settings.minStep(), uPred, uNew, tNew);
            if (iters < 0) {
                h *= 0.5;
                if (h < settings.minStep()) {
                    return new Half(pts, cusps, Branch.EndReason.STEP_TOO_SMALL);
                }
                continue;
            }
            int out = outside(uNew, n);
            if (out >= 0) {
                if (clip(cc, u, uNew, out, n)) {
                    double aNew = quadratic(prob, uNew);
                    pts.add(point(prob, uNew, aNew));
                }
                return new Half(pts, cusps, Branch.EndReason.BOUNDARY);
            }
            double aNew = quadratic(prob, uNew);
            if (aPrev * aNew < 0) {
                FoldCurve.Cusp cusp = refineCusp(prob, cc, u, t, uNew, pts.size() - 1);
                if (cusp != null) {
                    cusps.add(cusp);
                }
            }
            pts.add(point(prob, uNew, aNew));
            System.arraycopy(uNew, 0, u, 0, len);
            System.arraycopy(tNew, 0, t, 0, len);
            renormalize(prob, cc, u, t);
            aPrev = quadratic(prob, u);
            if (iters <= 3) {
                h = Math.min(1.5 * h, settings.maxStep());
            } else if (iters >= 6) {
                h = Math.max(0.6 * h, settings.minStep());
            }
        }
        return new Half(pts, cusps, Branch.EndReason.MAX_POINTS);
    }

    /** Rescales v to unit length, sets c = v and recomputes the tangent for the changed normalisation. */
    private static void renormalize(FoldCurveProblem prob, CurveCorrector cc, double[] u, double[] t) {
        int n = prob.n;
        double s = 0;
        for (int i = 0; i < n; i++) {
            s += u[n + i] * u[n + i];
        }
        s = Math.sqrt(s);
        for (int i = 0; i < n; i++) {
            u[n + i] /= s;
            prob.c[i] = u[n + i];
        }
        double[] ref = t.clone();
        cc.tangent(u, ref, t);
    }

    private int outside(double[] u, int n) {
        double l1 = u[2 * n];
        double l2 = u[2 * n + 1];
        if (l1 < settings.lowerBound() || l1 > settings.upperBound()) {
            return 2 * n;
        }
        if (l2 < lower2 || l2 > upper2) {
            return 2 * n + 1;
        }
        return -1;
    }

    private boolean clip(CurveCorrector cc, double[] u, double[] uNew, int k, int n) {
        double lo = k == 2 * n ? settings.lowerBound() : lower2;
        double hi = k == 2 * n ? settings.upperBound() : upper2;
        double bound = uNew[k] < lo ? lo : hi;
        double theta = (bound - u[k]) / (uNew[k] - u[k]);
        int len = u.length;
        double[] guess = new double[len];
        for (int i = 0; i < len; i++) {
            guess[i] = u[i] + theta * (uNew[i] - u[i]);
        }
        guess[k] = bound;
        double[] e = new double[len];
        e[k] = 1;
        double[] res = new double[len];
        if (cc.correct(guess, e, res) < 0) {
            return false;
        }
        res[k] = bound;
        System.arraycopy(res, 0, uNew, 0, len);
        return true;
    }

    private static double quadratic(FoldCurveProblem prob, double[] u) {
        int n = prob.n;
        double[] y = java.util.Arrays.copyOf(u, n);
        double[] v = java.util.Arrays.copyOfRange(u, n, 2 * n);
        return FoldMath.foldAt(prob.sys, y, prob.parametersAt(u), prob.c1, v, true).quadratic();
    }

    private static FoldCurve.Point point(FoldCurveProblem prob, double[] u, double a) {
        int n = prob.n;
        return new FoldCurve.Point(u[2 * n], u[2 * n + 1], java.util.Arrays.copyOf(u, n), a);
    }

    /** Illinois secant on a(h) along the previous tangent, bracketed by [0, |uB - uA|·t]. */
    private FoldCurve.Cusp refineCusp(FoldCurveProblem prob, CurveCorrector cc, double[] ua, double[] ta,
                                      double[] ub, int indexA) {
        int len = ua.length;
        int n = prob.n;
        double hb = 0;
        for (int i = 0; i < len; i++) {
            hb += ta[i] * (ub[i] - ua[i]);
        }
        double lo = 0;
        double hi = hb;
        double flo = quadratic(prob, ua);
        double fhi = quadratic(prob, ub);
        double[] pred = new double[len];
        double[] uh = ub.clone();
        int side = 0;
        for (int it = 0; it < 80; it++) {
            double x = (lo * fhi - hi * flo) / (fhi - flo);
            for (int i = 0; i < len; i++) {
                pred[i] = ua[i] + x * ta[i];
            }
            if (cc.correct(pred, ta, uh) < 0) {
                return null;
            }
            double fx = quadratic(prob, uh);
            if (fx == 0 || Math.abs(hi - lo) <= settings.tolerance() * Math.max(hb, 1e-300)) {
                break;
            }
            if (fx * fhi > 0) {
                hi = x;
                fhi = fx;
                if (side == 1) {
                    flo *= 0.5;
                }
                side = 1;
            } else {
                lo = x;
                flo = fx;
                if (side == -1) {
                    fhi *= 0.5;
                }
                side = -1;
            }
        }
        return new FoldCurve.Cusp(uh[2 * n], uh[2 * n + 1], java.util.Arrays.copyOf(uh, n), indexA);
    }
}
