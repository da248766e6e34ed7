package org.switchfit.continuation;

import java.math.BigInteger;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;
import org.switchfit.ode.OdeSystem;

/**
 * Conservation laws of a reaction network, found exactly from its stoichiometry matrix N (n species x r
 * reactions, {@code f(y) = N v(y)}): the left null space {@code {l : l^T N = 0}} computed over the integers.
 *
 * <p>Method: fraction-free Gauss-Jordan elimination of N^T over the integers, every row divided by the gcd of its
 * entries after each elimination step so numbers stay small (Bareiss 1968, Math. Comp. 22:565-578,
 * doi:10.1090/S0025-5718-1968-0226829-0, for the fraction-free idea). The elimination runs in {@code long}
 * arithmetic with overflow-checked operations ({@link Math#multiplyExact}); when any intermediate value would
 * leave the {@code long} range it is repeated from the start in BigInteger arithmetic. Both make the same pivot
 * choices and the same gcd divisions on the same integers, so the result is identical and exact either way;
 * stoichiometric entries are small and the gcd division keeps them so, and a 500 x 827 network takes well under a
 * second in {@code long} (the BigInteger run took several seconds). The reduced row echelon form gives one basis
 * vector per non-pivot species f: coefficient on f positive, zero on the other non-pivot species, arbitrary on
 * pivot species; each vector is divided by the gcd of its entries. The non-pivot species are the <em>dependent</em>
 * ones (eliminated by {@link #reduce}); pivot species are independent. Because l_f has zeros on the other
 * dependent species, each dependent species is recovered from its own law alone:
 * {@code y_f = (T_f - Σ_{i indep} l_f[i] y_i) / l_f[f]}.
 *
 * <p>Which species end up dependent depends on the column order of the elimination. To obtain laws with
 * non-negative coefficients where possible (moiety totals such as E + ES), up to 32 species orders are tried
 * (natural, reversed, seeded shuffles; natural and reversed only above 100 species) and the basis with the fewest negative coefficients is kept; every
 * candidate is an exact basis, so this only affects readability and the choice of reduced states.
 *
 * <p>Entries given as doubles must be rationals with denominator at most 10^6 (continued-fraction recovery to
 * within 2 ulp); scaling a column of N by a non-zero factor leaves the left null space unchanged, so each
 * reaction column is multiplied by the lcm of its denominators. With compartments of different volumes pass N
 * with the volume factors already applied. Immutable and thread-safe.
 */
public final class ConservationLaws {
    private static final long MAX_DENOMINATOR = 1_000_000L;
    /** Species count above which only two elimination orders are tried. */
    private static final int LARGE_NETWORK = 100;

    private final int speciesCount;
    private final long[][] laws;
    private final int[] dependent;
    private final int[] independent;

    private ConservationLaws(int speciesCount, long[][] laws, int[] dependent, int[] independent) {
        this.speciesCount = speciesCount;
        this.laws = laws;
        this.dependent = dependent;
        this.independent = independent;
    }

    /**
     * Laws of an integer stoichiometry matrix {@code stoich[species][reaction]}.
     *
     * @throws IllegalArgumentException when rows have different lengths or there are no species
     */
    public static ConservationLaws of(int[][] stoich) {
        int n = stoich.length;
        if (n == 0) {
            throw new IllegalArgumentException("stoichiometry matrix has no species rows");
        }
        int r = stoich[0].length;
        BigInteger[][] a = new BigInteger[r][n];
        for (int i = 0; i < n; i++) {
            if (stoich[i].length != r) {
                throw new IllegalArgumentException(String.format(Locale.ROOT,
                        "stoichiometry row %d has %d entries, row 0 has %d", i, stoich[i].length, r));
            }
            for (int j = 0; j < r; j++) {
                a[j][i] = BigInteger.valueOf(stoich[i][j]);
            }
        }
        return fromTransposed(a, n, false);
    }

