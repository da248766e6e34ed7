package org.switchfit.ode;

import java.util.Arrays;
import org.hipparchus.analysis.UnivariateFunction;
import org.hipparchus.analysis.solvers.BracketedUnivariateSolver;
import org.hipparchus.analysis.solvers.BracketingNthOrderBrentSolver;
import org.hipparchus.exception.MathRuntimeException;
import org.hipparchus.ode.ODEState;
import org.hipparchus.ode.ODEStateAndDerivative;
import org.hipparchus.ode.OrdinaryDifferentialEquation;
import org.hipparchus.ode.events.Action;
import org.hipparchus.ode.events.AdaptableInterval;
import org.hipparchus.ode.events.ODEEventDetector;
import org.hipparchus.ode.events.ODEEventHandler;
import org.hipparchus.ode.nonstiff.DormandPrince853Integrator;

/**
 * Non-stiff integrator: the explicit Runge-Kutta pair of order 8(5,3) of Dormand and Prince (Hairer, Norsett and
 * Wanner, Solving Ordinary Differential Equations I, 2nd ed., Springer 1993, section II.10), as implemented by
 * Hipparchus, wrapped into the {@link IntegrationSession} contract. Forward sensitivities integrate the augmented
 * system y' = f, s_c' = J_y s_c + df/dp_k (error control on all components). Roots of switching functions are
 * located by Hipparchus' bracketing event detection; the session stops on the side where the new sign holds.
 * Immutable; sessions are single-threaded. Threads interrupted while integrating get an {@link IntegrationException}.
 */
public final class DormandPrinceIntegrator implements Integrator {
    private final SolverSettings settings;

    /** Integrator with the tolerances, step limit and maximum step of {@code settings} (its method is ignored). */
    public DormandPrinceIntegrator(SolverSettings settings) {
        if (!(settings.rtol() > 0) || !(settings.atol() > 0)) {
            throw new IllegalArgumentException("tolerances must be positive, got rtol=" + settings.rtol()
                    + " atol=" + settings.atol());
        }
        this.settings = settings;
    }

    public SolverSettings settings() {
        return settings;
    }

    @Override
    public IntegrationSession start(OdeSystem sys, double t0, double[] y0, double[] p, RootFunctions roots,
                                    int[] sensParams, double[] s0) {
        return new Session(sys, t0, y0, p, roots, sensParams, s0, settings);
    }

    /** One integration. */
    private static final class Session implements IntegrationSession {
        private final OdeSystem sys;
        private final int n;
        private final int m;
        private final double[] p;
        private final RootFunctions roots;
        private final int[] sens;
        private final int ns;
        private final SolverSettings settings;
        private final double[] jy;
        private final double[] jp;
        private final double[] dy;
        private final double[] g0;
        private final double[] g1;
        private double t;
        private double[] z;
        private double lastStep = Double.NaN;
        private boolean atRoot;
        private int[] found = new int[0];
        private long steps;
        private long rhsCalls;
        private long jacCalls;

        Session(OdeSystem sys, double t0, double[] y0, double[] p, RootFunctions roots, int[] sens, double[] s0,
                SolverSettings settings) {
            this.sys = sys;
            this.n = sys.stateCount();
            this.m = sys.parameterCount();
            this.p = p;
            this.roots = roots;
            this.sens = sens == null ? new int[0] : sens.clone();
            this.ns = this.sens.length;
            this.settings = settings;
            this.jy = ns > 0 ? new double[n * n] : null;
            this.jp = ns > 0 ? new double[n * Math.max(m, 1)] : null;
            this.dy = new double[n];
            this.t = t0;
            this.z = new double[n * (1 + ns)];
            System.arraycopy(y0, 0, z, 0, n);
            if (ns > 0 && s0 != null) {
                System.arraycopy(s0, 0, z, n, n * ns);
            }
            int nr = roots == null ? 0 : roots.count();
            this.g0 = new double[nr];
            this.g1 = new double[nr];
        }

        private final OrdinaryDifferentialEquation ode = new OrdinaryDifferentialEquation() {
            @Override
            public int getDimension() {
                return n * (1 + ns);
            }

            @Override
            public double[] computeDerivatives(double time, double[] zz) {
                if (Thread.currentThread().isInterrupted()) {
                    throw new IntegrationException(time, "interrupted");
                }
                // Hipparchus keeps each returned stage array, so a new array per call is required here
                double[] out = new double[zz.length];
                rhsCalls++;
                sys.rhs(time, zz, p, out);
                if (ns > 0) {
                    jacCalls++;
                    sys.jacobianY(time, zz, p, jy);
                    if (m > 0) {
                        sys.jacobianP(time, zz, p, jp);
                    }
                    for (int c = 0; c < ns; c++) {
                        int off = n * (1 + c);
                        int k = sens[c];
                        for (int i = 0; i < n; i++) {
                            double s = k >= 0 ? jp[i * m + k] : 0.0;
                            int row = i * n;
                            for (int j = 0; j < n; j++) {
                                s += jy[row + j] * zz[off + j];
                            }
                            out[off + i] = s;
                        }
                    }
                }
                return out;
            }
        };

