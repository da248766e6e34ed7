package org.switchfit.ode.bdf;

import java.util.Locale;
import org.switchfit.linalg.LuSolver;
import org.switchfit.linalg.LuSolvers;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.IntegrationSession;
import org.switchfit.ode.OdeSystem;
import org.switchfit.ode.RootFunctions;
import org.switchfit.ode.SolverSettings;
import org.switchfit.ode.SolverStats;

/**
 * One BDF integration: variable order 1 to 5, variable step, fixed-leading-coefficient form in a Nordsieck
 * history array, with forward sensitivities by the staggered direct method and root finding on the dense output.
 *
 * <p><b>Method.</b> A transcription of the fixed-leading-coefficient BDF as described by Hindmarsh et
 * al., "SUNDIALS: Suite of nonlinear and differential/algebraic equation solvers", ACM TOMS 31(3):363-396, 2005
 * (doi:10.1145/1089014.1089020), going back to Jackson &amp; Sacks-Davis, ACM TOMS 6(3):295-318, 1980
 * (doi:10.1145/355900.355903) and to Byrne &amp; Hindmarsh, ACM TOMS 1(1):71-96, 1975 (doi:10.1145/355626.355636) and
 * Brown, Byrne &amp; Hindmarsh, SIAM J. Sci. Stat. Comput. 10(5):1038-1051, 1989 (doi:10.1137/0910062). The
 * history array is {@code zn[j] = h^j y^(j) / j!}, j = 0..q; {@code zn[5]} also keeps the last correction for the
 * order-raising estimate. Each step predicts with the Pascal matrix, solves the corrector
 * {@code (I - gamma J) delta = gamma f(t_n, y) - (zn[1] / l_1 + acor)} by a modified Newton iteration
 * ({@code gamma = h / l_1}, at most 3 iterations, convergence rate estimate as in the reference), and accepts
 * when {@code tq_2 * ||acor||_WRMS <= 1}. Step and order follow the reference's step-size ratios
 * (safety factors 6, 6, 10; no change below a ratio of 1.5; order changes at most once per q+1 steps).
 *
 * <p><b>Iteration matrix.</b> M = I - gamma J is factored with the {@link LuSolvers} choice for the structure of
 * {@link OdeSystem#jacobianPattern()} (sparse LU for large sparse systems); the dense LU counts only exactly zero
 * pivots as singular (see {@code SystemStructure#newIterationSolver}). M is refactored when gamma changed by
 * more than 30 %, every 20 steps, or after a convergence failure; J itself is re-evaluated every 50 steps or after
 * a failure with a stale J (and every step when sensitivities are on, see below). Between refactorisations the
 * Newton correction is scaled by 2 / (1 + gamma / gamma_M) to compensate for the stale gamma.
 *
 * <p><b>Sensitivities.</b> Staggered direct method (Caracotsios &amp; Stewart, Comput. Chem. Eng. 9(4):359-365,
 * 1985, doi:10.1016/0098-1354(85)85014-6; Feehery, Tolsma &amp; Barton, Appl. Numer. Math. 25(1):41-54, 1997,
 * doi:10.1016/S0168-9274(97)00050-0): after the state corrector has converged and passed its error test, J and
 * df/dp are evaluated at the new state and each sensitivity column is corrected with the same iteration matrix
 * (linear equations, so with a fresh M one iteration suffices; with a stale M up to 3). Sensitivities are
 * <em>included</em> in the error test and in step/order selection, with the same atol and rtol as the states:
 * this keeps gradients for fitting accurate to the requested tolerance. The weight of a parameter column's
 * component is {@code 1 / (atol + rtol max(|s_ci|, |y_i|))}: a change of the parameter by one unit moves y_i by
 * s_ci, and y_i itself is resolved only to {@code atol + rtol |y_i|}, so s_ci is asked for no more absolute
 * accuracy than its state has (without the |y_i| floor a sensitivity near 0 of a state near 3e5 was held to
 * atol 1e-12, 18 digits below the state, and the error test rejected round-off: measured 10 times the steps of
 * the plain simulation on SalazarCavazos_MBoC2020). Columns with parameter index -1 are initial-value
 * sensitivities (no df/dp term; weight {@code 1 / (atol + rtol |s_ci|)}, as the unit of y0 is the state's own).
 * Array layout {@code s[c * n + i] = dy_i / dtheta_c}.
 *
 * <p><b>Output and roots.</b> Steps may pass the requested output time; the result is interpolated on the
 * Nordsieck polynomial of the last step ({@code y(t) = sum_j zn[j] ((t - t_n) / h)^j}), so {@code advance}
 * returns exactly {@code tOut}. Use {@link #setStopTime} to forbid stepping past a time (a discontinuity).
 * Switching functions use the sign convention "g &gt;= 0 is one side, g &lt; 0 the other"; a root is located by
 * an Illinois-type secant with bisection safeguard on the interpolant (contract in {@link IntegrationSession}).
 *
 * <p>Failures: an {@link IntegrationException} leaves the session at the last accepted step; it may be
 * {@link #reset} and continued, but usually it is discarded.
 *
 * <p>Hot loop: no allocation per step, no boxing (JMH {@code BdfBenchmark} with {@code -prof gc}: the only
 * allocation per integration is the session's own workspace). Not thread-safe.
 */
public final class BdfSession implements IntegrationSession {

