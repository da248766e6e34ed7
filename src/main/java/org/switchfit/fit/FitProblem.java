package org.switchfit.fit;

import java.util.Arrays;
import java.util.Locale;
import org.switchfit.objective.Objective;
import org.switchfit.util.UserInputException;

/**
 * A bound-constrained least-squares problem: an {@link Objective}, parameter ids, box bounds on the estimation
 * scale, the scale of each parameter and an optional mask of parameters held fixed (at the value of the start
 * point). Immutable; {@code withX} methods return changed copies. Bounds may be infinite for local fits;
 * multistart sampling needs finite bounds.
 */
public final class FitProblem {

    private final Objective objective;
    private final String[] ids;
    private final double[] lower;
    private final double[] upper;
    private final boolean[] fixed;
    private final ParameterScale[] scales;

    private FitProblem(Objective objective, String[] ids, double[] lower, double[] upper, boolean[] fixed,
                       ParameterScale[] scales) {
        this.objective = objective;
        this.ids = ids;
        this.lower = lower;
        this.upper = upper;
        this.fixed = fixed;
        this.scales = scales;
    }

    /**
     * Creates a problem with all parameters free and on the linear scale.
     *
     * @throws IllegalArgumentException when lengths differ from the objective's parameter count
     * @throws UserInputException       when a lower bound is not below its upper bound (or is NaN)
     */
    public static FitProblem of(Objective objective, String[] ids, double[] lower, double[] upper) {
        int n = objective.parameterCount();
        if (ids.length != n || lower.length != n || upper.length != n) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "ids/lower/upper lengths %d/%d/%d must equal the objective's parameter count %d",
                    ids.length, lower.length, upper.length, n));
        }
        for (int k = 0; k < n; k++) {
            if (!(lower[k] < upper[k])) {
                throw UserInputException.of(null, "parameter '%s': lower bound %.6g is not below upper bound %.6g;"
                        + " correct the bounds", ids[k], lower[k], upper[k]);
            }
        }
        ParameterScale[] sc = new ParameterScale[n];
        Arrays.fill(sc, ParameterScale.LINEAR);
        return new FitProblem(objective, ids.clone(), lower.clone(), upper.clone(), new boolean[n], sc);
    }

    /** Returns a copy with the given scales (one per parameter). */
    public FitProblem withScales(ParameterScale... newScales) {
        if (newScales.length != ids.length) {
            throw new IllegalArgumentException("scales length " + newScales.length + " != " + ids.length);
        }
        return new FitProblem(objective, ids, lower, upper, fixed, newScales.clone());
    }

    /** Returns a copy in which parameter {@code index} is fixed (true) or free (false). */
    public FitProblem withFixed(int index, boolean isFixed) {
        boolean[] f = fixed.clone();
        f[index] = isFixed;
        return new FitProblem(objective, ids, lower, upper, f, scales);
    }

    /** Returns a copy with another objective of the same parameter count (e.g. with an added penalty). */
    public FitProblem withObjective(Objective other) {
        if (other.parameterCount() != ids.length) {
            throw new IllegalArgumentException("parameter count " + other.parameterCount() + " != " + ids.length);
        }
        return new FitProblem(other, ids, lower, upper, fixed, scales);
    }

    /** The objective (shared, thread-safe). */
    public Objective objective() {
        return objective;
    }

    /** Number of parameters (free and fixed). */
    public int parameterCount() {
        return ids.length;
    }

    /** Number of free parameters. */
    public int freeCount() {
        int c = 0;
        for (boolean f : fixed) {
            c += f ? 0 : 1;
        }
        return c;
    }

    /** Id of parameter {@code index}. */
    public String id(int index) {
        return ids[index];
    }

    /** All parameter ids in θ order (copy). */
    public String[] ids() {
        return ids.clone();
    }

    /** Lower bound of parameter {@code index} on the estimation scale (may be -∞). */
    public double lower(int index) {
        return lower[index];
    }

    /** Upper bound of parameter {@code index} on the estimation scale (may be +∞). */
    public double upper(int index) {
        return upper[index];
    }

    /** All lower bounds (copy). */
    public double[] lower() {
        return lower.clone();
    }

    /** All upper bounds (copy). */
    public double[] upper() {
        return upper.clone();
    }

    /** True when parameter {@code index} is held at its start value. */
    public boolean isFixed(int index) {
        return fixed[index];
    }

    /** Estimation scale of parameter {@code index}. */
    public ParameterScale scale(int index) {
        return scales[index];
    }

    /** All estimation scales (copy). */
    public ParameterScale[] scales() {
        return scales.clone();
    }

    /** Index of the parameter with the given id, or -1. */
    public int indexOf(String id) {
        for (int k = 0; k < ids.length; k++) {
            if (ids[k].equals(id)) {
                return k;
            }
        }
        return -1;
    }

    /** Returns θ clamped into the bounds (new array). */
    public double[] clamp(double[] theta) {
        double[] x = new double[theta.length];
        for (int k = 0; k < x.length; k++) {
            x[k] = Math.min(upper[k], Math.max(lower[k], theta[k]));
        }
        return x;
    }
}
