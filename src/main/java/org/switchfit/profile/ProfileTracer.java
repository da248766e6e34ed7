package org.switchfit.profile;

import java.util.ArrayList;
import java.util.List;
import org.switchfit.objective.ObjectiveException;

/**
 * Traces one side of a profile and locates threshold crossings (Raue et al. 2009, §2.3, doi:10.1093/
 * bioinformatics/btp358): steps in the profiled value z away from the optimum, re-optimising the other
 * parameters from a predicted warm start, until the likelihood ratio exceeds the largest threshold or a limit is
 * reached. Package-private; confined to one thread.
 *
 * <p>Step control works on the root {@code ρ = √max(Δχ², 0)}, which is linear in z for a quadratic profile: the
 * first step is {@code σ_z · target} from the local curvature (σ_z the delta-method standard error, so ρ rises by
 * about {@code target}); a step raising ρ by more than twice {@code target} is halved and retried, one raising it
 * by less than half of it is doubled for the next step, capped at {@code maxStep}. The warm start is the linear
 * extrapolation of θ(z) through the last two points (for the first step: the curvature predictor
 * dθ/dz = H⁺e / (eᵀH⁺e)).
 *
 * <p>Crossings of a threshold t between two traced points are refined by the Illinois variant of regula falsi
 * (Dowell and Jarratt 1971, BIT 11:168-174, doi:10.1007/BF01934364) on {@code √Δχ²(z) - √t}, which is linear in z
 * for a quadratic profile, so the refinement is exact in one step there and superlinear otherwise; it stops when
 * |Δχ² - t| ≤ 1e-9 or the bracket is below 1e-12 relative.
 */
final class ProfileTracer {

    /** Signals an NLL below the optimum by more than the tolerance. */
    static final class BetterOptimumFound extends RuntimeException {
        private static final long serialVersionUID = 1L;
        final transient ProfilePoint point;

        BetterOptimumFound(ProfilePoint point) {
            super("better optimum", null, false, false);
            this.point = point;
        }
    }

    /** One traced side. */
    static final class Side {
        final List<ProfilePoint> points = new ArrayList<>();
        SideStatus status;
        String message = "";
    }

    private static final double CROSSING_TOL = 1e-9;
    private static final int MAX_REFINE = 60;
    private static final int MAX_INFEASIBLE_HALVINGS = 8;

    private final Slice slice;
    private final double nllStar;
    private final double target;
    private final double stopThreshold;
    private final int maxSteps;
    private final double betterTolerance;

    ProfileTracer(Slice slice, double nllStar, double target, double stopThreshold, int maxSteps,
                  double betterTolerance) {
        this.slice = slice;
        this.nllStar = nllStar;
        this.target = target;
        this.stopThreshold = stopThreshold;
        this.maxSteps = maxSteps;
        this.betterTolerance = betterTolerance;
    }

    /**
     * @param p0       the optimum as a profile point
     * @param dir      +1 or -1
     * @param step0    first step (> 0)
     * @param maxStep  largest step
     * @param slope0   predictor dθ/dz at the optimum
     */
    Side trace(ProfilePoint p0, int dir, double step0, double maxStep, double[] slope0) {
        Side side = new Side();
        double limit = dir > 0 ? slice.upperLimit() : slice.lowerLimit();
        double minStep = Math.max(Math.min(1e-9 * maxStep, 1e-6 * step0), 1e-13 * (1 + Math.abs(p0.value())));
        double step = Math.min(step0, maxStep);
        ProfilePoint last = p0;
        double[] slope = slope0.clone();
        int accepted = 0;
        int attempts = 0;
        int infeasible = 0;
        if (dir * (limit - p0.value()) <= 0) {
            side.status = SideStatus.OPEN_AT_BOUND;
            return side;
        }
        while (accepted < maxSteps) {
            if (++attempts > 20 * maxSteps) {
                side.status = SideStatus.FAILED;
                side.message = "too many rejected steps";
                return side;
            }
            double z = last.value() + dir * step;
            boolean atLimit = false;
            if (dir * (z - limit) >= 0) {
                z = limit;
                atLimit = true;
            }
            double[] warm = predict(last, slope, z);
            ProfilePoint p;
            try {
                p = solveWithFallback(z, warm, last.theta());
            } catch (InfeasibleValueException e) {
                // The value is out of reach inside the parameter bounds: the reachable range ends between
                // the last point and z. Approach it by at most MAX_INFEASIBLE_HALVINGS halvings in total, then
                // report the side as bounded.
                if (++infeasible <= MAX_INFEASIBLE_HALVINGS && step > minStep) {
                    step = Math.max(minStep, step / 2);
                    continue;
                }
                side.status = SideStatus.OPEN_AT_BOUND;
                side.message = e.getMessage();
                return side;
            } catch (ObjectiveException e) {
                if (step > minStep) {
                    step = Math.max(minStep, step / 4);
                    continue;
                }
                side.status = SideStatus.FAILED;
                side.message = "re-optimisation failed at " + z + ": " + e.getMessage();
                return side;
            }
            if (p.nll() < nllStar - betterTolerance) {
                throw new BetterOptimumFound(p);
            }
            double d = p.deltaChi2(nllStar);
            double inc = root(p) - root(last);
            if (inc > 2 * target && step > minStep) {
                step = Math.max(minStep, step / 2);
                continue;
            }
            double dz = p.value() - last.value();
            double[] tp = p.theta();
            double[] tl = last.theta();
            for (int k = 0; k < slope.length; k++) {
                slope[k] = (tp[k] - tl[k]) / dz;
            }
            side.points.add(p);
            accepted++;
            last = p;
            if (d > stopThreshold) {
                side.status = SideStatus.CLOSED;
                return side;
            }
            if (atLimit) {
                side.status = SideStatus.OPEN_AT_BOUND;
                return side;
            }
            if (inc < 0.5 * target) {
                step = Math.min(maxStep, 2 * step);
            }
        }
        side.status = SideStatus.OPEN_STEP_LIMIT;
        return side;
    }

