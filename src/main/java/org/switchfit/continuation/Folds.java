package org.switchfit.continuation;

import java.util.Locale;
import org.switchfit.ode.OdeSystem;

/**
 * Operations on single folds: re-locating a known fold after parameters changed, and the exact first-order
 * sensitivity of the fold's parameter value to every parameter.
 *
 * <p>Sensitivity (implicit function theorem on the fold manifold): differentiating f(y*(θ), λ*(θ), θ) = 0 and
 * multiplying by the left null vector w (w^T J = 0) removes the unknown dy* / dθ:
 * {@code dλ* / dθ_k = -(w^T ∂f/∂θ_k) / (w^T ∂f/∂λ)} (Kuznetsov 2004, Elements of Applied Bifurcation Theory,
 * 3rd ed., sec. 10.2.1; Govaerts 2000, Numerical Methods for Bifurcations of Dynamical Equilibria, SIAM,
 * ch. 3). It needs only J, ∂f/∂p and the null vectors, so it is exact to rounding. For a {@link ReducedSystem}
 * the conservation totals are parameters, so their sensitivities come out the same way. Stateless, thread-safe.
 */
public final class Folds {
    private Folds() {
    }

    /**
     * Gradient of the fold parameter value λ* with respect to all parameters of {@code sys}. The entry of the
     * control parameter itself is 0 (λ* does not depend on the value λ is started from).
     *
     * @param p parameters (the control entry is ignored; the fold's value is used)
     * @throws ContinuationException when w^T ∂f/∂λ vanishes (λ does not unfold the fold: degenerate)
     */
    public static double[] parameterGradient(OdeSystem sys, Fold fold, double[] p) {
        int n = sys.stateCount();
        int m = sys.parameterCount();
        double[] q = p.clone();
        int c = fold.control();
        q[c] = fold.parameter();
        double[] y = fold.state();
        double[] w = fold.leftNull();
        double[] jp = new double[n * m];
        sys.jacobianP(0, y, q, jp);
        double[] g = new double[m];
        double wfl = 0;
        for (int i = 0; i < n; i++) {
            wfl += w[i] * jp[i * m + c];
        }
        double wn = Math.sqrt(SteadyStateSolver.dot(w, n));
        double fn = 0;
        for (int i = 0; i < n; i++) {
            fn = Math.max(fn, Math.abs(jp[i * m + c]));
        }
        if (!(Math.abs(wfl) > 1e-14 * wn * fn)) {
            throw new ContinuationException(String.format(Locale.ROOT,
                    "fold at λ = %.6g is degenerate: w^T ∂f/∂λ = %.3g, so its sensitivity is undefined",
                    fold.parameter(), wfl));
        }
        for (int k = 0; k < m; k++) {
            if (k == c) {
                continue;
            }
            double s = 0;
            for (int i = 0; i < n; i++) {
                s += w[i] * jp[i * m + k];
            }
            g[k] = -s / wfl;
        }
        return g;
    }

    /**
     * Re-locates a fold after the parameters changed, starting Newton on the extended system from a known fold
     * (e.g. the previous iterate of a fit). Returns null when Newton does not converge (the fold may have
     * disappeared through a cusp); then trace a branch instead.
     *
     * @param near a fold of the same system and control, used as starting guess
     * @param p    new parameters (the control entry is replaced by the guess's value)
     */
    public static Fold locate(OdeSystem sys, Fold near, double[] p, double tolerance) {
        double[] q = p.clone();
        q[near.control()] = near.parameter();
        return FoldRefiner.refine(sys, near.state(), q, near.control(), near.rightNull(), tolerance, 40);
    }
}
