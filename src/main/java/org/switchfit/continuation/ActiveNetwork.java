package org.switchfit.continuation;

import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import org.switchfit.model.OdeForm;
import org.switchfit.model.Reaction;
import org.switchfit.ode.CompiledModel;

/**
 * The part of a reaction network that can act at given parameter values, from a given start state: which
 * reactions can fire, which species stay at zero, and which species influence no rate. Large curated models
 * (hundreds of species) contain rate constants set to zero, stimuli switched off and species that only
 * accumulate; the stoichiometric conservation laws then miss directions in which the Jacobian is singular at
 * every point, and Newton, tangents and folds fail. The rules below remove exactly those directions.
 *
 * <p>Rules, applied at time 0 (the time at which {@link PseudoArclength} evaluates the model) with the control
 * parameter drawn inside its range, so that a reaction switched on by the control counts as active:
 * <ol>
 *   <li><b>Zero face.</b> S starts as the species states that are exactly zero in the start state. A species i
 *   leaves S while its rate of change f_i is non-zero at some sample point with y_S = 0. The fixed point is the
 *   largest set of initially empty species whose face {y_S = 0} is invariant (f_S = 0 on it; in reaction terms,
 *   every reaction that can fire there leaves S unchanged, a "siphon" of Petri-net theory: Angeli, De Leenheer and
 *   Sontag 2007, Math. Biosci. 210:598-618, doi:10.1016/j.mbs.2007.07.003). Trajectories from the start state
 *   never leave the face, so the steady states reached from it lie on it; S is held at zero.</li>
 *   <li><b>Active reactions.</b> A reaction is active when its rate is non-zero (or not a number) at some sample
 *   point on the face. Inactive ones (a zero rate constant, a switched-off stimulus, a partner held at zero)
 *   contribute nothing to f there; the conservation laws of the network are those of the active stoichiometry
 *   (its left null space contains that of the full stoichiometry).</li>
 *   <li><b>Passive species.</b> A species outside S whose column of the Jacobian is zero at every sample point
 *   on the face influences no rate (a degradation product, a counter). The steady-state equations of the other
 *   species do not involve it and its own equation f_i = 0 involves only them, so its steady value is not
 *   determined: it is held at its start value and its equation is dropped (the caller should report max |f_i|
 *   over these species at the points it reports).</li>
 * </ol>
 * Two further rules apply at the steady state of the reduced system ({@link #numericallyPassive},
 * {@link #numericallySingular}); they hold species whose motion is below the resolution of double precision.
 * Held species (rules 1 and 3-5) become conservation laws {@code y_i = T_i} by zeroing their rows of the
 * stoichiometry; inactive reactions by zeroing their columns; {@link ConservationLaws} then reduces everything
 * at once.
 *
 * <p>"Non-zero at some sample point" is a randomised identity test: an analytic expression that vanishes at
 * independent random points is zero with probability one (Schwartz 1980, J. ACM 27:701-717,
 * doi:10.1145/322217.322225, for polynomials). Three points are used; states are drawn as
 * {@code (1 + |y_start,i|) u} with u uniform in [0.5, 1.5], so magnitudes follow the model's. Reproducible from
 * the seed. Immutable.
 */
public final class ActiveNetwork {
    private static final int SAMPLES = 3;

    /** Relative size below which a Jacobian column counts as numerically zero (one ulp of 1). */
    static final double NEGLIGIBLE = 0x1p-52;

    private final boolean[] activeReactions;
    private final boolean[] face;
    private final boolean[] passive;
    private final boolean[] frozen;
    private final boolean[] singular;

    private ActiveNetwork(boolean[] activeReactions, boolean[] face, boolean[] passive, boolean[] frozen,
                          boolean[] singular) {
        this.activeReactions = activeReactions;
        this.face = face;
        this.passive = passive;
        this.frozen = frozen;
        this.singular = singular;
    }

