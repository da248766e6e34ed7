package org.switchfit.problem;

import java.util.List;

/**
 * The declared model parameter vector of one simulation condition as a function of θ: {@code p[k] = base[k]},
 * except {@code p[targets[i]] = lin(θ_{thetaIndex[i]})}. Also records which states are set anew when the
 * condition follows a pre-equilibration. Immutable (arrays are copied out).
 *
 * <p>Layout of p: that of {@link org.switchfit.ode.CompiledModel} (declared values; species initial values through
 * the parameters the loader adds for condition-table species, see {@link ProblemLoader}).
 *
 * @param id         condition id
 * @param base       declared values with all constants applied (length m)
 * @param targets    indices into p of entries that take a θ value
 * @param thetaIndex for each target, the θ index
 * @param reinit     state indices set from this condition's initial values after a pre-equilibration
 */
public record Condition(String id, double[] base, int[] targets, int[] thetaIndex, int[] reinit) {

    public Condition {
        base = base.clone();
        targets = targets.clone();
        thetaIndex = thetaIndex.clone();
        reinit = reinit.clone();
    }

    /** Writes the declared parameter vector for linear parameter values into {@code out} (length m). */
    public void declared(double[] thetaLinear, double[] out) {
        System.arraycopy(base, 0, out, 0, base.length);
        for (int i = 0; i < targets.length; i++) {
            out[targets[i]] = thetaLinear[thetaIndex[i]];
        }
    }

    @Override
    public double[] base() {
        return base.clone();
    }

    @Override
    public int[] targets() {
        return targets.clone();
    }

    @Override
    public int[] thetaIndex() {
        return thetaIndex.clone();
    }

    @Override
    public int[] reinit() {
        return reinit.clone();
    }

    /** Number of θ-valued entries. */
    public int targetCount() {
        return targets.length;
    }

    /** The i-th θ-valued target (index into p). */
    public int target(int i) {
        return targets[i];
    }

    /** The θ index of the i-th target. */
    public int targetTheta(int i) {
        return thetaIndex[i];
    }

    /** Copies a list of boxed ints (for loaders). */
    static int[] ints(List<Integer> l) {
        int[] a = new int[l.size()];
        for (int i = 0; i < a.length; i++) {
            a[i] = l.get(i);
        }
        return a;
    }
}
