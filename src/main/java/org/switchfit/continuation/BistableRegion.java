package org.switchfit.continuation;

import java.util.ArrayList;
import java.util.List;

/**
 * The region of a parameter plane bounded by a fold curve (two fold branches meeting at a cusp) and the edges of
 * the continuation box, as a polygon. Inside it the system has (at least) two folds in the first parameter, i.e.
 * it is bistable for the typical S-shaped response. Immutable.
 *
 * <p>Construction: the fold-curve points in travel order, then, when both ends lie on the box, the box boundary
 * from the last end back to the first, going round the corners the shorter way (exact when the region touches the
 * box along that way, which holds for a single cusp opening towards one edge; check {@link #closedByChord} and the
 * curve's end reasons otherwise). Chords between computed points under-resolve the curved boundary by O(h²) in
 * the step h.
 *
 * @param polygon       vertices {@code polygon[k] = {p1, p2}}, not repeated at the end
 * @param cusps         cusps on the curve
 * @param closedByChord true when an end of the curve was not on the box and the polygon is closed by a chord
 */
public record BistableRegion(double[][] polygon, List<FoldCurve.Cusp> cusps, boolean closedByChord) {

    /** Copies. */
    public BistableRegion {
        double[][] c = new double[polygon.length][];
        for (int i = 0; i < polygon.length; i++) {
            c[i] = polygon[i].clone();
        }
        polygon = c;
        cusps = List.copyOf(cusps);
    }

    @Override
    public double[][] polygon() {
        double[][] c = new double[polygon.length][];
        for (int i = 0; i < polygon.length; i++) {
            c[i] = polygon[i].clone();
        }
        return c;
    }

    /**
     * Region bounded by {@code curve} and the box [lo1, hi1] x [lo2, hi2] the curve was traced in.
     */
    public static BistableRegion of(FoldCurve curve, double lo1, double hi1, double lo2, double hi2) {
        List<double[]> v = new ArrayList<>();
        for (FoldCurve.Point pt : curve.points()) {
            v.add(new double[] {pt.p1(), pt.p2()});
        }
        boolean chord = curve.startEnd() != Branch.EndReason.BOUNDARY
                || curve.finishEnd() != Branch.EndReason.BOUNDARY;
        if (!chord && v.size() > 1) {
            double[] box = {lo1, hi1, lo2, hi2};
            double per = 2 * (hi1 - lo1) + 2 * (hi2 - lo2);
            double sLast = perimeterPosition(v.get(v.size() - 1), box);
            double sFirst = perimeterPosition(v.get(0), box);
            double forward = ((sFirst - sLast) % per + per) % per;
            boolean goForward = forward <= per / 2;
            double[][] corners = {{lo1, lo2}, {hi1, lo2}, {hi1, hi2}, {lo1, hi2}};
            double[] cornerPos = {0, hi1 - lo1, (hi1 - lo1) + (hi2 - lo2), 2 * (hi1 - lo1) + (hi2 - lo2)};
            List<double[]> add = new ArrayList<>();
            for (int step = 0; step < 4; step++) {
                for (int k = 0; k < 4; k++) {
                    double d = goForward ? ((cornerPos[k] - sLast) % per + per) % per
                            : ((sLast - cornerPos[k]) % per + per) % per;
                    double total = goForward ? forward : per - forward;
                    if (d > 0 && d < total && rank(d, cornerPos, sLast, per, goForward) == step) {
                        add.add(corners[k]);
                    }
                }
            }
            v.addAll(add);
        }
        return new BistableRegion(v.toArray(new double[0][]), curve.cusps(), chord);
    }

