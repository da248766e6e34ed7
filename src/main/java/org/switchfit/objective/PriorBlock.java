package org.switchfit.objective;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.switchfit.data.Prior;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.FreeParameter;
import org.switchfit.util.UserInputException;

/**
 * Objective priors as residuals: the negative log density of each prior (PEtab v1 parameter table, "priors")
 * written as {@code 0.5 r^2 + const}. Normal: {@code r = (x - μ)/s}, const {@code 0.5 log(2π s²)}. Laplace:
 * {@code r = sign(x - μ) sqrt(2|x - μ|/b)}, const {@code log 2b}. Log-normal: {@code r = (ln x - μ)/s} plus the
 * density's {@code ln x} term as {@code sqrt(2 ln x + C)} with {@code C = 1 - 2 ln(lower bound)} (real on the
 * box). Uniform: const {@code log(u - l)}, and the density is 0 outside [l, u] (PEtab v1): there the NLL is
 * +infinity and {@link #evaluate} throws {@link PriorSupportException}. The {@code parameterScale*} types use θ for
 * x. Immutable, thread-safe.
 */
final class PriorBlock implements ResidualBlock {
    private static final double LOG_2PI = Math.log(2.0 * Math.PI);

    private final List<Term> terms = new ArrayList<>();
    /** Uniform priors with explicit limits: θ index and support on the estimation scale. */
    private final List<Support> supports = new ArrayList<>();
    private final int size;
    private final double constant;

    private record Term(int j, Prior.Type type, double a, double b, double shift, int offset) {
    }

    /** {@code narrower}: the support cuts into θ_j's bounds. */
    private record Support(int j, double lower, double upper, boolean narrower) {
    }

    PriorBlock(EstimationProblem problem) {
        int off = 0;
        double c = 0.0;
        for (int j = 0; j < problem.parameterCount(); j++) {
            FreeParameter p = problem.parameters().get(j);
            Prior pr = p.prior();
            if (pr == null) {
                continue;
            }
            double a = pr.parameters().isEmpty() ? Double.NaN : pr.parameter(0);
            double b = pr.parameters().isEmpty() ? Double.NaN : pr.parameter(1);
            double shift = 0.0;
            double[] support = p.thetaPriorSupport();
            if (support != null) {
                supports.add(new Support(j, support[0], support[1],
                        support[0] > p.thetaLower() || support[1] < p.thetaUpper()));
            }
            switch (pr.type()) {
                case UNIFORM:
                    c += pr.parameters().isEmpty() ? Math.log(p.upper() - p.lower()) : Math.log(b - a);
                    continue;
                case PARAMETER_SCALE_UNIFORM:
                    c += pr.parameters().isEmpty() ? Math.log(p.thetaUpper() - p.thetaLower()) : Math.log(b - a);
                    continue;
                case NORMAL:
                case PARAMETER_SCALE_NORMAL:
                    c += 0.5 * LOG_2PI + Math.log(b);
                    terms.add(new Term(j, pr.type(), a, b, 0.0, off));
                    off += 1;
                    break;
                case LAPLACE:
                case PARAMETER_SCALE_LAPLACE:
                    c += Math.log(2.0 * b);
                    terms.add(new Term(j, pr.type(), a, b, 0.0, off));
                    off += 1;
                    break;
                case LOG_NORMAL:
                case LOG_LAPLACE:
                    if (!(p.lower() > 0)) {
                        throw UserInputException.of(p.location(), "parameter '%s': a %s prior is defined for "
                                + "positive values only, but its lower bound %s lets it be 0 or negative; give a "
                                + "positive lower bound or another prior", p.id(), pr.type().petabName(), p.lower());
                    }
                    shift = 1.0 - 2.0 * Math.log(p.lower());
                    c += (pr.type() == Prior.Type.LOG_NORMAL ? 0.5 * LOG_2PI + Math.log(b) : Math.log(2.0 * b))
                            - 0.5 * shift;
                    terms.add(new Term(j, pr.type(), a, b, shift, off));
                    off += 2;
                    break;
                default:
                    throw new IllegalStateException("prior type " + pr.type());
            }
        }
        size = off;
        constant = c;
    }

