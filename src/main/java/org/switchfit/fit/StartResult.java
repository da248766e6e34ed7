package org.switchfit.fit;

import java.util.Comparator;

/**
 * The result of one multistart start. Immutable value (arrays copied in and out); the public constructor lets a
 * resumed run rebuild finished starts from storage.
 *
 * @param index                 start index (0-based)
 * @param status                outcome class
 * @param reason                failure message, or the termination reason text for non-failed starts
 * @param start                 start point on the estimation scale
 * @param theta                 final point (null for FAILED)
 * @param nll                   final NLL (NaN for FAILED)
 * @param termination           optimizer termination (null for FAILED)
 * @param iterations            optimizer iterations (0 for FAILED)
 * @param evaluations           objective evaluations
 * @param jacobianEvaluations   evaluations with Jacobian
 * @param projectedGradientNorm final projected gradient max-norm (NaN for FAILED)
 */
public record StartResult(int index, StartStatus status, String reason, double[] start, double[] theta, double nll,
                          Termination termination, int iterations, int evaluations, int jacobianEvaluations,
                          double projectedGradientNorm) {

    /** Orders by NLL ascending, FAILED (and NaN) last, ties by index: the order of {@link FitResult#starts()}. */
    public static final Comparator<StartResult> BY_NLL = Comparator
            .comparing((StartResult r) -> r.status == StartStatus.FAILED || Double.isNaN(r.nll))
            .thenComparingDouble(StartResult::nll)
            .thenComparingInt(StartResult::index);

    public StartResult {
        start = start.clone();
        theta = theta == null ? null : theta.clone();
    }

    static StartResult of(int index, double[] start, LocalFit f) {
        StartStatus st = f.termination().converged() ? StartStatus.CONVERGED : StartStatus.NOT_CONVERGED;
        return new StartResult(index, st, f.termination().name(), start, f.theta(), f.nll(), f.termination(),
                f.iterations(), f.evaluations(), f.jacobianEvaluations(), f.projectedGradientNorm());
    }

    static StartResult failed(int index, double[] start, String reason) {
        return new StartResult(index, StartStatus.FAILED, reason, start, null, Double.NaN, null, 0, 0, 0,
                Double.NaN);
    }

    @Override
    public double[] start() {
        return start.clone();
    }

    @Override
    public double[] theta() {
        return theta == null ? null : theta.clone();
    }
}