    /**
     * Refines the first crossing of threshold t walking outward from p0 along the side's points.
     *
     * @return the crossing z, or NaN when the side never reaches t
     */
    double crossing(ProfilePoint p0, List<ProfilePoint> outward, double t, List<ProfilePoint> extra) {
        ProfilePoint a = p0;
        for (ProfilePoint b : outward) {
            if (b.deltaChi2(nllStar) >= t && a.deltaChi2(nllStar) < t) {
                return refine(a, b, t, extra);
            }
            a = b;
        }
        return Double.NaN;
    }

    private double refine(ProfilePoint a, ProfilePoint b, double t, List<ProfilePoint> extra) {
        double st = Math.sqrt(t);
        double za = a.value();
        double zb = b.value();
        double fa = root(a) - st;
        double fb = root(b) - st;
        ProfilePoint pa = a;
        ProfilePoint pb = b;
        for (int it = 0; it < MAX_REFINE; it++) {
            if (Math.abs(zb - za) <= 1e-12 * (1 + Math.abs(zb))) {
                break;
            }
            double z = (za * fb - zb * fa) / (fb - fa);
            double w = (z - za) / (zb - za);
            double[] ta = pa.theta();
            double[] tb = pb.theta();
            double[] warm = new double[ta.length];
            for (int k = 0; k < warm.length; k++) {
                warm[k] = ta[k] + w * (tb[k] - ta[k]);
            }
            ProfilePoint p;
            try {
                p = slice.solve(z, warm);
            } catch (ObjectiveException e) {
                // No point at the secant estimate: return the estimate itself (second-order accurate where the
                // signed root is smooth), not a bracket end, which can be a whole step away.
                return z;
            }
            extra.add(p);
            // The slice may return a point at a value slightly off the request (prediction constraint met to
            // its noise floor); its own value is the exact abscissa of its NLL.
            z = p.value();
            double d = p.deltaChi2(nllStar);
            if (Math.abs(d - t) <= CROSSING_TOL) {
                return z;
            }
            double f = root(p) - st;
            if ((f < 0) != (fb < 0)) {
                za = zb;
                fa = fb;
                pa = pb;
            } else {
                fa /= 2;
            }
            zb = z;
            fb = f;
            pb = p;
        }
        return Math.abs(fa) < Math.abs(fb) ? za : zb;
    }

    /** Solves from the predicted warm start; when that start cannot be evaluated, retries from the last point. */
    private ProfilePoint solveWithFallback(double z, double[] warm, double[] lastTheta) {
        try {
            return slice.solve(z, warm);
        } catch (InfeasibleValueException e) {
            throw e;
        } catch (ObjectiveException e) {
            return slice.solve(z, lastTheta);
        }
    }

    private double root(ProfilePoint p) {
        return Math.sqrt(Math.max(0.0, p.deltaChi2(nllStar)));
    }

    private static double[] predict(ProfilePoint last, double[] slope, double z) {
        double[] t = last.theta();
        double dz = z - last.value();
        for (int k = 0; k < t.length; k++) {
            t[k] += dz * slope[k];
        }
        return t;
    }
}
