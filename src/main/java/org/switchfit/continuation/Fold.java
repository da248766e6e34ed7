package org.switchfit.continuation;

/**
 * A fold (saddle-node, limit point) of equilibria in the control parameter: f(y*, λ*) = 0, J v = 0, w^T J = 0,
 * with the nondegeneracy quantities of the normal form {@code ξ' = (w^T f_λ) (λ - λ*) + (a / 2) ξ^2}
 * (Kuznetsov 2004, Elements of Applied Bifurcation Theory, 3rd ed., sec. 3.2 and 5.4).
 *
 * @param control          index of λ in the parameter vector
 * @param parameter        λ*
 * @param state            y*
 * @param rightNull        v, |v| = 1
 * @param leftNull         w, normalised so that w^T v = 1 (so a and w^T f_λ are on the normal-form scale)
 * @param quadratic        a = w^T D²f(v, v)
 * @param paramDerivative  w^T ∂f/∂λ
 * @param kind             whether λ is a local maximum or minimum along the branch
 * @param refined          true when Newton on an augmented fold system converged; false means the values are the
 *                         interpolated estimate between two branch points (with w, a from that estimate)
 * @param afterPoint       index of the branch point just before the fold in the branch's point order
 */
public record Fold(int control, double parameter, double[] state, double[] rightNull, double[] leftNull,
                   double quadratic, double paramDerivative, Kind kind, boolean refined, int afterPoint) {

    /** Whether the branch turns back at a maximum or a minimum of λ. */
    public enum Kind {
        /** λ* is a local maximum of λ along the branch: the branch exists for λ &lt;= λ* nearby. */
        MAXIMUM,
        /** λ* is a local minimum of λ along the branch. */
        MINIMUM
    }

    /** Copies the arrays. */
    public Fold {
        state = state.clone();
        rightNull = rightNull.clone();
        leftNull = leftNull.clone();
    }

    @Override
    public double[] state() {
        return state.clone();
    }

    @Override
    public double[] rightNull() {
        return rightNull.clone();
    }

    @Override
    public double[] leftNull() {
        return leftNull.clone();
    }

    Fold withAfterPoint(int index) {
        return new Fold(control, parameter, state, rightNull, leftNull, quadratic, paramDerivative, kind, refined,
                index);
    }
}
