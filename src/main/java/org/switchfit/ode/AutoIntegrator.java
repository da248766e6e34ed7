package org.switchfit.ode;

import org.switchfit.ode.bdf.BdfIntegrator;

/**
 * Starts with the non-stiff {@link DormandPrinceIntegrator} and switches, for the rest of the session, to the
 * stiff BDF integrator when an {@code advance} needs more than {@link #NON_STIFF_STEP_BUDGET} explicit steps (the
 * usual symptom of stiffness: the step size is limited by stability, not accuracy) or fails. Immutable.
 */
public final class AutoIntegrator implements Integrator {
    /** Explicit steps allowed per advance before switching to BDF. */
    public static final int NON_STIFF_STEP_BUDGET = 20_000;

    private final SolverSettings settings;
    private final DormandPrinceIntegrator explicit;
    private final BdfIntegrator stiff;

    public AutoIntegrator(SolverSettings settings) {
        this.settings = settings;
        this.explicit = new DormandPrinceIntegrator(new SolverSettings(settings.method(), settings.rtol(),
                settings.atol(), Math.min(settings.maxSteps(), NON_STIFF_STEP_BUDGET), settings.maxStepSize()));
        this.stiff = new BdfIntegrator(settings);
    }

    public SolverSettings settings() {
        return settings;
    }

    @Override
    public IntegrationSession start(OdeSystem sys, double t0, double[] y0, double[] p, RootFunctions roots,
                                    int[] sensParams, double[] s0) {
        return new Session(sys, t0, y0, p, roots, sensParams, s0);
    }

    /** Delegating session. */
    private final class Session implements IntegrationSession {
        private final OdeSystem sys;
        private final double[] p;
        private final RootFunctions roots;
        private final int[] sens;
        private final double[] y;
        private final double[] s;
        private IntegrationSession current;
        private boolean switched;

        Session(OdeSystem sys, double t0, double[] y0, double[] p, RootFunctions roots, int[] sens, double[] s0) {
            this.sys = sys;
            this.p = p;
            this.roots = roots;
            this.sens = sens;
            int n = sys.stateCount();
            this.y = y0.clone();
            int ns = sens == null ? 0 : sens.length;
            this.s = ns == 0 ? null : (s0 == null ? new double[n * ns] : s0.clone());
            this.current = explicit.start(sys, t0, y0, p, roots, sens, s0);
        }

        @Override
        public double advance(double tOut, double[] yOut, double[] sOut) {
            if (!switched) {
                double t0 = current.time();
                try {
                    double t = current.advance(tOut, yOut, sOut);
                    System.arraycopy(yOut, 0, y, 0, y.length);
                    if (s != null && sOut != null) {
                        System.arraycopy(sOut, 0, s, 0, s.length);
                    }
                    return t;
                } catch (IntegrationException e) {
                    if (Thread.currentThread().isInterrupted()) {
                        throw e;
                    }
                    // restart the failed interval with BDF from the last good point
                    switched = true;
                    current = stiff.start(sys, t0, y, p, roots, sens, s);
                }
            }
            double t = current.advance(tOut, yOut, sOut);
            System.arraycopy(yOut, 0, y, 0, y.length);
            return t;
        }

        @Override
        public boolean stoppedAtRoot() {
            return current.stoppedAtRoot();
        }

        @Override
        public int[] rootsFound() {
            return current.rootsFound();
        }

        @Override
        public double time() {
            return current.time();
        }

        @Override
        public void reset(double[] yNew, double[] sNew) {
            System.arraycopy(yNew, 0, y, 0, y.length);
            if (sNew != null && s != null) {
                System.arraycopy(sNew, 0, s, 0, s.length);
            }
            current.reset(yNew, sNew);
        }

        @Override
        public boolean stopAt(double t) {
            return current.stopAt(t);
        }

        @Override
        public void restartAt(double t, double[] yNew, double[] sNew) {
            System.arraycopy(yNew, 0, y, 0, y.length);
            if (sNew != null && s != null) {
                System.arraycopy(sNew, 0, s, 0, s.length);
            }
            current.restartAt(t, yNew, sNew);
        }

        @Override
        public SolverStats stats() {
            return current.stats();
        }
    }
}