    /**
     * Applies the rules of the class comment.
     *
     * @param model   compiled model (its reactions are {@code model.form().model().reactions()})
     * @param p       effective parameters (read only)
     * @param control index of the varied parameter in p, or -1 for none
     * @param lo      lower end of the control range (ignored when control &lt; 0)
     * @param hi      upper end of the control range
     * @param yStart  start state (full model states)
     * @param seed    seed of the sample points
     */
    public static ActiveNetwork find(CompiledModel model, double[] p, int control, double lo, double hi,
                                     double[] yStart, long seed) {
        int n = model.stateCount();
        if (yStart.length != n || p.length != model.parameterCount()) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "expected %d states and %d parameters, got %d and %d", n, model.parameterCount(),
                    yStart.length, p.length));
        }
        OdeForm form = model.form();
        boolean[] face = new boolean[n];
        for (int i = 0; i < n; i++) {
            OdeForm.StateKind k = form.stateKind(i);
            face[i] = yStart[i] == 0 && (k == OdeForm.StateKind.SPECIES_AMOUNT
                    || k == OdeForm.StateKind.SPECIES_CONCENTRATION);
        }
        double[][] ys = new double[SAMPLES][n];
        double[][] ps = new double[SAMPLES][];
        SplittableRandom rng = new SplittableRandom(seed);
        for (int s = 0; s < SAMPLES; s++) {
            for (int i = 0; i < n; i++) {
                ys[s][i] = (1 + Math.abs(yStart[i])) * (0.5 + rng.nextDouble());
            }
            ps[s] = p.clone();
            if (control >= 0) {
                ps[s][control] = lo + (hi - lo) * rng.nextDouble();
            }
        }
        double[] f = new double[n];
        boolean changed = true;
        while (changed) {
            changed = false;
            for (int s = 0; s < SAMPLES; s++) {
                model.rhs(0, onFace(ys[s], face), ps[s], f);
                for (int i = 0; i < n; i++) {
                    if (face[i] && f[i] != 0) {
                        face[i] = false;
                        changed = true;
                    }
                }
            }
        }
        List<Reaction> rx = form.model().reactions();
        List<String> locals = form.runtime().localNames();
        int[] slot = new int[rx.size()];
        for (int r = 0; r < rx.size(); r++) {
            slot[r] = locals.indexOf(rx.get(r).id());
        }
        boolean[] active = new boolean[rx.size()];
        double[] w = new double[model.localCount()];
        boolean[] influences = new boolean[n];
        double[] jac = new double[n * n];
        for (int s = 0; s < SAMPLES; s++) {
            double[] y = onFace(ys[s], face);
            model.locals(0, y, ps[s], w);
            for (int r = 0; r < rx.size(); r++) {
                double v = slot[r] < 0 ? Double.NaN : w[slot[r]];
                active[r] |= v != 0; // NaN counts as active
            }
            model.jacobianY(0, y, ps[s], jac);
            for (int i = 0; i < n; i++) {
                int row = i * n;
                for (int j = 0; j < n; j++) {
                    if (jac[row + j] != 0) {
                        influences[j] = true;
                    }
                }
            }
        }
        boolean[] passive = new boolean[n];
        for (int j = 0; j < n; j++) {
            OdeForm.StateKind k = form.stateKind(j);
            passive[j] = !face[j] && !influences[j] && (k == OdeForm.StateKind.SPECIES_AMOUNT
                    || k == OdeForm.StateKind.SPECIES_CONCENTRATION);
        }
        return new ActiveNetwork(active, face, passive, new boolean[n], new boolean[n]);
    }

    /**
     * Rule 4, numerically passive states at a point: the independent states of {@code red} whose column of the
     * reduced Jacobian at (x, q) has no entry above {@link #NEGLIGIBLE} * max|J|. Such a species influences every
     * rate of change by less than rounding of the largest one (typically a large pool that exchanges only with
     * complexes present at ~1e-40 of it): its value moves only on time scales beyond double precision, and no
     * Newton step can resolve it. Holding it at its value at the point ({@link #withFrozen}) is the only
     * numerically meaningful choice; the branch is then one of quasi-steady states with those pools fixed.
     *
     * @return indices into the full state vector, increasing
     */
    public static int[] numericallyPassive(ReducedSystem red, double[] x, double[] q) {
        int n = red.stateCount();
        double[] j = new double[n * n];
        red.jacobianY(0, x, q, j);
        double max = 0;
        for (double v : j) {
            max = Math.max(max, Math.abs(v));
        }
        int[] ind = red.laws().independentSpecies();
        int[] out = new int[n];
        int c = 0;
        for (int k = 0; k < n; k++) {
            double col = 0;
            for (int i = 0; i < n; i++) {
                col = Math.max(col, Math.abs(j[i * n + k]));
            }
            if (!(col > NEGLIGIBLE * max)) {
                out[c++] = ind[k];
            }
        }
        return java.util.Arrays.copyOf(out, c);
    }

    /** A copy that also holds the given states (full-state indices) at their start values (rule 4). */
    public ActiveNetwork withFrozen(int[] states) {
        boolean[] fz = frozen.clone();
        for (int i : states) {
            fz[i] = true;
        }
        return new ActiveNetwork(activeReactions, face, passive, fz, singular);
    }

    /**
     * Rule 5, numerically singular directions at a point: when the reduced Jacobian J at (x, q) has singular
     * values {@code σ_k <= n eps σ_1} (the usual numerical-rank tolerance: a backward-stable SVD returns the exact
     * singular values of a matrix within about that distance of J, so such σ_k cannot be told from zero; Golub and
     * Van Loan, Matrix Computations, 4th ed., sec. 5.4.1, from memory), the steady-state equations do not
     * determine the state along the d matching right singular vectors V: a combination of species that moves
     * the rates by less than rounding. Rule 4 is the case where such a direction is a single species. This rule
     * holds d species, chosen so that J with their rows and columns removed is as far from singular as
     * possible: for a matrix of rank n - d the minor without rows and columns S is proportional to
     * {@code det V_S det W_S} (W the left singular vectors; for d = 1 the adjugate is a multiple of v w^T), so S
     * is picked greedily by LU with pivoting on the largest {@code |V_kt W_kt|}. Their held values are those at
     * the point, as for rule 4; their own equations are dropped, so the caller should report max |f_i| over
     * held species along the branch.
     *
     * <p>Typical cause (measured on a 500-species EGF signalling model): two large pools (about 4e7) exchanging
     * only with each other and with complexes present at 1e-20 or less span two directions with σ about 1e-17
     * against σ_1 about 6e3 (relative 2e-21); no single column is small, so rule 4 misses them. Systems of more than
     * {@link #SINGULAR_RULE_MAX_STATES} states are skipped (a dense SVD is too costly), as are non-finite J.
     *
     * @return indices into the full state vector, increasing (empty when J has numerical full rank)
     */
    public static int[] numericallySingular(ReducedSystem red, double[] x, double[] q) {
        int n = red.stateCount();
        if (n == 0 || n > SINGULAR_RULE_MAX_STATES) {
            return new int[0];
        }
        double[] j = new double[n * n];
        red.jacobianY(0, x, q, j);
        double[][] a = new double[n][n];
        for (int i = 0; i < n; i++) {
            for (int k = 0; k < n; k++) {
                double v = j[i * n + k];
                if (!Double.isFinite(v)) {
                    return new int[0];
                }
                a[i][k] = v;
            }
        }
        org.hipparchus.linear.SingularValueDecomposition svd =
                new org.hipparchus.linear.SingularValueDecomposition(new org.hipparchus.linear.Array2DRowRealMatrix(
                        a, false));
        double[] sv = svd.getSingularValues();
        double tol = n * Math.ulp(1.0) * sv[0];
        int d = 0;
        while (d < n && sv[n - 1 - d] <= tol) {
            d++;
        }
        if (d == 0 || !(sv[0] > 0)) {
            return new int[0];
        }
        double[][] v = new double[d][];
        double[][] w = new double[d][];
        for (int t = 0; t < d; t++) {
            v[t] = svd.getV().getColumn(n - 1 - t);
            w[t] = svd.getU().getColumn(n - 1 - t);
        }
        int[] chosen = pickMinor(v, w, n);
        int[] ind = red.laws().independentSpecies();
        int[] out = new int[chosen.length];
        for (int t = 0; t < chosen.length; t++) {
            out[t] = ind[chosen[t]];
        }
        java.util.Arrays.sort(out);
        return out;
    }

    /** Largest reduced system for which rule 5 runs its dense SVD (order 500 takes about a second). */
    public static final int SINGULAR_RULE_MAX_STATES = 500;

    /**
     * Greedy choice of d rows S with {@code |det V_S det W_S|} large: Gaussian elimination on the columns of V and W
     * (d vectors of length n each) with complete pivoting on {@code |V_kt W_kt|}. Modifies v and w. Returns the
     * rows in pivot order; stops early when every remaining product is zero.
     */
    static int[] pickMinor(double[][] v, double[][] w, int n) {
        int d = v.length;
        boolean[] usedRow = new boolean[n];
        boolean[] usedCol = new boolean[d];
        int[] out = new int[d];
        int c = 0;
        for (int step = 0; step < d; step++) {
            int bk = -1;
            int bt = -1;
            double best = 0;
            for (int t = 0; t < d; t++) {
                if (usedCol[t]) {
                    continue;
                }
                for (int k = 0; k < n; k++) {
                    double sc = Math.abs(v[t][k] * w[t][k]);
                    if (!usedRow[k] && sc > best) {
                        best = sc;
                        bk = k;
                        bt = t;
                    }
                }
            }
            if (bk < 0) {
                break;
            }
            usedRow[bk] = true;
            usedCol[bt] = true;
            out[c++] = bk;
            for (int t = 0; t < d; t++) {
                if (usedCol[t]) {
                    continue;
                }
                double fv = v[t][bk] / v[bt][bk];
                double fw = w[t][bk] / w[bt][bk];
                for (int k = 0; k < n; k++) {
                    v[t][k] -= fv * v[bt][k];
                    w[t][k] -= fw * w[bt][k];
                }
            }
        }
        return java.util.Arrays.copyOf(out, c);
    }

    /** A copy that also holds the given states (full-state indices) at their start values (rule 5). */
    public ActiveNetwork withSingularHeld(int[] states) {
        boolean[] sg = singular.clone();
        for (int i : states) {
            sg[i] = true;
        }
        return new ActiveNetwork(activeReactions, face, passive, frozen, sg);
    }

    private static double[] onFace(double[] y, boolean[] face) {
        double[] out = y.clone();
        for (int i = 0; i < out.length; i++) {
            if (face[i]) {
                out[i] = 0;
            }
        }
        return out;
    }

    /** Whether reaction r (model order) can fire. */
    public boolean reactionActive(int r) {
        return activeReactions[r];
    }

    /** Whether state i is held at zero (rule 1). */
    public boolean onZeroFace(int i) {
        return face[i];
    }

    /** Whether state i is passive (rule 3), held at its start value. */
    public boolean passive(int i) {
        return passive[i];
    }

    /** Whether state i is held for being numerically passive at the start point (rule 4). */
    public boolean frozen(int i) {
        return frozen[i];
    }

    /** Whether state i is held for spanning a numerically singular direction (rule 5). */
    public boolean heldForSingularity(int i) {
        return singular[i];
    }

    /** Whether state i is held (rule 1, 3, 4 or 5). */
    public boolean held(int i) {
        return face[i] || passive[i] || frozen[i] || singular[i];
    }

    /** Number of inactive reactions. */
    public int inactiveReactionCount() {
        return count(activeReactions, false);
    }

    /** Number of states held at zero. */
    public int zeroFaceCount() {
        return count(face, true);
    }

    /** Number of passive states. */
    public int passiveCount() {
        return count(passive, true);
    }

    /** Number of states held by rule 4. */
    public int frozenCount() {
        return count(frozen, true);
    }

    /** Number of states held by rule 5. */
    public int singularCount() {
        return count(singular, true);
    }

    /** True when no rule removes anything. */
    public boolean isWholeNetwork() {
        return inactiveReactionCount() == 0 && zeroFaceCount() == 0 && passiveCount() == 0 && frozenCount() == 0
                && singularCount() == 0;
    }

    private static int count(boolean[] a, boolean value) {
        int c = 0;
        for (boolean b : a) {
            c += b == value ? 1 : 0;
        }
        return c;
    }

    /**
     * Applies the network to a stoichiometry matrix {@code stoich[state][column]} whose first columns are the
     * model's reactions in order (further columns, if any, are kept): zeroes the columns of inactive reactions
     * and the rows of held states. Returns a new matrix.
     */
    public double[][] mask(double[][] stoich) {
        double[][] out = new double[stoich.length][];
        for (int i = 0; i < stoich.length; i++) {
            out[i] = stoich[i].clone();
            if (held(i)) {
                java.util.Arrays.fill(out[i], 0);
                continue;
            }
            for (int r = 0; r < activeReactions.length && r < out[i].length; r++) {
                if (!activeReactions[r]) {
                    out[i][r] = 0;
                }
            }
        }
        return out;
    }
}