    private static final int QMAX = 5;
    private static final int MAXCOR = 3;
    private static final int MXNCF = 10;
    private static final int MXNEF = 7;
    private static final int MXNEF1 = 3;
    private static final int SMALL_NEF = 2;
    private static final int SMALL_NST = 10;
    private static final int MSBP = 20;
    private static final int MSBJ = 50;
    private static final double DGMAX = 0.3;
    private static final double CRDOWN = 0.3;
    private static final double RDIV = 2.0;
    private static final double NLSCOEF = 0.1;
    private static final double ETAMX1 = 10000.0;
    private static final double ETAMX2 = 10.0;
    private static final double ETAMX3 = 10.0;
    private static final double ETAMXF = 0.2;
    private static final double ETAMIN = 0.1;
    private static final double ETACF = 0.25;
    private static final double ADDON = 1e-6;
    private static final double BIAS1 = 6.0;
    private static final double BIAS2 = 6.0;
    private static final double BIAS3 = 10.0;
    private static final double THRESH = 1.5;

    /**
     * Smallest step in units of ulp(t): below 16 ulps the step size itself is resolved to worse than about 6 %, and
     * steps that small usually mean the error test sits on round-off (measured: sensitivities of
     * Smith_BMCSystBiol2013 at atol 1e-14 crept on at 5 ulps for 500000 steps); fail fast instead.
     */
    static final double HMIN_ULPS = 16.0;

    /** The smallest step the step loop takes at time t: {@link #HMIN_ULPS} ulps of t. */
    private static double minStep(double t) {
        return HMIN_ULPS * Math.ulp(t);
    }

    static final String MSG_STEP_UNDERFLOW = "step size fell to %.3g (below the resolution of t); the solution may"
            + " have a singularity or a discontinuity here: check the model or loosen rtol (now %.3g)";
    static final String MSG_MAX_STEPS = "more than %d steps in one advance call (last step size %.3g); raise"
            + " maxSteps, loosen the tolerances or check for fast oscillations";
    static final String MSG_CONV_FAIL = "the Newton corrector failed %d times in one step (step size %.3g);"
            + " the Jacobian may be wrong or the system may blow up";
    static final String MSG_ERR_FAIL = "the local error test failed %d times in one step (step size %.3g, error"
            + " norm %.3g)%s";
    static final String MSG_NONFINITE = "; non-finite values appeared in the state or the right-hand side";

    private static final int FIRST_CALL = 0;
    private static final int PREV_CONV_FAIL = 1;
    private static final int PREV_ERR_FAIL = 2;
    private static final int CONVFAIL_NONE = 0;
    private static final int CONVFAIL_BAD_J = 1;
    private static final int CONVFAIL_OTHER = 2;
    private static final int SOLVED = 0;
    private static final int CONV_RECOVER = 1;
    private static final int TRY_AGAIN = 2;

    private final OdeSystem sys;
    private final double[] p;
    private final int n;
    private final int m;
    private final int ns;
    private final int nsn;
    private final int[] sensParams;
    private final boolean needJacP;
    private final double rtol;
    private final double atol;
    private final int maxSteps;
    private final double hmaxInv;
    private final double hmax;

    // Nordsieck arrays (state and sensitivities, all columns concatenated), and work vectors.
    private final double[][] zn = new double[QMAX + 1][];
    private final double[][] znS = new double[QMAX + 1][];
    private final double[] ewt;
    private final double[] ewtS;
    private final double[] acor;
    private final double[] acorS;
    private final double[] y;
    private final double[] ftemp;
    private final double[] tempv;
    private final double[] tempS;
    private final double[] sensWork;
    private final double[] jac;
    private final double[] jacP;
    /** df/dp columns of the sensitivity parameters: {@code jacPCols[c * n + i] = df_i/dp_k(c)}. */
    private final double[] jacPCols;
    /** Values of J on its structural pattern, in the order of {@code colIndex}. */
    private final double[] jacValues;
    private final int[] rowStart;
    private final int[] colIndex;
    private final LuSolver lu;
    private final double[] l = new double[QMAX + 1];
    private final double[] tq = new double[6];
    private final double[] tau = new double[QMAX + 2];

    private int q;
    private int qprime;
    private int qwait;
    private double h;
    private double hprime;
    private double eta;
    private double etamax;
    private double tn;
    private double gamma;
    private double gammap;
    private double gamrat;
    private double rl1;
    private double crate;
    private double crateS;
    private double acnrm;
    private double acnrmS;
    private double savedTq5;
    private boolean jcur;
    private long nst;
    private long nstlp;
    private long nstlj;
    private boolean initialized;

    // Statistics.
    private long statSteps;
    private long statRejected;
    private long statRhs;
    private long statJac;
    private long statLu;
    private long statNewton;
    private long statSensIter;
    private long statResets;

    // Output / root state.
    private double tCur;
    private double tStop = Double.POSITIVE_INFINITY;
    /** Steps that would end within this fraction of h before the stop time are stretched to end on it. */
    private static final double STOP_STRETCH = 1e-3;
    private final RootFunctions roots;
    private final int nr;
    private final RootLocator rootLocator;
    private boolean stoppedAtRoot;
    private int[] rootsFound = new int[0];