        @Override
        public double advance(double tOut, double[] yOut, double[] sOut) {
            if (!(tOut >= t)) {
                throw new IllegalArgumentException("tOut " + tOut + " is before the current time " + t);
            }
            atRoot = false;
            found = new int[0];
            if (tOut == t) {
                copyOut(yOut, sOut);
                return t;
            }
            double span = Math.abs(tOut - t);
            double scale = Math.max(Math.abs(tOut), 1.0);
            if (span <= 2000 * Math.ulp(scale)) {
                // below what the Runge-Kutta driver accepts: one Euler step (error ~ span^2, negligible)
                eulerStep(tOut - t);
                t = tOut;
                copyOut(yOut, sOut);
                return t;
            }
            double maxStep = Math.min(settings.maxStepSize(), span);
            DormandPrince853Integrator integ = new DormandPrince853Integrator(0.0, maxStep, settings.atol(),
                    settings.rtol());
            long maxEval = Math.min(Integer.MAX_VALUE, (long) settings.maxSteps() * 13L);
            integ.setMaxEvaluations((int) maxEval);
            if (lastStep > 0 && lastStep <= maxStep) {
                integ.setInitialStepSize(lastStep);
            }
            integ.addStepHandler(new org.hipparchus.ode.sampling.ODEStepHandler() {
                @Override
                public void handleStep(org.hipparchus.ode.sampling.ODEStateInterpolator interpolator) {
                    steps++;
                }
            });
            int nr = g0.length;
            boolean[] hit = new boolean[nr];
            if (nr > 0) {
                roots.evaluate(t, z, p, g0);
                double tolT = 4 * Math.ulp(scale) + 1e-12 * scale;
                for (int k = 0; k < nr; k++) {
                    integ.addEventDetector(new Detector(k, hit, tolT, maxStep));
                }
            }
            ODEStateAndDerivative fin;
            try {
                fin = integ.integrate(ode, new ODEState(t, z.clone()), tOut);
            } catch (IntegrationException e) {
                throw e;
            } catch (MathRuntimeException e) {
                throw new IntegrationException(t, e.getMessage());
            }
            double h = Math.abs(integ.getCurrentSignedStepsize());
            if (h > 0 && Double.isFinite(h)) {
                lastStep = h;
            }
            double tr = fin.getTime();
            double[] zr = fin.getPrimaryState();
            for (double v : zr) {
                if (!Double.isFinite(v)) {
                    throw new IntegrationException(tr, "a state became NaN or infinite");
                }
            }
            t = tr;
            z = zr;
            if (tr < tOut) {
                atRoot = true;
                roots.evaluate(t, z, p, g1);
                // the bracketing may end exactly on the root; step on until the new sign holds (contract)
                double tolT = 4 * Math.ulp(scale) + 1e-12 * scale;
                double delta = tolT;
                for (int tries = 0; tries < 20 && t + delta < tOut && !newSignHolds(hit); tries++) {
                    eulerStep(delta);
                    t += delta;
                    roots.evaluate(t, z, p, g1);
                    delta *= 2;
                }
                int c = 0;
                int[] tmp = new int[nr];
                for (int k = 0; k < nr; k++) {
                    if (hit[k] || Math.signum(g1[k]) != Math.signum(g0[k])) {
                        tmp[c++] = k;
                    }
                }
                found = Arrays.copyOf(tmp, c);
            } else {
                t = tOut;
            }
            copyOut(yOut, sOut);
            return t;
        }

        private boolean newSignHolds(boolean[] hit) {
            for (int k = 0; k < hit.length; k++) {
                if (hit[k] && (g1[k] == 0.0 || Math.signum(g1[k]) == Math.signum(g0[k]))) {
                    return false;
                }
            }
            return true;
        }

        /** Explicit Euler step of the augmented system (used only for steps of a few ulps). */
        private void eulerStep(double h) {
            double[] d = ode.computeDerivatives(t, z);
            for (int i = 0; i < z.length; i++) {
                z[i] += h * d[i];
            }
        }

