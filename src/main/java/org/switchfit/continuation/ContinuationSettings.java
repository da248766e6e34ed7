package org.switchfit.continuation;

import java.util.Locale;

/**
 * Settings of a pseudo-arclength continuation. Immutable; {@code withX} returns changed copies.
 *
 * <p>Steps are arclengths in the plain Euclidean norm of (y, λ), in the caller's units. Choose maxStep well
 * below the smallest feature to be resolved: when states are tiny compared with the λ range (or the reverse),
 * a step can cross a narrow S-shaped part of the branch without any test function noticing. Rescaling the
 * model (states and control to order one) is the robust remedy.
 *
 * @param lowerBound        smallest λ to reach (the branch end is placed exactly on it)
 * @param upperBound        largest λ
 * @param initialStep       first arclength step (Euclidean norm in (y, λ))
 * @param minStep           smallest step before giving up
 * @param maxStep           largest step
 * @param maxPoints         maximum points per direction
 * @param tolerance         relative Newton step tolerance of the corrector and of fold/Hopf refinement
 * @param maxCorrectorSteps Newton iterations per corrector
 * @param eigenvalueLimit   all eigenvalues (stability, Hopf detection) computed when the system has at most this
 *                          many states; above it, for a sparse Jacobian, the converged dominant eigenvalues of its
 *                          Cayley transform ({@code CayleyArnoldi}: every unstable eigenvalue, plus some stable
 *                          ones) give the stability; for a dense one points carry unstableCount -1
 * @param linearAlgebra     LU of the bordered corrector and tangent systems ({@link LinearAlgebra})
 * @param relativeSteps     measure the steps of {@link PseudoArclength} in the weighted norm with weights
 *                          {@code 1 / max(1, |y_i|)} on the states (the control keeps weight 1): meant for unknowns
 *                          scaled to order one at the start ({@link ScaledSystem}), where a state that grows by
 *                          orders of magnitude along the branch would otherwise limit every step to the start's
 *                          absolute resolution. Off by default: in unscaled units, relative steps of the size meant
 *                          for the control range could cross features of large states.
 */
public record ContinuationSettings(double lowerBound, double upperBound, double initialStep, double minStep,
                                   double maxStep, int maxPoints, double tolerance, int maxCorrectorSteps,
                                   int eigenvalueLimit, LinearAlgebra linearAlgebra,
                                   boolean relativeSteps) {

    /** Validates. */
    public ContinuationSettings {
        if (!(lowerBound < upperBound)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "lower bound %.6g must be below upper bound %.6g", lowerBound, upperBound));
        }
        if (!(minStep > 0 && minStep <= initialStep && initialStep <= maxStep)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "steps must satisfy 0 < min %.3g <= initial %.3g <= max %.3g", minStep, initialStep, maxStep));
        }
        if (maxPoints < 2 || maxCorrectorSteps < 1 || !(tolerance > 0)) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "need maxPoints >= 2 (got %d), maxCorrectorSteps >= 1 (got %d), tolerance > 0 (got %.3g)",
                    maxPoints, maxCorrectorSteps, tolerance));
        }
        if (linearAlgebra == null) {
            throw new IllegalArgumentException("linearAlgebra must not be null (use LinearAlgebra.AUTO)");
        }
    }

    /**
     * Bounds [lo, hi] with steps scaled to the range: initial 1/100, min 1e-9, max 1/20 of (hi - lo + 1); 2000
     * points, tolerance 1e-11, 8 corrector iterations; eigenvalues up to 100 states (a full eigenvalue
     * computation costs about 0.06 s at n = 100, 0.5 s at 200 and 5 s at 500 on the 2-core test machine, per
     * point; raise the limit with {@link #withEigenvalueLimit} when stability of larger systems is needed);
     * {@link LinearAlgebra#AUTO}.
     */
    public static ContinuationSettings of(double lo, double hi) {
        double scale = hi - lo + 1;
        return new ContinuationSettings(lo, hi, scale / 100, scale * 1e-9, scale / 20, 2000, 1e-11, 8, 100,
                LinearAlgebra.AUTO, false);
    }

    /** Copy with other steps. */
    public ContinuationSettings withSteps(double initial, double min, double max) {
        return new ContinuationSettings(lowerBound, upperBound, initial, min, max, maxPoints, tolerance,
                maxCorrectorSteps, eigenvalueLimit, linearAlgebra, relativeSteps);
    }

    /** Copy with another point limit. */
    public ContinuationSettings withMaxPoints(int points) {
        return new ContinuationSettings(lowerBound, upperBound, initialStep, minStep, maxStep, points, tolerance,
                maxCorrectorSteps, eigenvalueLimit, linearAlgebra, relativeSteps);
    }

    /** Copy with other bounds. */
    public ContinuationSettings withBounds(double lo, double hi) {
        return new ContinuationSettings(lo, hi, initialStep, minStep, maxStep, maxPoints, tolerance,
                maxCorrectorSteps, eigenvalueLimit, linearAlgebra, relativeSteps);
    }

    /** Copy with another eigenvalue limit. */
    public ContinuationSettings withEigenvalueLimit(int limit) {
        return new ContinuationSettings(lowerBound, upperBound, initialStep, minStep, maxStep, maxPoints, tolerance,
                maxCorrectorSteps, limit, linearAlgebra, relativeSteps);
    }

    /** Copy with another choice of LU for the bordered systems. */
    public ContinuationSettings withLinearAlgebra(LinearAlgebra choice) {
        return new ContinuationSettings(lowerBound, upperBound, initialStep, minStep, maxStep, maxPoints, tolerance,
                maxCorrectorSteps, eigenvalueLimit, choice, relativeSteps);
    }

    /** Copy with relative steps on or off (see the record's {@code relativeSteps}). */
    public ContinuationSettings withRelativeSteps(boolean on) {
        return new ContinuationSettings(lowerBound, upperBound, initialStep, minStep, maxStep, maxPoints, tolerance,
                maxCorrectorSteps, eigenvalueLimit, linearAlgebra, on);
    }
}