    BdfSession(SolverSettings settings, OdeSystem sys, double t0, double[] y0, double[] p, RootFunctions roots,
               int[] sensParams, double[] s0) {
        this.sys = sys;
        this.p = p;
        this.n = sys.stateCount();
        this.m = sys.parameterCount();
        if (y0.length != n) {
            throw new IllegalArgumentException("y0 has length " + y0.length + ", system has " + n + " states");
        }
        if (!Double.isFinite(t0)) {
            throw new IllegalArgumentException("t0 must be finite, got " + t0);
        }
        this.sensParams = sensParams == null ? new int[0] : sensParams.clone();
        this.ns = this.sensParams.length;
        this.nsn = ns * n;
        boolean anyParam = false;
        for (int c = 0; c < ns; c++) {
            int k = this.sensParams[c];
            if (k < -1 || k >= m) {
                throw new IllegalArgumentException("sensitivity column " + c + ": parameter index " + k
                        + " outside [-1, " + m + ")");
            }
            anyParam |= k >= 0;
        }
        this.needJacP = anyParam;
        if (s0 != null && s0.length != nsn) {
            throw new IllegalArgumentException("s0 has length " + s0.length + ", expected " + nsn);
        }
        this.rtol = settings.rtol();
        this.atol = settings.atol();
        this.maxSteps = settings.maxSteps();
        this.hmax = settings.maxStepSize();
        this.hmaxInv = 1.0 / hmax;
        for (int j = 0; j <= QMAX; j++) {
            zn[j] = new double[n];
            znS[j] = new double[nsn];
        }
        this.ewt = new double[n];
        this.ewtS = new double[nsn];
        this.acor = new double[n];
        this.acorS = new double[nsn];
        this.y = new double[n];
        this.ftemp = new double[n];
        this.tempv = new double[n];
        this.tempS = new double[nsn];
        this.sensWork = new double[nsn];
        this.jac = new double[n * n];
        this.jacP = new double[needJacP ? sys.jacobianPColumnsWork() : 0];
        this.jacPCols = new double[needJacP ? nsn : 0];
        SystemStructure structure = SystemStructure.of(sys);
        this.rowStart = structure.rowStart;
        this.colIndex = structure.colIndex;
        this.jacValues = new double[ns > 0 ? colIndex.length : 0];
        this.lu = structure.newIterationSolver();
        this.roots = roots;
        this.nr = roots == null ? 0 : roots.count();
        this.rootLocator = nr > 0 ? new RootLocator(this, nr, n) : null;

        System.arraycopy(y0, 0, zn[0], 0, n);
        if (s0 != null) {
            System.arraycopy(s0, 0, znS[0], 0, nsn);
        }
        this.tn = t0;
        this.tCur = t0;
        this.initialized = false;
        if (nr > 0) {
            rootLocator.restart(t0, zn[0]);
        }
    }

    /**
     * Forbids steps past {@code t} (for example a known discontinuity of the right-hand side); the integrator
     * then lands on t exactly. Once reached, the stop time clears itself, so the next step may go past it (call
     * {@link #reset} first if the right-hand side changes there). Pass {@code Double.POSITIVE_INFINITY} to clear.
     *
     * @param t stop time, &gt;= {@link #time()}
     */
    public void setStopTime(double t) {
        if (t < tn && t != Double.POSITIVE_INFINITY) {
            throw new IllegalArgumentException("stop time " + t + " lies before the internal time " + tn);
        }
        tStop = t;
    }

    // ------------------------------------------------------------------ public session API

