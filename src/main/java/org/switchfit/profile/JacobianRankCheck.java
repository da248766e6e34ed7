package org.switchfit.profile;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.SplittableRandom;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.ParameterScale;
import org.switchfit.fit.RandomStreams;
import org.switchfit.util.UserInputException;

/**
 * Local structural identifiability by the numerical rank of the residual Jacobian (free parameters), from its
 * singular value decomposition (Golub and Van Loan, "Matrix Computations", 4th ed., §2.4.8 and §5.4.1; the rank
 * test of the sensitivity matrix is common practice in systems biology, e.g. Raue et al. 2009 discussion). Checked
 * at the optimum and at random points in the bounds (a structural deficiency holds almost everywhere, a numerical
 * accident at one point does not).
 *
 * <p>Tolerance: singular values below {@code relTol · s_max} count as zero. Default 1e-6: by Weyl's inequality a
 * perturbation E of J moves each singular value by at most |E|₂, and Jacobians from forward sensitivities at the
 * usual integration tolerances (1e-8 to 1e-10 relative) carry relative errors up to about 1e-7, so an exact zero can
 * appear as large as ~1e-7 s_max; for closed-form Jacobians any value above about m·eps (1e-13) works.
 *
 * <p>Immutable and thread-safe.
 */
public final class JacobianRankCheck {

    private final double relTol;

    private JacobianRankCheck(double relTol) {
        this.relTol = relTol;
    }

    /** Relative tolerance 1e-6. */
    public static JacobianRankCheck defaults() {
        return new JacobianRankCheck(1e-6);
    }

    public JacobianRankCheck withRelativeTolerance(double tol) {
        if (!(tol > 0 && tol < 1)) {
            throw new IllegalArgumentException("relative tolerance must be in (0, 1), got " + tol);
        }
        return new JacobianRankCheck(tol);
    }

    /** Rank and null space at θ. */
    public RankReport atPoint(FitProblem problem, double[] theta) {
        LocalCurvature c = new LocalCurvature(problem, theta, relTol);
        int nf = c.free.length;
        String[] ids = new String[nf];
        for (int f = 0; f < nf; f++) {
            ids[f] = problem.id(c.free[f]);
        }
        List<NullDirection> nulls = new ArrayList<>();
        for (int q = c.rank; q < c.singularValues.length; q++) {
            double[] v = new double[nf];
            int arg = 0;
            for (int f = 0; f < nf; f++) {
                v[f] = c.rightVectors[f][q];
                if (Math.abs(v[f]) > Math.abs(v[arg])) {
                    arg = f;
                }
            }
            if (v[arg] < 0) {
                for (int f = 0; f < nf; f++) {
                    v[f] = -v[f];
                }
            }
            nulls.add(new NullDirection(ids, v, c.singularValues[q], describe(problem, c.free, v)));
        }
        return new RankReport(theta, c.singularValues, c.rank, nf, relTol, nulls);
    }

    /**
     * Rank at {@code count} points drawn uniformly in the bounds, point i from stream (seed, i).
     *
     * @throws UserInputException when a free parameter has an infinite bound
     */
    public List<RankReport> atRandomPoints(FitProblem problem, double[] base, int count, long seed) {
        List<RankReport> out = new ArrayList<>();
        for (int i = 0; i < count; i++) {
            SplittableRandom rnd = RandomStreams.stream(seed, i);
            double[] th = base.clone();
            for (int k = 0; k < th.length; k++) {
                if (problem.isFixed(k)) {
                    continue;
                }
                double lo = problem.lower(k);
                double hi = problem.upper(k);
                if (!(Double.isFinite(lo) && Double.isFinite(hi))) {
                    throw UserInputException.of(null, "parameter '%s': random rank checks need finite bounds; give"
                            + " finite bounds on the estimation scale", problem.id(k));
                }
                th[k] = lo + rnd.nextDouble() * (hi - lo);
            }
            out.add(atPoint(problem, th));
        }
        return out;
    }

    /** Terms with |coefficient| ≥ 0.05 · max, plus the invariant combination for two-term directions. */
    private static String describe(FitProblem problem, int[] free, double[] v) {
        StringBuilder sb = new StringBuilder();
        double mx = 0;
        for (double e : v) {
            mx = Math.max(mx, Math.abs(e));
        }
        List<Integer> terms = new ArrayList<>();
        for (int f = 0; f < v.length; f++) {
            if (Math.abs(v[f]) >= 0.05 * mx) {
                terms.add(f);
                sb.append(String.format(Locale.ROOT, "%s%+.3g %s", sb.length() == 0 ? "" : " ", v[f],
                        scaled(problem, free[f])));
            }
        }
        if (terms.size() == 2) {
            int f1 = terms.get(0);
            int f2 = terms.get(1);
            int k1 = free[f1];
            int k2 = free[f2];
            // Moving along (v1, v2) keeps v2·θ1 - v1·θ2 fixed.
            double ratio = -v[f1] / v[f2];
            boolean log1 = problem.scale(k1) != ParameterScale.LINEAR;
            boolean log2 = problem.scale(k2) != ParameterScale.LINEAR;
            if (log1 && log2 && problem.scale(k1) == problem.scale(k2)) {
                sb.append("; invariant: ").append(problem.id(k1)).append(" * ").append(problem.id(k2));
                if (Math.abs(ratio - 1) > 1e-3) {
                    sb.append(String.format(Locale.ROOT, "^%.3g", ratio));
                }
            } else if (!log1 && !log2) {
                sb.append(String.format(Locale.ROOT, "; invariant: %s %+.3g * %s", problem.id(k1), ratio,
                        problem.id(k2)));
            }
        }
        return sb.toString();
    }

    private static String scaled(FitProblem problem, int k) {
        switch (problem.scale(k)) {
            case LOG10:
                return "log10(" + problem.id(k) + ")";
            case LN:
                return "ln(" + problem.id(k) + ")";
            default:
                return problem.id(k);
        }
    }
}
