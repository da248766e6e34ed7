package org.switchfit.continuation;

import java.util.Locale;
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.Integrator;
import org.switchfit.ode.OdeSystem;

/**
 * Simulated hysteresis experiment: the control parameter is ramped linearly, λ(t) = from + rate·t, and the
 * readout c^T y is sampled; the jump is where |d(c^T y)/dλ| = |c^T f| / |rate| is largest. As the ramp slows the
 * jumps approach the folds of the quasi-static branch, with a delay that scales like rate^{2/3} for a slow
 * passage through a saddle-node (Haberman 1979, "Slowly varying jump and transition phenomena associated with
 * algebraic bifurcation problems", SIAM J. Appl. Math. 37:69-106; volume and pages from memory, unverified). Starts
 * from the steady state at {@code from} reached by pseudo-transient continuation from y0 (see
 * {@link SteadyStateSolver}). Immutable and thread-safe when the integrator is.
 */
public final class HysteresisSweep {
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
        double[] slope = new double[samples];
        double[] f = new double[n + 1];
        for (int k = 0; k < samples; k++) {
            double t = duration * k / (samples - 1);
            if (k > 0) {
                session.advance(t, z, null);
            }
            lam[k] = z[n];
            double s = 0;
            for (int i = 0; i < n; i++) {
                s += readout[i] * z[i];
            }
            out[k] = s;
            ramp.rhs(t, z, q, f);
            double d = 0;
            for (int i = 0; i < n; i++) {
                d += readout[i] * f[i];
            }
            slope[k] = Math.abs(d / r);
        }
        int best = 0;
        for (int k = 1; k < samples; k++) {
            if (slope[k] > slope[best]) {
                best = k;
            }
        }
        double jump = lam[best];
        if (best > 0 && best < samples - 1) {
            double a = slope[best - 1];
            double b = slope[best];
            double c = slope[best + 1];
            double den = a - 2 * b + c;
            if (den < 0) {
                double off = 0.5 * (a - c) / den;
                jump = lam[best] + off * (lam[best + 1] - lam[best - 1]) / 2;
            }
        }
        return new SweepResult(r, lam, out, jump, slope[best]);
    }
}