    @Override
    public double advance(double tOut, double[] yOut, double[] sOut) {
        if (!(tOut >= tCur)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "forward integration only: tOut = %.17g is before the current time %.17g", tOut, tCur));
        }
        stoppedAtRoot = false;
        if (tOut == tCur) {
            interpolate(tCur, yOut, sOut);
            return tCur;
        }
        if (tOut - tCur <= minStep(Math.max(1.0, Math.abs(tOut))) && tn <= tOut) {
            // closer than the smallest step (e.g. an output time a rounding gap after a restart): no step can
            // be taken, and the state moves by |f| times a few ulp of t, so the values at the current solution
            // point stand for tOut
            if (initialized) {
                interpolate(tn, yOut, sOut);
            } else {
                System.arraycopy(zn[0], 0, yOut, 0, n);
                if (sOut != null) {
                    System.arraycopy(znS[0], 0, sOut, 0, nsn);
                }
                tn = tOut;
            }
            tCur = tOut;
            return tOut;
        }
        if (!initialized) {
            initialize(tOut);
        }
        long stepsThisCall = 0;
        while (true) {
            // Unchecked part of the solution [tLo, min(tn, tOut)] exists: look for roots, then output.
            if (tn > tCur) {
                double tEnd = Math.min(tn, tOut);
                if (nr > 0) {
                    double tRoot = rootLocator.search(tEnd);
                    if (!Double.isNaN(tRoot)) {
                        tCur = tRoot;
                        stoppedAtRoot = true;
                        rootsFound = rootLocator.found();
                        interpolate(tCur, yOut, sOut);
                        return tCur;
                    }
                }
                if (tn >= tOut) {
                    tCur = tOut;
                    interpolate(tOut, yOut, sOut);
                    return tOut;
                }
                tCur = tn;
            }
            if (stepsThisCall >= maxSteps) {
                throw new IntegrationException(tn, String.format(Locale.ROOT, MSG_MAX_STEPS, maxSteps, h));
            }
            step();
            stepsThisCall++;
        }
    }

    @Override
    public boolean stoppedAtRoot() {
        return stoppedAtRoot;
    }

    @Override
    public int[] rootsFound() {
        return rootsFound.clone();
    }

    @Override
    public double time() {
        return tCur;
    }

    @Override
    public boolean stopAt(double t) {
        if (t < tn) {
            return false;
        }
        setStopTime(t);
        return true;
    }

    @Override
    public void restartAt(double t, double[] yNew, double[] sNew) {
        if (!(t >= tCur)) {
            throw new IllegalArgumentException("restart time " + t + " lies before the current time " + tCur);
        }
        if (sNew == null && ns > 0) {
            interpolate(tCur, null, tempS);
            System.arraycopy(tempS, 0, znS[0], 0, nsn);
        }
        tCur = t;
        tn = t;
        reset(yNew, sNew);
    }

    @Override
    public void reset(double[] yNew, double[] sNew) {
        if (yNew.length != n) {
            throw new IllegalArgumentException("y has length " + yNew.length + ", expected " + n);
        }
        if (sNew != null && sNew.length != nsn) {
            throw new IllegalArgumentException("s has length " + sNew.length + ", expected " + nsn);
        }
        if (sNew == null && ns > 0 && tn != tCur) {
            interpolate(tCur, null, tempS);
            System.arraycopy(tempS, 0, znS[0], 0, nsn);
        }
        if (sNew != null) {
            System.arraycopy(sNew, 0, znS[0], 0, nsn);
        }
        System.arraycopy(yNew, 0, zn[0], 0, n);
        tn = tCur;
        initialized = false;
        stoppedAtRoot = false;
        statResets++;
        if (nr > 0) {
            rootLocator.restart(tCur, zn[0]);
        }
    }

    @Override
    public SolverStats stats() {
        return new SolverStats(statSteps, statRejected, statRhs, statJac, statLu, statNewton, statSensIter,
                statResets);
    }

    /** Current method order (1..5) of the history array. */
    public int order() {
        return q;
    }

    /** Step size of the last accepted step (0 before the first). */
    public double lastStepSize() {
        return nst > 0 ? tau[1] : 0.0;
    }

    // ------------------------------------------------------------------ dense output

    /**
     * Interpolates y and s at t in [tn - h, tn] on the Nordsieck polynomial (Horner form). Either output may be
     * null. Before the first step (and after reset) returns the stored values.
     */
    void interpolate(double t, double[] yOut, double[] sOut) {
        if (!initialized || nst == 0 || t == tn) {
            if (yOut != null) {
                System.arraycopy(zn[0], 0, yOut, 0, n);
            }
            if (sOut != null) {
                System.arraycopy(znS[0], 0, sOut, 0, nsn);
            }
            return;
        }
        double s = (t - tn) / h;
        if (yOut != null) {
            horner(zn, s, yOut, n);
        }
        if (sOut != null) {
            horner(znS, s, sOut, nsn);
        }
    }

    private void horner(double[][] z, double s, double[] out, int len) {
        double[] zq = z[q];
        System.arraycopy(zq, 0, out, 0, len);
        for (int j = q - 1; j >= 0; j--) {
            double[] zj = z[j];
            for (int i = 0; i < len; i++) {
                out[i] = zj[i] + s * out[i];
            }
        }
    }

    double internalTime() {
        return tn;
    }

    void evaluateRoots(double t, double[] yAt, double[] g) {
        roots.evaluate(t, yAt, p, g);
    }

    // ------------------------------------------------------------------ initialisation

    private void initialize(double tOut) {
        double tdist = tOut - tn;
        setWeights();
        sys.rhs(tn, zn[0], p, ftemp);
        statRhs++;
        double d0 = wrms(zn[0], ewt, n);
        double d1 = wrms(ftemp, ewt, n);
        // Starting step: Hairer, Norsett & Wanner, Solving ODEs I, 2nd ed. 1993, Sec. II.4, for order 1.
        double h0 = (d0 < 1e-5 || d1 < 1e-5) ? 1e-6 * tdist : 0.01 * d0 / d1;
        h0 = Math.min(h0, tdist);
        for (int i = 0; i < n; i++) {
            y[i] = zn[0][i] + h0 * ftemp[i];
        }
        sys.rhs(tn + h0, y, p, tempv);
        statRhs++;
        for (int i = 0; i < n; i++) {
            tempv[i] -= ftemp[i];
        }
        double d2 = wrms(tempv, ewt, n) / h0;
        double dm = Math.max(d1, d2);
        double h1 = dm <= 1e-15 || !Double.isFinite(dm) ? Math.max(1e-6 * tdist, h0 * 1e-3) : Math.sqrt(0.01 / dm);
        double h = Math.min(Math.min(100 * h0, h1), Math.min(tdist, hmax));
        // a state within atol of 0 with a large derivative (a restart just after an input switched on) gives a
        // 100 h0 below the resolution of t: start at twice the smallest step the step loop accepts instead of
        // failing there; the error test then lets the step grow
        h = Math.min(Math.max(h, 2 * minStep(tn)), Math.min(tdist, hmax));
        if (tn >= tStop) {
            tStop = Double.POSITIVE_INFINITY;
        } else if (tn + h > tStop) {
            h = tStop - tn;
        }
        if (!(h > 0) || tn + h == tn) {
            throw new IntegrationException(tn, String.format(Locale.ROOT, MSG_STEP_UNDERFLOW, h, rtol));
        }
        this.h = h;
        this.hprime = h;
        for (int i = 0; i < n; i++) {
            zn[1][i] = h * ftemp[i];
        }
        for (int j = 2; j <= QMAX; j++) {
            java.util.Arrays.fill(zn[j], 0.0);
            java.util.Arrays.fill(znS[j], 0.0);
        }
        if (ns > 0) {
            evaluateJacobians(tn, zn[0]);
            sensRhs(znS[0], znS[1]);
            for (int i = 0; i < nsn; i++) {
                znS[1][i] *= h;
            }
        }
        q = 1;
        qprime = 1;
        qwait = 2;
        etamax = ETAMX1;
        nst = 0;
        nstlp = 0;
        nstlj = 0;
        crate = 1.0;
        crateS = 1.0;
        savedTq5 = 0.0;
        java.util.Arrays.fill(tau, 0.0);
        jcur = false;
        initialized = true;
    }

    // ------------------------------------------------------------------ one step

    private void step() {
        double savedT = tn;
        int ncf = 0;
        int nef = 0;
        int nflag = FIRST_CALL;
        if (nst > 0 && (hprime != h || qprime != q)) {
            adjustParams();
        }
        if (tStop != Double.POSITIVE_INFINITY && tn < tStop
                && tStop - tn <= minStep(Math.max(1.0, tStop))) {
            // a remainder below the smallest step: the stop time counts as reached (y moves by |f| times this
            // gap of a few ulp of t)
            tn = tStop;
            return;
        }
        if (tn >= tStop) {
            tStop = Double.POSITIVE_INFINITY;
        } else if (tn + h > tStop || tStop - (tn + h) < STOP_STRETCH * h) {
            // reach the stop time in this step rather than leave a remainder the next step could not take (a
            // step stretched by at most 0.1 % changes its local error estimate by at most about 0.5 %)
            eta = (tStop - tn) / h;
            rescale();
        }
        setWeights();
        double dsm = 0.0;
        while (true) {
            if (!(h > 0) || h < minStep(tn)) {
                throw new IntegrationException(tn, String.format(Locale.ROOT, MSG_STEP_UNDERFLOW, h, rtol));
            }
            predict();
            setBdf();
            rl1 = 1.0 / l[1];
            gamma = h * rl1;
            if (nst == 0) {
                gammap = gamma;
            }
            gamrat = nst > 0 ? gamma / gammap : 1.0;
            int result = nonlinearSolve(nflag);
            if (result == SOLVED) {
                dsm = acnrm * tq[2];
                if (!(dsm <= 1.0)) {
                    nef++;
                    nflag = errorTestFailure(savedT, nef, dsm);
                    continue;
                }
                if (ns > 0) {
                    int sres = sensitivitySolve();
                    if (sres != SOLVED) {
                        result = sres;
                    } else {
                        double dsmS = acnrmS * tq[2];
                        if (!(dsmS <= 1.0)) {
                            nef++;
                            nflag = errorTestFailure(savedT, nef, dsmS);
                            continue;
                        }
                        dsm = Math.max(dsm, dsmS);
                    }
                }
            }
            if (result != SOLVED) {
                ncf++;
                statRejected++;
                etamax = 1.0;
                restore(savedT);
                if (ncf >= MXNCF) {
                    throw new IntegrationException(tn, String.format(Locale.ROOT, MSG_CONV_FAIL, ncf, h));
                }
                eta = ETACF;
                rescale();
                nflag = PREV_CONV_FAIL;
                continue;
            }
            break;
        }
        completeStep();
        prepareNextStep(dsm);
        etamax = nst <= SMALL_NST ? ETAMX2 : ETAMX3;
        if (tStop != Double.POSITIVE_INFINITY && Math.abs(tn - tStop) <= 4 * Math.ulp(Math.max(1.0, tStop))) {
            tn = tStop;
        }
    }

    private void setWeights() {
        double[] y0 = zn[0];
        for (int i = 0; i < n; i++) {
            ewt[i] = 1.0 / (atol + rtol * Math.abs(y0[i]));
        }
        double[] s0 = znS[0];
        for (int c = 0; c < ns; c++) {
            int off = c * n;
            if (sensParams[c] >= 0) {
                for (int i = 0; i < n; i++) {
                    ewtS[off + i] = 1.0 / (atol + rtol * Math.max(Math.abs(s0[off + i]), Math.abs(y0[i])));
                }
            } else {
                for (int i = 0; i < n; i++) {
                    ewtS[off + i] = 1.0 / (atol + rtol * Math.abs(s0[off + i]));
                }
            }
        }
    }

    static double wrms(double[] v, double[] w, int len) {
        if (len == 0) {
            return 0.0;
        }
        double sum = 0.0;
        for (int i = 0; i < len; i++) {
            double x = v[i] * w[i];
            sum += x * x;
        }
        return Math.sqrt(sum / len);
    }

    private void predict() {
        tn += h;
        for (int k = 1; k <= q; k++) {
            for (int j = q; j >= k; j--) {
                addTo(zn[j - 1], zn[j], n);
                addTo(znS[j - 1], znS[j], nsn);
            }
        }
    }

    private void restore(double savedT) {
        tn = savedT;
        for (int k = 1; k <= q; k++) {
            for (int j = q; j >= k; j--) {
                double[] a = zn[j - 1];
                double[] b = zn[j];
                for (int i = 0; i < n; i++) {
                    a[i] -= b[i];
                }
                a = znS[j - 1];
                b = znS[j];
                for (int i = 0; i < nsn; i++) {
                    a[i] -= b[i];
                }
            }
        }
    }

    private static void addTo(double[] a, double[] b, int len) {
        for (int i = 0; i < len; i++) {
            a[i] += b[i];
        }
    }

    /** Coefficients l_j and error constants tq of the fixed-leading-coefficient BDF (Hindmarsh et al. 2005). */
    private void setBdf() {
        for (int z = 0; z <= QMAX; z++) {
            l[z] = 0.0;
        }
        l[0] = 1.0;
        l[1] = 1.0;
        double xiInv = 1.0;
        double xistarInv = 1.0;
        double alpha0 = -1.0;
        double alpha0Hat = -1.0;
        double hsum = h;
        if (q > 1) {
            for (int j = 2; j < q; j++) {
                hsum += tau[j - 1];
                xiInv = h / hsum;
                alpha0 -= 1.0 / j;
                for (int z = j; z >= 1; z--) {
                    l[z] += l[z - 1] * xiInv;
                }
            }
            alpha0 -= 1.0 / q;
            xistarInv = -l[1] - alpha0;
            hsum += tau[q - 1];
            xiInv = h / hsum;
            alpha0Hat = -l[1] - xiInv;
            for (int z = q; z >= 1; z--) {
                l[z] += l[z - 1] * xistarInv;
            }
        }
        double a1 = 1.0 - alpha0Hat + alpha0;
        double a2 = 1.0 + q * a1;
        tq[2] = Math.abs(a1 / (alpha0 * a2));
        tq[5] = Math.abs(a2 * xistarInv / (l[q] * xiInv));
        if (qwait == 1) {
            if (q > 1) {
                double c = xistarInv / l[q];
                double a3 = alpha0 + 1.0 / q;
                double a4 = alpha0Hat + xiInv;
                double cpinv = (1.0 - a4 + a3) / a3;
                tq[1] = Math.abs(c * cpinv);
            } else {
                tq[1] = 1.0;
            }
            hsum += tau[q];
            xiInv = h / hsum;
            double a5 = alpha0 - 1.0 / (q + 1);
            double a6 = alpha0Hat - xiInv;
            double cppinv = (1.0 - a6 + a5) / a2;
            tq[3] = Math.abs(cppinv / (xiInv * (q + 2) * a5));
        }
        tq[4] = NLSCOEF / tq[2];
    }

    // ------------------------------------------------------------------ Newton iteration

    private int nonlinearSolve(int nflag) {
        int convfail = (nflag == FIRST_CALL || nflag == PREV_ERR_FAIL) ? CONVFAIL_NONE : CONVFAIL_OTHER;
        boolean callSetup = nflag == PREV_CONV_FAIL || nflag == PREV_ERR_FAIL || nst == 0
                || nst >= nstlp + MSBP || Math.abs(gamrat - 1.0) > DGMAX;
        while (true) {
            sys.rhs(tn, zn[0], p, ftemp);
            statRhs++;
            if (callSetup) {
                if (!linearSetup(convfail)) {
                    return CONV_RECOVER;
                }
                callSetup = false;
            }
            int r = newtonIteration();
            if (r != TRY_AGAIN) {
                return r;
            }
            callSetup = true;
            convfail = CONVFAIL_BAD_J;
        }
    }

    /** Forms and factors M = I - gamma J; re-evaluates J when stale. False when M is singular. */
    private boolean linearSetup(int convfail) {
        double dgamma = Math.abs(gamma / gammap - 1.0);
        boolean jbad = nst == 0 || nst > nstlj + MSBJ || (convfail == CONVFAIL_BAD_J && dgamma < DGMAX)
                || convfail == CONVFAIL_OTHER;
        if (jbad) {
            sys.jacobianY(tn, zn[0], p, jac);
            statJac++;
            nstlj = nst;
            jcur = true;
        } else {
            jcur = false;
        }
        nstlp = nst;
        gammap = gamma;
        gamrat = 1.0;
        crate = 1.0;
        crateS = 1.0;
        statLu++;
        return lu.factorIdentityMinus(gamma, jac);
    }

    private int newtonIteration() {
        double[] z0 = zn[0];
        double[] z1 = zn[1];
        java.util.Arrays.fill(acor, 0.0);
        System.arraycopy(z0, 0, y, 0, n);
        double delp = 0.0;
        int mIter = 0;
        double corrScale = gamrat != 1.0 ? 2.0 / (1.0 + gamrat) : 1.0;
        while (true) {
            statNewton++;
            for (int i = 0; i < n; i++) {
                tempv[i] = gamma * ftemp[i] - (rl1 * z1[i] + acor[i]);
            }
            lu.solve(tempv);
            if (corrScale != 1.0) {
                for (int i = 0; i < n; i++) {
                    tempv[i] *= corrScale;
                }
            }
            double del = wrms(tempv, ewt, n);
            for (int i = 0; i < n; i++) {
                acor[i] += tempv[i];
                y[i] = z0[i] + acor[i];
            }
            if (!(del < Double.POSITIVE_INFINITY)) {
                return jcur ? CONV_RECOVER : TRY_AGAIN;
            }
            if (mIter > 0) {
                crate = Math.max(CRDOWN * crate, del / delp);
            }
            double dcon = del * Math.min(1.0, crate) / tq[4];
            if (dcon <= 1.0) {
                acnrm = mIter == 0 ? del : wrms(acor, ewt, n);
                jcur = false;
                return SOLVED;
            }
            mIter++;
            if (mIter == MAXCOR || (mIter >= 2 && del > RDIV * delp)) {
                return jcur ? CONV_RECOVER : TRY_AGAIN;
            }
            delp = del;
            sys.rhs(tn, y, p, ftemp);
            statRhs++;
        }
    }

    // ------------------------------------------------------------------ sensitivities (staggered direct)

    private void evaluateJacobians(double t, double[] yAt) {
        sys.jacobianY(t, yAt, p, jac);
        statJac++;
        if (needJacP) {
            sys.jacobianPColumns(t, yAt, p, sensParams, jacPCols, jacP);
        }
        // Gather J on its pattern once, so the products J s_c of all columns read contiguous values.
        for (int i = 0; i < n; i++) {
            int rowOff = i * n;
            for (int e = rowStart[i]; e < rowStart[i + 1]; e++) {
                jacValues[e] = jac[rowOff + colIndex[e]];
            }
        }
    }

    /** out[c*n + i] = (J s_c)_i + df_i/dp_k(c), using the structural pattern for J s. */
    private void sensRhs(double[] s, double[] out) {
        double[] jv = jacValues;
        int[] ci = colIndex;
        int[] rs = rowStart;
        for (int c = 0; c < ns; c++) {
            int off = c * n;
            boolean param = sensParams[c] >= 0;
            for (int i = 0; i < n; i++) {
                double sum = param ? jacPCols[off + i] : 0.0;
                int end = rs[i + 1];
                for (int e = rs[i]; e < end; e++) {
                    sum += jv[e] * s[off + ci[e]];
                }
                out[off + i] = sum;
            }
        }
    }

    private int sensitivitySolve() {
        evaluateJacobians(tn, y);
        // The Jacobian just evaluated is the freshest available: later setups reuse it.
        nstlj = nst;
        double[] z0 = znS[0];
        double[] z1 = znS[1];
        double[] acs = acorS;
        double[] w = sensWork;
        java.util.Arrays.fill(acs, 0.0);
        double delp = 0.0;
        double corrScale = gamrat != 1.0 ? 2.0 / (1.0 + gamrat) : 1.0;
        int mIter = 0;
        while (true) {
            statSensIter++;
            for (int i = 0; i < nsn; i++) {
                tempS[i] = z0[i] + acs[i];
            }
            sensRhs(tempS, w);
            for (int i = 0; i < nsn; i++) {
                w[i] = gamma * w[i] - (rl1 * z1[i] + acs[i]);
            }
            for (int c = 0; c < ns; c++) {
                int off = c * n;
                System.arraycopy(w, off, tempv, 0, n);
                lu.solve(tempv);
                for (int i = 0; i < n; i++) {
                    w[off + i] = corrScale * tempv[i];
                }
            }
            double del = wrms(w, ewtS, nsn);
            for (int i = 0; i < nsn; i++) {
                acs[i] += w[i];
            }
            if (!(del < Double.POSITIVE_INFINITY)) {
                return CONV_RECOVER;
            }
            if (mIter > 0) {
                crateS = Math.max(CRDOWN * crateS, del / delp);
            }
            double dcon = del * Math.min(1.0, crateS) / tq[4];
            if (dcon <= 1.0) {
                acnrmS = mIter == 0 ? del : wrms(acs, ewtS, nsn);
                return SOLVED;
            }
            mIter++;
            if (mIter == MAXCOR || (mIter >= 2 && del > RDIV * delp)) {
                return CONV_RECOVER;
            }
            delp = del;
        }
    }

    // ------------------------------------------------------------------ error test failure, order changes

    private int errorTestFailure(double savedT, int nef, double dsm) {
        statRejected++;
        restore(savedT);
        if (nef >= MXNEF) {
            throw new IntegrationException(tn, String.format(Locale.ROOT, MSG_ERR_FAIL, nef, h, dsm,
                    Double.isFinite(dsm) ? "" : MSG_NONFINITE));
        }
        etamax = 1.0;
        int big = q + 1;
        if (nef <= MXNEF1) {
            eta = 1.0 / (Math.pow(BIAS2 * dsm, 1.0 / big) + ADDON);
            eta = Math.max(ETAMIN, eta);
            if (!(eta == eta)) {
                eta = ETAMIN;
            }
            if (nef >= SMALL_NEF) {
                eta = Math.min(eta, ETAMXF);
            }
            rescale();
            return PREV_ERR_FAIL;
        }
        if (q > 1) {
            eta = ETAMIN;
            // Straight to order 1: an order decrease of the Nordsieck history changes only columns 2..q-1, which
            // order 1 does not read, so no history adjustment is needed.
            q = 1;
            qwait = q + 1;
            rescale();
            return PREV_ERR_FAIL;
        }
        // Already at order 1: shrink and restart the history from a fresh derivative.
        eta = ETAMIN;
        h *= eta;
        hprime = h;
        qwait = 10;
        sys.rhs(tn, zn[0], p, tempv);
        statRhs++;
        for (int i = 0; i < n; i++) {
            zn[1][i] = h * tempv[i];
        }
        if (ns > 0) {
            evaluateJacobians(tn, zn[0]);
            sensRhs(znS[0], znS[1]);
            for (int i = 0; i < nsn; i++) {
                znS[1][i] *= h;
            }
        }
        return PREV_ERR_FAIL;
    }

    private void rescale() {
        double factor = eta;
        for (int j = 1; j <= q; j++) {
            scale(zn[j], factor, n);
            scale(znS[j], factor, nsn);
            factor *= eta;
        }
        h *= eta;
        hprime = h;
    }

    private static void scale(double[] a, double f, int len) {
        for (int i = 0; i < len; i++) {
            a[i] *= f;
        }
    }

    private void completeStep() {
        nst++;
        statSteps++;
        for (int i = q; i >= 2; i--) {
            tau[i] = tau[i - 1];
        }
        if (q == 1 && nst > 1) {
            tau[2] = tau[1];
        }
        tau[1] = h;
        for (int j = 0; j <= q; j++) {
            double lj = l[j];
            double[] zj = zn[j];
            for (int i = 0; i < n; i++) {
                zj[i] += lj * acor[i];
            }
            double[] zsj = znS[j];
            for (int i = 0; i < nsn; i++) {
                zsj[i] += lj * acorS[i];
            }
        }
        qwait--;
        if (qwait == 1 && q != QMAX) {
            System.arraycopy(acor, 0, zn[QMAX], 0, n);
            System.arraycopy(acorS, 0, znS[QMAX], 0, nsn);
            savedTq5 = tq[5];
        }
    }

    private void prepareNextStep(double dsm) {
        if (etamax == 1.0) {
            qwait = Math.max(qwait, 2);
            qprime = q;
            hprime = h;
            eta = 1.0;
            return;
        }
        int big = q + 1;
        double etaq = 1.0 / (Math.pow(BIAS2 * dsm, 1.0 / big) + ADDON);
        if (qwait != 0) {
            eta = etaq;
            qprime = q;
            setEta();
            return;
        }
        qwait = 2;
        double etaqm1 = 0.0;
        if (q > 1) {
            double ddn = Math.max(wrms(zn[q], ewt, n), wrms(znS[q], ewtS, nsn)) * tq[1];
            etaqm1 = 1.0 / (Math.pow(BIAS1 * ddn, 1.0 / q) + ADDON);
        }
        double etaqp1 = 0.0;
        if (q != QMAX && savedTq5 != 0.0) {
            double cquot = (tq[5] / savedTq5) * Math.pow(h / tau[2], big);
            for (int i = 0; i < n; i++) {
                tempv[i] = acor[i] - cquot * zn[QMAX][i];
            }
            for (int i = 0; i < nsn; i++) {
                tempS[i] = acorS[i] - cquot * znS[QMAX][i];
            }
            double dup = Math.max(wrms(tempv, ewt, n), wrms(tempS, ewtS, nsn)) * tq[3];
            etaqp1 = 1.0 / (Math.pow(BIAS3 * dup, 1.0 / (big + 1)) + ADDON);
        }
        double etam = Math.max(etaqm1, Math.max(etaq, etaqp1));
        if (etam < THRESH) {
            eta = 1.0;
            qprime = q;
            hprime = h;
            return;
        }
        if (etam == etaq) {
            eta = etaq;
            qprime = q;
        } else if (etam == etaqm1) {
            eta = etaqm1;
            qprime = q - 1;
        } else {
            eta = etaqp1;
            qprime = q + 1;
            System.arraycopy(acor, 0, zn[QMAX], 0, n);
            System.arraycopy(acorS, 0, znS[QMAX], 0, nsn);
        }
        setEta();
    }

    private void setEta() {
        if (eta < THRESH) {
            eta = 1.0;
            hprime = h;
        } else {
            eta = Math.min(eta, etamax);
            eta /= Math.max(1.0, h * hmaxInv * eta);
            hprime = h * eta;
        }
    }

    private void adjustParams() {
        if (qprime != q) {
            adjustOrder(qprime - q);
            q = qprime;
            qwait = q + 1;
        }
        eta = hprime / h;
        rescale();
    }

    private void adjustOrder(int deltaq) {
        if (q == 2 && deltaq != 1) {
            return;
        }
        if (deltaq == 1) {
            increaseOrder();
        } else if (deltaq == -1) {
            decreaseOrder();
        }
    }

    private void increaseOrder() {
        for (int i = 0; i <= QMAX; i++) {
            l[i] = 0.0;
        }
        l[2] = 1.0;
        double alpha1 = 1.0;
        double prod = 1.0;
        double xiold = 1.0;
        double alpha0 = -1.0;
        double hsum = h;
        if (q > 1) {
            for (int j = 1; j < q; j++) {
                hsum += tau[j + 1];
                double xi = hsum / h;
                prod *= xi;
                alpha0 -= 1.0 / (j + 1);
                alpha1 += 1.0 / xi;
                for (int i = j + 2; i >= 2; i--) {
                    l[i] = l[i] * xiold + l[i - 1];
                }
                xiold = xi;
            }
        }
        double a1 = (-alpha0 - alpha1) / prod;
        int big = q + 1;
        // zn[QMAX] holds the saved correction; zn[big] may be the same array when big == QMAX.
        double[] saved = zn[QMAX];
        double[] savedS = znS[QMAX];
        double[] target = zn[big];
        double[] targetS = znS[big];
        for (int i = 0; i < n; i++) {
            target[i] = a1 * saved[i];
        }
        for (int i = 0; i < nsn; i++) {
            targetS[i] = a1 * savedS[i];
        }
        for (int j = 2; j <= q; j++) {
            double lj = l[j];
            double[] zj = zn[j];
            for (int i = 0; i < n; i++) {
                zj[i] += lj * target[i];
            }
            double[] zsj = znS[j];
            for (int i = 0; i < nsn; i++) {
                zsj[i] += lj * targetS[i];
            }
        }
    }

    private void decreaseOrder() {
        for (int i = 0; i <= QMAX; i++) {
            l[i] = 0.0;
        }
        l[2] = 1.0;
        double hsum = 0.0;
        for (int j = 1; j <= q - 2; j++) {
            hsum += tau[j];
            double xi = hsum / h;
            for (int i = j + 2; i >= 2; i--) {
                l[i] = l[i] * xi + l[i - 1];
            }
        }
        for (int j = 2; j < q; j++) {
            double lj = l[j];
            double[] zj = zn[j];
            double[] zq = zn[q];
            for (int i = 0; i < n; i++) {
                zj[i] -= lj * zq[i];
            }
            double[] zsj = znS[j];
            double[] zsq = znS[q];
            for (int i = 0; i < nsn; i++) {
                zsj[i] -= lj * zsq[i];
            }
        }
    }
}
