package org.switchfit.report;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.function.UnaryOperator;
import org.switchfit.continuation.BistableRegion;
import org.switchfit.continuation.Branch;
import org.switchfit.continuation.BranchPoint;
import org.switchfit.continuation.Fold;
import org.switchfit.continuation.FoldCurve;
import org.switchfit.continuation.Hopf;
import org.switchfit.continuation.SweepResult;

/**
 * Converts continuation results into the fit-directory records {@link BranchesFile}, {@link RegionFile} and
 * {@link SweepFile}, so the commands that trace branches, regions and sweeps write the schema the report reads.
 * Stateless.
 */
public final class ContinuationFiles {
    private ContinuationFiles() {
    }

    /**
     * {@code branches.json} content. Folds are numbered {@code fold1, fold2, ...} and Hopf points
     * {@code hopf1, ...} in branch order, then point order; fold profiles must use the same ids. A point whose
     * stability was not computed is written as not stable.
     *
     * @param control    control parameter id
     * @param range      {@code [min, max]} traced
     * @param stateIds   ids of the states written (the order of the states {@code toFull} returns)
     * @param branches   traced branches
     * @param toFull     maps a continued state to the written state vector (e.g. a reduced state to all species),
     *                   or null for the identity
     * @param thresholds measured switching thresholds, or null for none
     * @return the file content
     */
    public static BranchesFile branches(String control, double[] range, List<String> stateIds, List<Branch> branches,
                                        UnaryOperator<double[]> toFull, List<BranchesFile.Threshold> thresholds) {
        UnaryOperator<double[]> f = toFull == null ? UnaryOperator.identity() : toFull;
        List<BranchesFile.Special> specials = new ArrayList<>();
        List<BranchesFile.Branch> out = new ArrayList<>();
        int nf = 0;
        int nh = 0;
        for (int b = 0; b < branches.size(); b++) {
            Branch br = branches.get(b);
            List<BranchesFile.Point> pts = new ArrayList<>();
            for (BranchPoint bp : br.points()) {
                pts.add(new BranchesFile.Point(bp.parameter(), f.apply(bp.state()), stability(bp), bp.eigenReal(),
                        bp.eigenImag()));
            }
            out.add(new BranchesFile.Branch("branch" + (b + 1), pts));
            for (Fold fd : br.folds()) {
                specials.add(new BranchesFile.Special("fold" + (++nf), control, fd.parameter(),
                        byId(stateIds, f.apply(fd.state())), BranchesFile.Kind.FOLD));
            }
            for (Hopf h : br.hopfs()) {
                specials.add(new BranchesFile.Special("hopf" + (++nh), control, h.parameter(),
                        byId(stateIds, f.apply(h.state())), BranchesFile.Kind.HOPF));
            }
        }
        return new BranchesFile(control, range, stateIds, specials, out, thresholds);
    }

    /**
     * {@code region.json} content.
     *
     * @param parameter1 id of the first control parameter (p1 of the fold curves)
     * @param parameter2 id of the second control parameter
     * @param range1     {@code [min, max]} of parameter1
     * @param range2     {@code [min, max]} of parameter2
     * @param curves     traced fold curves
     * @param region     the bistable region, or null when none
     * @param fitted     the fitted {@code {p1, p2}}, or null
     * @return the file content
     */
    public static RegionFile region(String parameter1, String parameter2, double[] range1, double[] range2,
                                    List<FoldCurve> curves, BistableRegion region, double[] fitted) {
        List<RegionFile.Curve> cs = new ArrayList<>();
        List<RegionFile.Cusp> cusps = new ArrayList<>();
        for (FoldCurve c : curves) {
            int n = c.points().size();
            double[] p1 = new double[n];
            double[] p2 = new double[n];
            for (int i = 0; i < n; i++) {
                p1[i] = c.points().get(i).p1();
                p2[i] = c.points().get(i).p2();
            }
            cs.add(new RegionFile.Curve(p1, p2));
            for (FoldCurve.Cusp k : c.cusps()) {
                cusps.add(new RegionFile.Cusp(k.p1(), k.p2()));
            }
        }
        RegionFile.Curve poly = null;
        if (region != null) {
            double[][] v = region.polygon();
            double[] x = new double[v.length];
            double[] y = new double[v.length];
            for (int i = 0; i < v.length; i++) {
                x[i] = v[i][0];
                y[i] = v[i][1];
            }
            poly = new RegionFile.Curve(x, y);
        }
        return new RegionFile(parameter1, parameter2, range1, range2, cs, cusps, poly,
                region != null && region.closedByChord(), fitted == null ? null
                : new RegionFile.Cusp(fitted[0], fitted[1]));
    }

    /**
     * {@code sweep.json} content; each ramp's direction follows the sign of its rate, and its one jump (none when
     * the ramp has no jump or oscillates) is placed at {@link SweepResult#jumpParameter()} with the readouts of the
     * samples on either side.
     *
     * @param parameter control parameter id
     * @param readout   readout id
     * @param runs      the ramps
     * @return the file content (rate: |rate| of the first ramp)
     */
    public static SweepFile sweep(String parameter, String readout, List<SweepResult> runs) {
        List<SweepFile.Run> out = new ArrayList<>();
        for (SweepResult r : runs) {
            double[] p = r.parameter();
            double[] y = r.readout();
            List<SweepFile.Jump> jumps = new ArrayList<>();
            int i = r.jumpIndex();
            if (i >= 0) {
                jumps.add(new SweepFile.Jump(r.jumpParameter(), y[i], y[i + 1]));
            }
            out.add(new SweepFile.Run(r.rate() >= 0 ? SweepFile.Direction.UP : SweepFile.Direction.DOWN, p, y,
                    jumps));
        }
        return new SweepFile(parameter, readout, runs.isEmpty() ? Double.NaN : Math.abs(runs.get(0).rate()), out);
    }

    private static Map<String, Double> byId(List<String> ids, double[] y) {
        Map<String, Double> m = new LinkedHashMap<>();
        for (int i = 0; i < ids.size() && i < y.length; i++) {
            m.put(ids.get(i), y[i]);
        }
        return m;
    }

    /** A branch point's stability for the file: null when its eigenvalues were not computed. */
    public static Boolean stability(BranchPoint bp) {
        return bp.unstableCount() < 0 ? null : bp.stable();
    }
}
