package org.switchfit.continuation;

import java.util.Locale;
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.Integrator;
import org.switchfit.ode.OdeSystem;

/**
 * Simulated hysteresis experiment: the control parameter is ramped linearly, λ(t) = from + rate·t, and the
 * readout c^T y is sampled; the jump is the largest change of the readout between consecutive samples (see
 * {@link #classify}, which also tells a ramp without a jump or with an oscillating readout). As the ramp slows the
 * jumps approach the folds of the quasi-static branch, with a delay that scales like rate^{2/3} for a slow
 * passage through a saddle-node (Haberman 1979, "Slowly varying jump and transition phenomena associated with
 * algebraic bifurcation problems", SIAM J. Appl. Math. 37:69-106; volume and pages from memory, unverified). Starts
 * from the steady state at {@code from} reached by pseudo-transient continuation from y0 (see
 * {@link SteadyStateSolver}). Immutable and thread-safe when the integrator is.
 */
public final class HysteresisSweep {
    /** Sign changes of the readout's (non-negligible) increments from which a ramp counts as oscillating. */
    static final int OSCILLATION_TURNS = 6;

    private final Integrator integrator;
    private final int samples;

    /**
     * @param integrator integrates the ramped system
     * @param samples    number of samples along the ramp (&gt;= 3)
     */
    public HysteresisSweep(Integrator integrator, int samples) {
        if (samples < 3) {
            throw new IllegalArgumentException(String.format(Locale.ROOT, "need at least 3 samples, got %d", samples));
        }
        this.integrator = integrator;
        this.samples = samples;
    }

    /**
     * Ramps λ = p[control] from {@code from} to {@code to} at speed |rate| (units of λ per unit time).
     *
     * @param readout weights c of the readout c^T y (length n)
     * @throws ContinuationException when no steady state is found at {@code from}
     * @throws org.switchfit.ode.IntegrationException when the integrator fails
     */
    public SweepResult run(OdeSystem sys, double[] y0, double[] p, int control, double from, double to,
                           double rate, double[] readout) {
        int n = sys.stateCount();
        if (readout.length != n || y0.length != n) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "readout has %d and y0 %d entries; the system has %d states", readout.length, y0.length, n));
        }
        double r = Math.abs(rate) * Math.signum(to - from);
        if (r == 0 || !Double.isFinite(r)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "ramp needs a non-zero finite rate and from != to (rate %.3g, from %.6g, to %.6g)", rate, from,
                    to));
        }
        double[] q = p.clone();
        q[control] = from;
        SteadyState start = new SteadyStateSolver(1e-12, 1e-14, 50, 5000, 1e-3, 0).solve(sys, y0, q);
        RampSystem ramp = new RampSystem(sys, control, r);
        double[] z = new double[n + 1];
        System.arraycopy(start.state(), 0, z, 0, n);
        z[n] = from;
        IntegrationSession session = integrator.start(ramp, 0, z, q, null, null, null);
        double duration = (to - from) / r;
        double[] lam = new double[samples];
        double[] out = new double[samples];
        for (int k = 0; k < samples; k++) {
            double t = duration * k / (samples - 1);
            if (k > 0) {
                session.advance(t, z, null);
            }
            lam[k] = z[n];
            double v = 0;
            for (int i = 0; i < n; i++) {
                v += readout[i] * z[i];
            }
            out[k] = v;
        }
        return classify(r, lam, out);
    }

    /**
     * What the sampled readout did. The jump is the largest change between consecutive samples: a sampled
     * derivative can miss a jump that happens between two samples (and be large where nothing jumps), the
     * difference cannot. No jump when the readout is flat (largest change below 1e-9 of its magnitude: rounding
     * and integration tolerances) or changes evenly (largest change at most twice the mean change: a straight
     * line gives exactly the mean). Oscillation when the increments larger than 1 % of the readout's range change
     * sign at least {@value #OSCILLATION_TURNS} times: a jump between branches is one monotone step, a damped
     * approach to a focus after it turns a few times with shrinking increments (common practice; the 1 % and the
     * count are judgement).
     */
    static SweepResult classify(double rate, double[] lam, double[] out) {
        int m = out.length;
        double lo = Double.POSITIVE_INFINITY;
        double hi = Double.NEGATIVE_INFINITY;
        double mag = 0;
        int best = 0;
        double sum = 0;
        for (int k = 0; k < m; k++) {
            lo = Math.min(lo, out[k]);
            hi = Math.max(hi, out[k]);
            mag = Math.max(mag, Math.abs(out[k]));
            if (k + 1 < m) {
                double d = Math.abs(out[k + 1] - out[k]);
                sum += d;
                if (d > Math.abs(out[best + 1] - out[best])) {
                    best = k;
                }
            }
        }
        double big = Math.abs(out[best + 1] - out[best]);
        double range = hi - lo;
        int turns = 0;
        double lastSign = 0;
        for (int k = 0; k + 1 < m; k++) {
            double d = out[k + 1] - out[k];
            if (Math.abs(d) > 0.01 * range) {
                if (lastSign != 0 && Math.signum(d) != lastSign) {
                    turns++;
                }
                lastSign = Math.signum(d);
            }
        }
        if (!(big > 1e-9 * mag)) {
            return new SweepResult(rate, lam, out, SweepResult.Response.NO_JUMP, -1);
        }
        if (turns >= OSCILLATION_TURNS) {
            return new SweepResult(rate, lam, out, SweepResult.Response.OSCILLATION, -1);
        }
        if (big <= 2 * sum / (m - 1)) {
            return new SweepResult(rate, lam, out, SweepResult.Response.NO_JUMP, -1);
        }
        return new SweepResult(rate, lam, out, SweepResult.Response.JUMP, best);
    }
}
