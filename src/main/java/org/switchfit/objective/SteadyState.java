package org.switchfit.objective;

import java.util.Locale;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.IntegrationSession;

/**
 * Steady state by simulation: integrates (states and, when given, sensitivities) over growing intervals
 * (1, 10, 100, ... time units) until the right-hand side is negligible in the weighted max norm
 * {@code max_i |f_i| / (atol + rtol |y_i|) <= 1} and the state changed by at most {@link #CHANGE_FACTOR} rtol over
 * the last interval (so a state that grows without limit is not taken as steady once its rate is small beside
 * itself). Robust with conservation laws (no Jacobian inversion); the
 * sensitivities, when integrated, must have settled by the same measure: {@code max |ṡ| / (atol + rtol |s|) <= 1}
 * over every entry, with {@code ṡ = J s + ∂f/∂θ} (forward sensitivity equations). Without that test a state that
 * starts at (or very near) its steady state would stop at once with the sensitivities of the start, not those of
 * the steady state, which they approach only on the system's own time scale (found by a closed-form test: a
 * pre-equilibration starting exactly at the steady state gave dX/dk 4 times too small). A run that needs more than
 * {@link #MAX_STEPS} solver steps stops with an {@link IntegrationException}: the approach to a stable steady state lets the step size grow with time (a few
 * hundred steps in all: at most 751 measured over the pre-equilibrations of the PEtab benchmarks Brannmark,
 * Isensee, Raimundez and Zheng at their nominal values), while a solution that keeps oscillating holds the step
 * size at a fraction of its period and would otherwise run the integrator's full step limit (500000 per call,
 * seconds of CPU) in every evaluation of a fit that visits such parameters. Immutable.
 *
 * @param rtol    relative tolerance on |f| (per unit time)
 * @param atol    absolute tolerance on |f| (per unit time)
 * @param maxTime give up after this much simulated time
 */
public record SteadyState(double rtol, double atol, double maxTime) {

    /** Solver steps allowed for one steady-state run: 50000, about 65 times the most measured (see above). */
    public static final long MAX_STEPS = 50_000;

    /**
     * Bound on the state's change over the last interval (relative, in units of rtol) for a steady state reached by
     * integration. A small rate alone, |f| <= atol + rtol |y|, is not enough: it holds for a state that grows
     * without limit once |y| >= |f| / rtol (x' = k passed at x = 1e8 k, t = 1e8, and was taken as steady), and on a
     * slow approach (time scale 1/d) it leaves y off by |f| / d (1.5e-5 relative measured at d = 1e-6). Over an
     * interval of 0.9 t (the run's decades) a growing state changes by about itself, and an exponential approach
     * that changed by at most 100 rtol over the last decade has settled to well below that. 100 rtol rather than
     * rtol: the integrator holds a settled state only to its own local tolerance, step after step.
     */
    static final double CHANGE_FACTOR = 100.0;

    /** Defaults: rtol 1e-8, atol 1e-12, max time 1e10. */
    public static SteadyState defaults() {
        return new SteadyState(1e-8, 1e-12, 1e10);
    }

    /**
     * Runs {@code session} (positioned at its current time with state {@code y}) to a steady state.
     *
     * @param p     the effective parameters the session uses
     * @param y     receives the steady state
     * @param s     receives the sensitivities (or null)
     * @param what  names the condition for messages
     * @throws IntegrationException when no steady state is reached before {@link #maxTime}
     */
    void run(IntegrationSession session, CompiledModel model, double[] p, double[] y, double[] s, String what) {
        run(session, model, null, null, p, y, s, what);
    }