    /**
     * Laws of a stoichiometry matrix with rational entries given as doubles (e.g. 0.5, 1/3).
     *
     * @throws IllegalArgumentException when an entry is not finite or not a rational with denominator at most 10^6
     */
    public static ConservationLaws of(double[][] stoich) {
        return fromTransposed(transposed(stoich), stoich.length, false);
    }

    /**
     * {@link #of(double[][])} or {@link #of(double[][], double[])} (when abundance is non-null) computed by the
     * BigInteger elimination only, without the {@code long} path: the reference for tests.
     */
    static ConservationLaws ofBigIntegerOnly(double[][] stoich, double[] abundance) {
        return abundance == null ? fromTransposed(transposed(stoich), stoich.length, true)
                : byAbundance(stoich, abundance, true);
    }

    /**
     * Laws of a stoichiometry matrix (as {@link #of(double[][])}) with the most abundant species of each law made
     * dependent: the elimination runs over the species in order of increasing |abundance|, so the least abundant
     * become pivots (independent states) and each law eliminates a large pool. This keeps the reduced Jacobian
     * well scaled when a large pool exchanges only with tiny complexes (its own row and column would otherwise
     * hold only terms proportional to those complexes, ~1e-40 in stiff signalling models at steady state).
     *
     * @param abundance one value per species, e.g. the start state
     */
    public static ConservationLaws of(double[][] stoich, double[] abundance) {
        return byAbundance(stoich, abundance, false);
    }

