package org.switchfit.objective;

import java.util.ArrayList;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import org.switchfit.data.DoseResponsePoint;
import org.switchfit.data.SwitchingThreshold;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ObservableDef;
import org.switchfit.problem.ValueSource;

/**
 * Builds the {@link ThresholdBlock}s and {@link DoseResponseBlock}s of a problem's switching-threshold and
 * dose-response data ({@link EstimationProblem#extraData()}): one threshold block per (experiment, control,
 * direction), one dose-response block per (experiment, control, history).
 *
 * <p><b>Control range.</b> Per (experiment, control) the sweep range is [min(0, smallest datum), 1.5 x largest
 * datum] over that pair's measured thresholds and doses (1 when the largest datum is not positive): it contains
 * every datum with a margin so the switch-off sweep starts beyond the switch-on fold of typical data. A model
 * threshold that leaves the range makes the evaluation fail ({@link ObjectiveException}), which the optimiser
 * treats as a rejected step.
 *
 * <p><b>Steepest-response readout</b> (used only where the model is monostable): the state gradient of the
 * observable of that pair's dose-response points (else the problem's first observable) at the nominal initial
 * state and parameters.
 */
final class SwitchingBlocks {
    private SwitchingBlocks() {
    }

    /** The blocks of all threshold and dose-response data of the problem (empty when it has none). */
    static List<ResidualBlock> of(EstimationProblem problem) {
        return build(problem, null);
    }

    /** The threshold blocks keyed by fold id {@code experiment/control/up|down}. */
    static LinkedHashMap<String, ThresholdBlock> thresholds(EstimationProblem problem) {
        LinkedHashMap<String, ThresholdBlock> out = new LinkedHashMap<>();
        build(problem, out);
        return out;
    }

    private static List<ResidualBlock> build(EstimationProblem problem, Map<String, ThresholdBlock> byId) {
        List<ResidualBlock> blocks = new ArrayList<>();
        if (problem.extraData().isEmpty()) {
            return blocks;
        }
        SwitchingModel sm = new SwitchingModel(problem);
        Map<String, double[]> range = new LinkedHashMap<>();
        Map<String, String> readoutObs = new LinkedHashMap<>();
        Map<String, List<SwitchingThreshold>> th = new LinkedHashMap<>();
        Map<String, List<DoseResponsePoint>> dr = new LinkedHashMap<>();
        for (Object o : problem.extraData()) {
            if (o instanceof SwitchingThreshold t) {
                widen(range, t.experiment() + "\u0000" + t.control(), t.value());
                th.computeIfAbsent(t.experiment() + "\u0000" + t.control() + "\u0000" + t.direction(),
                        k -> new ArrayList<>()).add(t);
            } else if (o instanceof DoseResponsePoint p) {
                String pair = p.experiment() + "\u0000" + p.control();
                widen(range, pair, p.dose());
                readoutObs.putIfAbsent(pair, p.observable());
                dr.computeIfAbsent(pair + "\u0000" + p.history(), k -> new ArrayList<>()).add(p);
            }
        }
        for (List<SwitchingThreshold> g : th.values()) {
            SwitchingThreshold f = g.get(0);
            String pair = f.experiment() + "\u0000" + f.control();
            double[] r = limits(range.get(pair));
            ThresholdBlock b = new ThresholdBlock(sm, g, r[0], r[1], readout(sm, readoutObs.get(pair)));
            blocks.add(b);
            if (byId != null) {
                byId.put(b.id(), b);
            }
        }
        for (List<DoseResponsePoint> g : dr.values()) {
            DoseResponsePoint f = g.get(0);
            double[] r = limits(range.get(f.experiment() + "\u0000" + f.control()));
            blocks.add(new DoseResponseBlock(sm, g, r[0], r[1]));
        }
        return blocks;
    }

    private static void widen(Map<String, double[]> range, String key, double v) {
        double[] r = range.computeIfAbsent(key, k -> new double[] {Double.POSITIVE_INFINITY,
                Double.NEGATIVE_INFINITY});
        r[0] = Math.min(r[0], v);
        r[1] = Math.max(r[1], v);
    }

    private static double[] limits(double[] minMax) {
        double lo = Math.min(0.0, minMax[0]);
        double hi = minMax[1] > 0 ? 1.5 * minMax[1] : 1.0;
        return new double[] {lo, hi};
    }

    /** State gradient of the observable (by id, or the first one when null) at the nominal initial state. */
    private static double[] readout(SwitchingModel sm, String obsId) {
        EstimationProblem problem = sm.problem;
        int o = 0;
        List<ObservableDef> defs = problem.observables();
        for (int j = 0; j < defs.size(); j++) {
            if (defs.get(j).id().equals(obsId)) {
                o = j;
            }
        }
        double[] c = new double[sm.n];
        if (defs.isEmpty()) {
            java.util.Arrays.fill(c, 1.0);
            return c;
        }
        double[] p = sm.model.parameterValues();
        double[] y = new double[sm.n];
        double[] pe = new double[sm.m];
        sm.model.initialValues(0, p, y, pe);
        double[] qe = new double[problem.qLength()];
        System.arraycopy(pe, 0, qe, 0, sm.m);
        double[] theta = problem.nominalTheta();
        double[] lin = problem.toLinear(theta);
        List<ValueSource> g = problem.globalSources();
        for (int k = 0; k < g.size(); k++) {
            qe[sm.m + k] = g.get(k).isTheta() ? lin[g.get(k).thetaIndex()] : g.get(k).constant();
        }
        int cnt = problem.observableDerivativeCount(o);
        double[] d = new double[cnt];
        problem.evaluateObservableDerivatives(o, 0.0, y, qe, d);
        int[] rows = problem.observableDerivativeRows(o);
        int[] cols = problem.observableDerivativeCols(o);
        boolean any = false;
        for (int e = 0; e < cnt; e++) {
            if (rows[e] == 0 && cols[e] < sm.n && Double.isFinite(d[e])) {
                c[cols[e]] += d[e];
                any |= d[e] != 0;
            }
        }
        if (!any) {
            java.util.Arrays.fill(c, 1.0);
        }
        return c;
    }
}