    /**
     * As {@link #run(IntegrationSession, CompiledModel, double[], double[], double[], String)}; when {@code s} is not
     * null, also until the sensitivities of system {@code sys} (the session's system, with sensitivity parameters
     * {@code sensParams}) have settled.
     */
    void run(IntegrationSession session, CompiledModel model, org.switchfit.ode.OdeSystem sys, int[] sensParams,
             double[] p, double[] y, double[] s, String what) {
        int n = model.stateCount();
        double[] f = new double[n];
        SensitivityRate rate = s != null && sys != null && sensParams.length > 0
                ? new SensitivityRate(sys, sensParams) : null;
        double t = session.time();
        double dt = 1.0;
        long steps0 = session.stats().steps();
        double lastLength = 0.0;
        long lastSteps = 0;
        double[] before = null;
        while (true) {
            double worst = worst(model, rate, t, y, p, s, f);
            if (worst <= 1.0 && (before == null || change(before, y) <= 1.0)) {
                return;
            }
            if (t >= maxTime) {
                throw new IntegrationException(t, String.format(Locale.ROOT, "%s: no steady state up to t = %.3g "
                        + "(%s)", what, t, worst > 1.0
                                ? String.format(Locale.ROOT, "right-hand side still %.3g times the tolerance", worst)
                                : String.format(Locale.ROOT, "the state still changed by %.3g times the tolerance "
                                        + "over the last decade of time, as a state that grows without limit does",
                                        change(before, y))));
            }
            long used = session.stats().steps() - steps0;
            if (used > MAX_STEPS) {
                throw new IntegrationException(t, String.format(Locale.ROOT, "%s: no steady state within %d solver "
                        + "steps (t = %.3g, right-hand side still %.3g times the tolerance; the solution keeps "
                        + "changing on a short time scale, as in sustained oscillations)", what, MAX_STEPS, t, worst));
            }
            // The next interval is the next decade unless the steps the last one took say it would overrun the
            // budget inside one advance call; then it is shortened so the budget check above comes first.
            double length = dt;
            if (lastSteps > 0) {
                double affordable = lastLength * (double) (MAX_STEPS - used) / lastSteps;
                length = Math.min(dt, Math.max(lastLength, affordable));
            }
            long stepsBefore = session.stats().steps();
            before = before == null ? y.clone() : before;
            System.arraycopy(y, 0, before, 0, n);
            t = session.advance(t + length, y, s);
            lastSteps = session.stats().steps() - stepsBefore;
            lastLength = length;
            if (length == dt) {
                dt *= 10.0;
            }
        }
    }

    /**
     * Whether (y, s) at time t is settled by the criteria of {@link #run}: |f| and, when {@code s} is not null, the
     * sensitivities' rate within tolerance, and y changed by at most {@link #CHANGE_FACTOR} rtol since
     * {@code previous} (the state one interval before; null at the first point).
     */
    boolean settled(CompiledModel model, org.switchfit.ode.OdeSystem sys, int[] sensParams, double t, double[] y,
                    double[] p, double[] s, double[] previous) {
        SensitivityRate rate = s != null && sensParams.length > 0 ? new SensitivityRate(sys, sensParams) : null;
        return worst(model, rate, t, y, p, s, new double[model.stateCount()]) <= 1.0
                && (previous == null || change(previous, y) <= 1.0);
    }

    /**
     * max_i |y_i - before_i| / (atol + CHANGE_FACTOR rtol |y_i|): the state's change over the last interval
     * in units of its tolerance. See {@link #CHANGE_FACTOR}.
     */
    private double change(double[] before, double[] y) {
        double worst = 0.0;
        for (int i = 0; i < y.length; i++) {
            worst = Math.max(worst, Math.abs(y[i] - before[i]) / (atol + CHANGE_FACTOR * rtol * Math.abs(y[i])));
        }
        return worst;
    }

    /**
     * The settling measure of {@link #run}: max |f_i| / (atol + rtol |y_i|), and, when it is at most 1 and
     * {@code rate} is not null, the sensitivities' ({@link SensitivityRate#worst}). {@code f} is scratch (length n).
     */
    private double worst(CompiledModel model, SensitivityRate rate, double t, double[] y, double[] p, double[] s,
                         double[] f) {
        model.rhs(t, y, p, f);
        double worst = 0.0;
        for (int i = 0; i < f.length; i++) {
            worst = Math.max(worst, Math.abs(f[i]) / (atol + rtol * Math.abs(y[i])));
        }
        return worst <= 1.0 && rate != null ? rate.worst(t, y, p, s, atol, rtol) : worst;
    }

    /** ṡ = J s + ∂f/∂θ of a sensitivity system, for the settling test of {@link #run}. */
    private static final class SensitivityRate {
        private final org.switchfit.ode.OdeSystem sys;
        private final int[] cols;
        private final int n;
        private final double[] jac;
        private final double[] fp;
        private final double[] work;

        SensitivityRate(org.switchfit.ode.OdeSystem sys, int[] cols) {
            this.sys = sys;
            this.cols = cols.clone();
            this.n = sys.stateCount();
            this.jac = new double[n * n];
            this.fp = new double[cols.length * n];
            this.work = new double[sys.jacobianPColumnsWork()];
        }

        /** max over columns c and states i of |ṡ_ci| / (atol + rtol |s_ci|), s column-major by column. */
        double worst(double t, double[] y, double[] p, double[] s, double atol, double rtol) {
            sys.jacobianY(t, y, p, jac);
            sys.jacobianPColumns(t, y, p, cols, fp, work);
            double worst = 0.0;
            for (int c = 0; c < cols.length; c++) {
                int off = c * n;
                for (int i = 0; i < n; i++) {
                    double d = fp[off + i];
                    int row = i * n;
                    for (int j = 0; j < n; j++) {
                        d += jac[row + j] * s[off + j];
                    }
                    worst = Math.max(worst, Math.abs(d) / (atol + rtol * Math.abs(s[off + i])));
                }
            }
            return worst;
        }
    }
}