    private static ConservationLaws byAbundance(double[][] stoich, double[] abundance, boolean bigOnly) {
        int n = stoich.length;
        if (abundance.length != n) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "%d abundances for %d species", abundance.length, n));
        }
        BigInteger[][] a = dropZeroColumns(transposed(stoich));
        Integer[] idx = new Integer[n];
        for (int i = 0; i < n; i++) {
            idx[i] = i;
        }
        java.util.Arrays.sort(idx, (x, y) -> {
            int c = Double.compare(Math.abs(abundance[x]), Math.abs(abundance[y]));
            return c != 0 ? c : Integer.compare(x, y);
        });
        int[] order = new int[n];
        for (int i = 0; i < n; i++) {
            order[i] = idx[i];
        }
        return eliminate(a, n, a.length, order, bigOnly);
    }

    private static BigInteger[][] transposed(double[][] stoich) {
        int n = stoich.length;
        if (n == 0) {
            throw new IllegalArgumentException("stoichiometry matrix has no species rows");
        }
        int r = stoich[0].length;
        BigInteger[][] a = new BigInteger[r][n];
        for (int j = 0; j < r; j++) {
            long[] num = new long[n];
            long[] den = new long[n];
            BigInteger lcm = BigInteger.ONE;
            for (int i = 0; i < n; i++) {
                if (stoich[i].length != r) {
                    throw new IllegalArgumentException(String.format(Locale.ROOT,
                            "stoichiometry row %d has %d entries, row 0 has %d", i, stoich[i].length, r));
                }
                long[] q = rational(stoich[i][j], i, j);
                num[i] = q[0];
                den[i] = q[1];
                if (q[1] != 1) {
                    BigInteger d = BigInteger.valueOf(q[1]);
                    lcm = lcm.divide(lcm.gcd(d)).multiply(d);
                }
            }
            boolean integral = lcm.equals(BigInteger.ONE);
            for (int i = 0; i < n; i++) {
                a[j][i] = integral ? BigInteger.valueOf(num[i])
                        : BigInteger.valueOf(num[i]).multiply(lcm.divide(BigInteger.valueOf(den[i])));
            }
        }
        return a;
    }

    /** Continued-fraction recovery of p/q with q <= 10^6 and double(p/q) within 2 ulp of x. */
    private static long[] rational(double x, int i, int j) {
        if (!Double.isFinite(x)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "stoichiometry entry (%d, %d) is %s; entries must be finite rationals", i, j, x));
        }
        if (x == Math.rint(x) && Math.abs(x) < 1e15) {
            return new long[] {(long) x, 1};
        }
        long h0 = 0;
        long h1 = 1;
        long k0 = 1;
        long k1 = 0;
        double rem = Math.abs(x);
        for (int it = 0; it < 64; it++) {
            long a = (long) Math.floor(rem);
            long h2 = a * h1 + h0;
            long k2 = a * k1 + k0;
            if (k2 > MAX_DENOMINATOR) {
                break;
            }
            h0 = h1;
            h1 = h2;
            k0 = k1;
            k1 = k2;
            if (Math.abs(Math.abs(x) - (double) h1 / k1) <= 2 * Math.ulp(x)) {
                return new long[] {x < 0 ? -h1 : h1, k1};
            }
            double frac = rem - a;
            if (frac == 0) {
                break;
            }
            rem = 1.0 / frac;
        }
        throw new IllegalArgumentException(String.format(Locale.ROOT,
                "stoichiometry entry (%d, %d) = %.17g is not a rational with denominator <= %d",
                i, j, x, MAX_DENOMINATOR));
    }

    /**
     * Tries the species orders natural, reversed and up to 30 seeded shuffles (fixed seed, so the result is
     * reproducible) and keeps the basis with the fewest negative coefficients, then the smallest largest
     * |coefficient|, then the earliest tried. Stops at the first basis with no negative coefficient.
     */
    private static ConservationLaws fromTransposed(BigInteger[][] full, int n, boolean bigOnly) {
        BigInteger[][] a = dropZeroColumns(full);
        int r = a.length;
        ConservationLaws best = null;
        long[] bestScore = null;
        java.util.SplittableRandom rng = new java.util.SplittableRandom(20261202L);
        // Each attempt is a full elimination, so large networks try the natural and reversed orders only.
        int attempts = n > LARGE_NETWORK ? 2 : 32;
        for (int attempt = 0; attempt < attempts; attempt++) {
            int[] order = new int[n];
            for (int i = 0; i < n; i++) {
                order[i] = attempt == 1 ? n - 1 - i : i;
            }
            if (attempt >= 2) {
                for (int i = n - 1; i > 0; i--) {
                    int j = rng.nextInt(i + 1);
                    int t = order[i];
                    order[i] = order[j];
                    order[j] = t;
                }
            }
            ConservationLaws cand = eliminate(a, n, r, order, bigOnly);
            long neg = 0;
            long max = 0;
            for (long[] l : cand.laws) {
                for (long x : l) {
                    neg += x < 0 ? 1 : 0;
                    max = Math.max(max, Math.abs(x));
                }
            }
            long[] score = {neg, max};
            if (best == null || score[0] < bestScore[0] || (score[0] == bestScore[0] && score[1] < bestScore[1])) {
                best = cand;
                bestScore = score;
            }
            if (neg == 0 || n <= 1) {
                break;
            }
        }
        return best;
    }

    /**
     * Rows of N^T (reactions) that are all zero, e.g. switched off by {@link ActiveNetwork#mask}, do not change the
     * left null space; dropping them keeps the elimination proportional to the reactions that act.
     */
    private static BigInteger[][] dropZeroColumns(BigInteger[][] full) {
        List<BigInteger[]> keep = new ArrayList<>();
        for (BigInteger[] row : full) {
            for (BigInteger x : row) {
                if (x.signum() != 0) {
                    keep.add(row);
                    break;
                }
            }
        }
        return keep.toArray(new BigInteger[0][]);
    }

    /**
     * Gauss-Jordan on the species columns in the given order; laws for the non-pivot species. Runs in {@code long}
     * arithmetic and falls back to {@link #eliminateBig} on overflow (same result, see the class comment). Does not
     * modify {@code a}.
     */
    private static ConservationLaws eliminate(BigInteger[][] a, int n, int r, int[] order, boolean bigOnly) {
        long[][] small = bigOnly ? null : toLong(a, n, r);
        if (small != null) {
            try {
                return eliminateLong(small, n, r, order);
            } catch (ArithmeticException overflow) {
                // fall through to the exact BigInteger path
            }
        }
        BigInteger[][] copy = new BigInteger[r][];
        for (int i = 0; i < r; i++) {
            copy[i] = a[i].clone();
        }
        return eliminateBig(copy, n, r, order);
    }

    /** The matrix as longs, or null when an entry does not fit. */
    private static long[][] toLong(BigInteger[][] a, int n, int r) {
        long[][] out = new long[r][n];
        for (int i = 0; i < r; i++) {
            for (int k = 0; k < n; k++) {
                if (a[i][k].bitLength() > 62) {
                    return null;
                }
                out[i][k] = a[i][k].longValue();
            }
        }
        return out;
    }

    /**
     * {@link #eliminateBig} in overflow-checked {@code long} arithmetic (in place on {@code a}); the pivot row's
     * non-zero columns are listed once per pivot, so sparse rows cost in proportion to their non-zeros.
     *
     * @throws ArithmeticException when an intermediate value leaves the {@code long} range
     */
    static ConservationLaws eliminateLong(long[][] a, int n, int r, int[] order) {
        int[] pivotCol = new int[Math.min(r, n)];
        int[] nz = new int[n];
        int rank = 0;
        for (int oc = 0; oc < n && rank < r; oc++) {
            int c = order[oc];
            int p = -1;
            long best = 0;
            for (int i = rank; i < r; i++) {
                long v = a[i][c];
                if (v != 0) {
                    long av = Math.absExact(v);
                    if (p < 0 || av < best) {
                        p = i;
                        best = av;
                    }
                }
            }
            if (p < 0) {
                continue;
            }
            long[] t = a[p];
            a[p] = a[rank];
            a[rank] = t;
            long[] pr = a[rank];
            int nnz = 0;
            for (int k = 0; k < n; k++) {
                if (pr[k] != 0) {
                    nz[nnz++] = k;
                }
            }
            long piv = pr[c];
            for (int i = 0; i < r; i++) {
                long f = a[i][c];
                if (i == rank || f == 0) {
                    continue;
                }
                long[] row = a[i];
                if (piv != 1) {
                    for (int k = 0; k < n; k++) {
                        if (row[k] != 0) {
                            row[k] = Math.multiplyExact(row[k], piv);
                        }
                    }
                }
                for (int q = 0; q < nnz; q++) {
                    int k = nz[q];
                    row[k] = Math.subtractExact(row[k], Math.multiplyExact(pr[k], f));
                }
                normalize(row);
            }
            normalize(pr);
            pivotCol[rank++] = c;
        }
        BigInteger[][] big = new BigInteger[rank][n];
        for (int k = 0; k < rank; k++) {
            for (int i = 0; i < n; i++) {
                big[k][i] = BigInteger.valueOf(a[k][i]);
            }
        }
        return laws(big, n, rank, pivotCol);
    }

    /**
     * The reference elimination, all in BigInteger arithmetic (in place on {@code a}): used on overflow of the
     * {@code long} path, and by tests as the oracle for it.
     */
    static ConservationLaws eliminateBig(BigInteger[][] a, int n, int r, int[] order) {
        int[] pivotCol = new int[Math.min(r, n)];
        int rank = 0;
        for (int oc = 0; oc < n && rank < r; oc++) {
            int c = order[oc];
            int p = -1;
            for (int i = rank; i < r; i++) {
                if (a[i][c].signum() != 0 && (p < 0 || a[i][c].abs().compareTo(a[p][c].abs()) < 0)) {
                    p = i;
                }
            }
            if (p < 0) {
                continue;
            }
            BigInteger[] t = a[p];
            a[p] = a[rank];
            a[rank] = t;
            BigInteger[] pr = a[rank];
            for (int i = 0; i < r; i++) {
                if (i == rank || a[i][c].signum() == 0) {
                    continue;
                }
                BigInteger piv = pr[c];
                BigInteger f = a[i][c];
                BigInteger[] row = a[i];
                for (int k = 0; k < n; k++) {
                    row[k] = row[k].multiply(piv).subtract(pr[k].multiply(f));
                }
                normalize(row);
            }
            normalize(pr);
            pivotCol[rank++] = c;
        }
        return laws(a, n, rank, pivotCol);
    }

    /** Laws from the reduced row echelon form: rows 0..rank-1 of a, pivot k in column pivotCol[k]. */
    private static ConservationLaws laws(BigInteger[][] a, int n, int rank, int[] pivotCol) {
        boolean[] isPivot = new boolean[n];
        for (int k = 0; k < rank; k++) {
            isPivot[pivotCol[k]] = true;
        }
        BigInteger lcm = BigInteger.ONE;
        for (int k = 0; k < rank; k++) {
            BigInteger d = a[k][pivotCol[k]].abs();
            lcm = lcm.divide(lcm.gcd(d)).multiply(d);
        }
        List<long[]> lawList = new ArrayList<>();
        int[] dep = new int[n - rank];
        int[] ind = new int[rank];
        int nd = 0;
        int ni = 0;
        for (int c = 0; c < n; c++) {
            if (isPivot[c]) {
                ind[ni++] = c;
                continue;
            }
            dep[nd++] = c;
            // x_c = L, x_{pivot k} = -a[k][c] * L / a[k][pivot k], L = lcm of pivots.
            BigInteger[] v = new BigInteger[n];
            Arrays.fill(v, BigInteger.ZERO);
            v[c] = lcm;
            for (int k = 0; k < rank; k++) {
                v[pivotCol[k]] = a[k][c].negate().multiply(lcm).divide(a[k][pivotCol[k]]);
            }
            normalize(v);
            long[] l = new long[n];
            for (int i = 0; i < n; i++) {
                l[i] = v[i].longValueExact();
            }
            lawList.add(l);
        }
        return new ConservationLaws(n, lawList.toArray(new long[0][]), dep, ind);
    }

    private static void normalize(long[] row) {
        long g = 0;
        for (long x : row) {
            if (x != 0) {
                g = gcd(g, Math.absExact(x));
                if (g == 1) {
                    return;
                }
            }
        }
        if (g > 1) {
            for (int k = 0; k < row.length; k++) {
                row[k] /= g;
            }
        }
    }

    private static long gcd(long a, long b) {
        while (b != 0) {
            long t = a % b;
            a = b;
            b = t;
        }
        return a;
    }

    private static void normalize(BigInteger[] row) {
        BigInteger g = BigInteger.ZERO;
        for (BigInteger x : row) {
            g = g.gcd(x);
        }
        if (g.signum() != 0 && !g.equals(BigInteger.ONE)) {
            for (int k = 0; k < row.length; k++) {
                row[k] = row[k].divide(g);
            }
        }
    }

    /** Number of species (rows of N). */
    public int speciesCount() {
        return speciesCount;
    }

    /** Number of independent conservation laws (n - rank N). */
    public int lawCount() {
        return laws.length;
    }

    /** Integer coefficients of law c: {@code coefficients(c)[i]} multiplies species i. A copy. */
    public long[] coefficients(int c) {
        return laws[c].clone();
    }

    /** Species eliminated by the reduction, one per law, in law order. A copy. */
    public int[] dependentSpecies() {
        return dependent.clone();
    }

    /** Species kept as states of the reduced system, increasing. A copy. */
    public int[] independentSpecies() {
        return independent.clone();
    }

    /** Conserved totals {@code T_c = Σ_i l_c[i] y_i} of a full state. */
    public double[] totals(double[] y) {
        double[] t = new double[laws.length];
        for (int c = 0; c < laws.length; c++) {
            double s = 0;
            for (int i = 0; i < speciesCount; i++) {
                s += laws[c][i] * y[i];
            }
            t[c] = s;
        }
        return t;
    }

    /**
     * The reduced system on the independent species, with the totals appended to the parameters.
     *
     * @throws IllegalArgumentException when {@code full.stateCount()} differs from the number of species
     */
    public ReducedSystem reduce(OdeSystem full) {
        if (full.stateCount() != speciesCount) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "system has %d states but the stoichiometry matrix has %d species rows",
                    full.stateCount(), speciesCount));
        }
        return new ReducedSystem(full, this);
    }

    long coefficient(int c, int i) {
        return laws[c][i];
    }
}