    @Override
    public int size() {
        return size;
    }

    @Override
    public double constant() {
        return constant;
    }

    @Override
    public void evaluate(EvaluationContext ctx, double[] r, int offset, double[] jac) {
        for (Support s : supports) {
            double th = ctx.theta(s.j());
            if (!(th >= s.lower() && th <= s.upper())) {
                FreeParameter p = ctx.problem().parameters().get(s.j());
                Prior pr = p.prior();
                throw new PriorSupportException(String.format(Locale.ROOT, "parameter '%s' = %.6g lies outside "
                        + "the support [%.6g, %.6g]%s of its %s prior, where the prior density is 0 (NLL +infinity)",
                        p.id(), pr.type() == Prior.Type.UNIFORM ? p.toLinear(th) : th, pr.parameter(0),
                        pr.parameter(1), pr.type() == Prior.Type.UNIFORM ? "" : " (estimation scale)",
                        pr.type().petabName()));
            }
        }
        int np = ctx.parameterCount();
        for (Term t : terms) {
            int j = t.j();
            double x;
            double dx;
            switch (t.type()) {
                case PARAMETER_SCALE_NORMAL:
                case PARAMETER_SCALE_LAPLACE:
                    x = ctx.theta(j);
                    dx = 1.0;
                    break;
                case LOG_NORMAL:
                case LOG_LAPLACE:
                    x = Math.log(ctx.linear(j));
                    dx = ctx.linearDerivative(j) / ctx.linear(j);
                    break;
                default:
                    x = ctx.linear(j);
                    dx = ctx.linearDerivative(j);
                    break;
            }
            int row = offset + t.offset();
            double d = x - t.a();
            boolean laplace = t.type() == Prior.Type.LAPLACE || t.type() == Prior.Type.PARAMETER_SCALE_LAPLACE
                    || t.type() == Prior.Type.LOG_LAPLACE;
            if (laplace) {
                double su = Math.sqrt(2.0 * Math.abs(d) / t.b());
                r[row] = Math.copySign(su, d);
                if (jac != null) {
                    jac[row * np + j] = su > 0 ? dx / (t.b() * su) : 0.0;
                }
            } else {
                r[row] = d / t.b();
                if (jac != null) {
                    jac[row * np + j] = dx / t.b();
                }
            }
            if (t.type() == Prior.Type.LOG_NORMAL || t.type() == Prior.Type.LOG_LAPLACE) {
                // x = ln(value): the density's 1/value factor contributes + ln(value) to the NLL
                double arg = 2.0 * x + t.shift();
                if (!(arg > 0)) {
                    // the constructor makes arg positive on the box; only a value below the lower bound gets here
                    throw new ObjectiveException(String.format(Locale.ROOT, "parameter '%s' = %.6g is below its "
                            + "lower bound %.6g, where the %s prior's term is undefined",
                            ctx.problem().parameters().get(j).id(), ctx.linear(j),
                            ctx.problem().parameters().get(j).lower(), t.type().petabName()));
                }
                double rs = Math.sqrt(arg);
                r[row + 1] = rs;
                if (jac != null) {
                    jac[(row + 1) * np + j] = dx / rs;
                }
            }
        }
    }

    /**
     * Empty when θ_j has no prior residual (uniform priors add only a constant), else null; also null when a uniform
     * prior's support is narrower than θ_j's bounds, since the closed-form factor step is clamped to the bounds
     * only and could leave the support.
     */
    @Override
    public int[] factorResiduals(int j) {
        for (Term t : terms) {
            if (t.j() == j) {
                return null;
            }
        }
        for (Support s : supports) {
            if (s.j() == j && s.narrower()) {
                return null;
            }
        }
        return new int[0];
    }
}
