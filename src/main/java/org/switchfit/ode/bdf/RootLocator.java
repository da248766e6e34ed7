package org.switchfit.ode.bdf;

/**
 * Locates the earliest sign change of switching functions on the dense output of the last step.
 *
 * <p>Sign convention: g &gt;= 0 and g &lt; 0 are the two sides (NaN counts as negative). The bracket [tL, tR] is
 * shrunk by a secant step on the function with the earliest secant estimate, with the Illinois modification
 * (Dowell &amp; Jarratt, BIT 11:168-174, 1971, doi:10.1007/BF01934364) when the same end is kept twice, and a
 * plain bisection every fourth iteration so the bracket always shrinks geometrically. It stops when
 * {@code tR - tL < 4 ulp(max(|tR|, 1)) + 1e-12 max(|tR|, 1)} (the {@link org.switchfit.ode.IntegrationSession}
 * contract) and reports tR, where the new sign holds.
 *
 * <p>Allocation-free per step; one small array per root found.
 */
final class RootLocator {

    private final BdfSession session;
    private final int nr;
    private final double[] gLo;
    private final double[] gHi;
    private final double[] gMid;
    private final double[] yBuf;
    private double tLo;
    private int[] found = new int[0];

    RootLocator(BdfSession session, int nr, int n) {
        this.session = session;
        this.nr = nr;
        this.gLo = new double[nr];
        this.gHi = new double[nr];
        this.gMid = new double[nr];
        this.yBuf = new double[n];
    }

    /** Starts a new search history at (t, y). */
    void restart(double t, double[] y) {
        tLo = t;
        session.evaluateRoots(t, y, gLo);
    }

    static boolean changed(double a, double b) {
        return (a >= 0) != (b >= 0);
    }

    private boolean anyChange(double[] a, double[] b) {
        for (int k = 0; k < nr; k++) {
            if (changed(a[k], b[k])) {
                return true;
            }
        }
        return false;
    }

    /** Bracket width at which the search stops (contract of IntegrationSession). */
    static double tolerance(double tR) {
        double s = Math.max(Math.abs(tR), 1.0);
        return 4 * Math.ulp(s) + 1e-12 * s;
    }

    /**
     * Searches (tLo, tEnd] for the earliest sign change.
     *
     * @return the root time tR, or NaN when none (then the history moves on to tEnd)
     */
    double search(double tEnd) {
        if (!(tEnd > tLo)) {
            return Double.NaN;
        }
        session.interpolate(tEnd, yBuf, null);
        session.evaluateRoots(tEnd, yBuf, gHi);
        if (!anyChange(gLo, gHi)) {
            tLo = tEnd;
            System.arraycopy(gHi, 0, gLo, 0, nr);
            return Double.NaN;
        }
        double tL = tLo;
        double tR = tEnd;
        double alpha = 1.0;
        int lastSide = 0;
        int iter = 0;
        while (true) {
            double tol = tolerance(tR);
            if (tR - tL < tol) {
                break;
            }
            double tMid;
            if (iter % 4 == 3) {
                tMid = 0.5 * (tL + tR);
            } else {
                tMid = tR;
                for (int k = 0; k < nr; k++) {
                    if (changed(gLo[k], gHi[k])) {
                        double denom = gHi[k] - alpha * gLo[k];
                        double est = tR - (tR - tL) * gHi[k] / denom;
                        if (est < tMid) {
                            tMid = est;
                        }
                    }
                }
            }
            double guard = 0.25 * tol;
            if (!(tMid > tL + guard)) {
                tMid = tL + guard;
            }
            if (!(tMid < tR - guard)) {
                tMid = tR - guard;
            }
            session.interpolate(tMid, yBuf, null);
            session.evaluateRoots(tMid, yBuf, gMid);
            if (anyChange(gLo, gMid)) {
                tR = tMid;
                System.arraycopy(gMid, 0, gHi, 0, nr);
                alpha = lastSide == 1 ? alpha * 0.5 : 1.0;
                lastSide = 1;
            } else {
                tL = tMid;
                System.arraycopy(gMid, 0, gLo, 0, nr);
                alpha = lastSide == -1 ? alpha * 2.0 : 1.0;
                lastSide = -1;
            }
            iter++;
        }
        int count = 0;
        for (int k = 0; k < nr; k++) {
            if (changed(gLo[k], gHi[k])) {
                count++;
            }
        }
        found = new int[count];
        count = 0;
        for (int k = 0; k < nr; k++) {
            if (changed(gLo[k], gHi[k])) {
                found[count++] = k;
            }
        }
        tLo = tR;
        System.arraycopy(gHi, 0, gLo, 0, nr);
        return tR;
    }

    /** Indices of the functions that changed sign at the last root. */
    int[] found() {
        return found;
    }
}