        private void copyOut(double[] yOut, double[] sOut) {
            System.arraycopy(z, 0, yOut, 0, n);
            if (sOut != null && ns > 0) {
                System.arraycopy(z, n, sOut, 0, n * ns);
            }
        }

        @Override
        public boolean stoppedAtRoot() {
            return atRoot;
        }

        @Override
        public int[] rootsFound() {
            return found.clone();
        }

        @Override
        public double time() {
            return t;
        }

        @Override
        public void reset(double[] y, double[] s) {
            System.arraycopy(y, 0, z, 0, n);
            if (s != null && ns > 0) {
                System.arraycopy(s, 0, z, n, n * ns);
            }
            lastStep = Double.NaN;
        }

        /**
         * Honoured without bookkeeping: every {@link #advance} integrates exactly to its target and never steps past
         * it, so the simulator can end an advance at a known switch of the right-hand side on time. Without it, one
         * Runge-Kutta step spanned a short pulse (f = 1 on [1.2, 1.3)), its stages mixed both branches of f and
         * the step was accepted (0.154 instead of 0.1 at t = 3).
         */
        @Override
        public boolean stopAt(double ts) {
            return ts >= t;
        }

        @Override
        public void restartAt(double tNew, double[] y, double[] s) {
            if (!(tNew >= t)) {
                throw new IllegalArgumentException("restart time " + tNew + " lies before the current time " + t);
            }
            t = tNew;
            reset(y, s);
        }

        @Override
        public SolverStats stats() {
            return new SolverStats(steps, 0, rhsCalls, jacCalls, 0);
        }

        /** Event detector for switching function k; stops the integration. */
        /**
         * Magnitude returned for an exact 0 of a switching function (with the sign it takes just after). Not
         * Double.MIN_VALUE: the root solver tests a bracket by the sign of the product of its end values, and
         * -0.1 * 4.9e-324 underflows to -0.0, so a time trigger t >= 1 reached exactly at an output time t = 1
         * failed its root search ("interval does not bracket a root"). 1e-150 keeps such products non-zero for
         * any value above 1e-173 in magnitude and is still negligible against every value a model produces.
         */
        private static final double EXACT_ZERO_MAGNITUDE = 1e-150;

        private final class Detector implements ODEEventDetector {
            private final int k;
            private final boolean[] hit;
            private final double[] g = new double[g0.length];
            private final BracketedUnivariateSolver<UnivariateFunction> solver;
            private final double maxCheck;
            private final double tolT;
            private double[] ahead;

            Detector(int k, boolean[] hit, double tolT, double maxCheck) {
                this.k = k;
                this.tolT = tolT;
                this.hit = hit;
                this.solver = new BracketingNthOrderBrentSolver(0.0, tolT, 0.0, 5);
                this.maxCheck = maxCheck;
            }

            @Override
            public AdaptableInterval getMaxCheckInterval() {
                return (state, forward) -> maxCheck;
            }

            @Override
            public int getMaxIterationCount() {
                return 200;
            }

            @Override
            public BracketedUnivariateSolver<UnivariateFunction> getSolver() {
                return solver;
            }

            @Override
            public ODEEventHandler getHandler() {
                return (state, detector, increasing) -> {
                    hit[k] = true;
                    return Action.STOP;
                };
            }

            @Override
            public double g(ODEStateAndDerivative state) {
                if (Thread.currentThread().isInterrupted()) {
                    throw new IntegrationException(state.getTime(), "interrupted");
                }
                double t = state.getTime();
                roots.evaluate(t, state.getPrimaryState(), p, g);
                if (g[k] != 0.0) {
                    return g[k];
                }
                // An exact 0 takes the sign the function has just after t, from the state moved along its
                // derivative (y + h y'), else (a function that stays 0) the negative side. Handing the 0 on made a
                // switching function that stays 0 (abs(Q - R) > maxdiff while all three are equal) an endless
                // search of the event detection for the sign after a step's start, and the integration never
                // advanced (SBML Test Suite 01591).
                double[] y = state.getPrimaryState();
                double[] dy = state.getPrimaryDerivative();
                double h = Math.max(tolT, 1e-10 * Math.max(1.0, Math.abs(t)));
                if (ahead == null) {
                    ahead = new double[y.length];
                }
                for (int i = 0; i < y.length; i++) {
                    ahead[i] = y[i] + h * dy[i];
                }
                roots.evaluate(t + h, ahead, p, g);
                return g[k] > 0 ? EXACT_ZERO_MAGNITUDE : -EXACT_ZERO_MAGNITUDE;
            }
        }
    }
}