    /**
     * Region between two separate fold curves (no cusp joins them inside the box, e.g. the switch-on and switch-off
     * folds of a switch whose cusp lies outside), each running from box edge to box edge: curve a, the box boundary
     * from its end to the nearer end of b (the way that does not pass a's start), curve b, and the boundary back to
     * a's start the same way round. Null when an end of either curve is not on the box.
     */
    public static BistableRegion between(FoldCurve a, FoldCurve b, double lo1, double hi1, double lo2, double hi2) {
        for (FoldCurve c : List.of(a, b)) {
            if (c.startEnd() != Branch.EndReason.BOUNDARY || c.finishEnd() != Branch.EndReason.BOUNDARY
                    || c.points().size() < 2) {
                return null;
            }
        }
        double[] box = {lo1, hi1, lo2, hi2};
        double per = 2 * (hi1 - lo1) + 2 * (hi2 - lo2);
        List<double[]> pa = points(a);
        List<double[]> pb = points(b);
        double sA = perimeterPosition(pa.get(0), box);
        double sB = perimeterPosition(pa.get(pa.size() - 1), box);
        double sC = perimeterPosition(pb.get(0), box);
        double sD = perimeterPosition(pb.get(pb.size() - 1), box);
        double fA = ((sA - sB) % per + per) % per;
        double fC = ((sC - sB) % per + per) % per;
        double fD = ((sD - sB) % per + per) % per;
        boolean forward = Math.min(fC, fD) < fA;
        // backward distance from B to C is (per - fC) mod per
        boolean cFirst = forward ? fC <= fD : (per - fC) % per <= (per - fD) % per;
        if (!cFirst) {
            java.util.Collections.reverse(pb);
            double t = sC;
            sC = sD;
            sD = t;
        }
        List<double[]> v = new ArrayList<>(pa);
        v.addAll(corners(sB, sC, forward, box));
        v.addAll(pb);
        v.addAll(corners(sD, sA, forward, box));
        List<FoldCurve.Cusp> cusps = new ArrayList<>(a.cusps());
        cusps.addAll(b.cusps());
        return new BistableRegion(v.toArray(new double[0][]), cusps, false);
    }

    private static List<double[]> points(FoldCurve c) {
        List<double[]> v = new ArrayList<>();
        for (FoldCurve.Point pt : c.points()) {
            v.add(new double[] {pt.p1(), pt.p2()});
        }
        return v;
    }

    /** The box corners passed going round the boundary from perimeter position s0 to s1, in order. */
    private static List<double[]> corners(double s0, double s1, boolean forward, double[] box) {
        double w = box[1] - box[0];
        double h = box[3] - box[2];
        double per = 2 * w + 2 * h;
        double[][] corner = {{box[0], box[2]}, {box[1], box[2]}, {box[1], box[3]}, {box[0], box[3]}};
        double[] pos = {0, w, w + h, 2 * w + h};
        double total = forward ? ((s1 - s0) % per + per) % per : ((s0 - s1) % per + per) % per;
        List<double[]> out = new ArrayList<>();
        List<Double> dist = new ArrayList<>();
        for (int k = 0; k < 4; k++) {
            double d = forward ? ((pos[k] - s0) % per + per) % per : ((s0 - pos[k]) % per + per) % per;
            if (d > 0 && d < total) {
                int at = 0;
                while (at < dist.size() && dist.get(at) < d) {
                    at++;
                }
                dist.add(at, d);
                out.add(at, corner[k]);
            }
        }
        return out;
    }

    /** Order of corner distance d among all corners' distances from sLast (0 = nearest). */
    private static int rank(double d, double[] cornerPos, double sLast, double per, boolean forward) {
        int r = 0;
        for (double c : cornerPos) {
            double dc = forward ? ((c - sLast) % per + per) % per : ((sLast - c) % per + per) % per;
            if (dc > 0 && dc < d) {
                r++;
            }
        }
        return r;
    }

    /** Counter-clockwise perimeter coordinate of a point on the box boundary, starting at (lo1, lo2). */
    private static double perimeterPosition(double[] pt, double[] box) {
        double w = box[1] - box[0];
        double h = box[3] - box[2];
        double tol = 1e-9 * (w + h);
        if (Math.abs(pt[1] - box[2]) <= tol) {
            return pt[0] - box[0];
        }
        if (Math.abs(pt[0] - box[1]) <= tol) {
            return w + (pt[1] - box[2]);
        }
        if (Math.abs(pt[1] - box[3]) <= tol) {
            return w + h + (box[1] - pt[0]);
        }
        return 2 * w + h + (box[3] - pt[1]);
    }

    /** Area (shoelace formula), in units of p1 x p2. */
    public double area() {
        double s = 0;
        int k = polygon.length;
        for (int i = 0; i < k; i++) {
            double[] a = polygon[i];
            double[] b = polygon[(i + 1) % k];
            s += a[0] * b[1] - b[0] * a[1];
        }
        return Math.abs(s) / 2;
    }

    /** Whether (p1, p2) lies inside the polygon (even-odd ray casting). */
    public boolean contains(double p1, double p2) {
        boolean in = false;
        int k = polygon.length;
        for (int i = 0, j = k - 1; i < k; j = i++) {
            double[] a = polygon[i];
            double[] b = polygon[j];
            if ((a[1] > p2) != (b[1] > p2) && p1 < (b[0] - a[0]) * (p2 - a[1]) / (b[1] - a[1]) + a[0]) {
                in = !in;
            }
        }
        return in;
    }
}
