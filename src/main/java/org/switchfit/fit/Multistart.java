package org.switchfit.fit;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.Collection;
import java.util.HashMap;
import java.util.List;
import java.util.Map;
import java.util.concurrent.Callable;
import org.switchfit.util.UserInputException;

/**
 * Multistart local optimisation: start points drawn within the bounds ({@link StartSampling}, reproducible from a
 * seed), one bounded {@link LevenbergMarquardt} run per start, each start an independent task on a
 * {@link TaskExecutor}. Results are identical whatever the executor or thread count (wall time aside). A start
 * whose objective throws or turns non-finite becomes a FAILED {@link StartResult}; it never stops the run.
 *
 * <p>Immutable; {@code withX} returns changed copies. Thread-safe.
 */
public final class Multistart {

    private final LevenbergMarquardt optimizer;
    private final int starts;
    private final long seed;
    private final StartSampling sampling;

    private Multistart(LevenbergMarquardt optimizer, int starts, long seed, StartSampling sampling) {
        this.optimizer = optimizer;
        this.starts = starts;
        this.seed = seed;
        this.sampling = sampling;
    }

    /** 20 Latin-hypercube starts, seed 1, default optimizer. */
    public static Multistart defaults() {
        return new Multistart(LevenbergMarquardt.defaults(), 20, 1L, StartSampling.LATIN_HYPERCUBE);
    }

    /** The local optimizer used for every start. */
    public Multistart withOptimizer(LevenbergMarquardt lm) {
        return new Multistart(lm, starts, seed, sampling);
    }

    /** Number of starts, n ≥ 1 (start 0 is the initial guess when one is given). */
    public Multistart withStarts(int n) {
        if (n < 1) {
            throw new IllegalArgumentException("starts must be >= 1, got " + n);
        }
        return new Multistart(optimizer, n, seed, sampling);
    }

    /** Seed of the start design and of the per-start streams. */
    public Multistart withSeed(long s) {
        return new Multistart(optimizer, starts, s, sampling);
    }

    /** Start design. */
    public Multistart withSampling(StartSampling s) {
        return new Multistart(optimizer, starts, seed, s);
    }

    /** The local optimizer. */
    public LevenbergMarquardt optimizer() {
        return optimizer;
    }

    /** Number of starts. */
    public int starts() {
        return starts;
    }

    /** The seed. */
    public long seed() {
        return seed;
    }

    /**
     * The start points (rows) this configuration uses; start 0 is {@code initialGuess} (clamped) when given.
     *
     * @param initialGuess a start point, or null; also supplies the values of fixed parameters (0 when null)
     */
    public double[][] startPoints(FitProblem problem, double[] initialGuess) {
        double[] base = initialGuess == null ? new double[problem.parameterCount()] : initialGuess;
        double[][] pts = sampling.sample(problem, base, starts, seed);
        if (initialGuess != null) {
            pts[0] = problem.clamp(initialGuess);
        }
        return pts;
    }

    /** Runs all starts; see {@link #run(FitProblem, double[], TaskExecutor, StartListener, Collection)}. */
    public FitResult run(FitProblem problem, double[] initialGuess, TaskExecutor executor) {
        return run(problem, initialGuess, executor, null, List.of());
    }

    /**
     * Runs the starts not yet finished.
     *
     * @param problem      the problem
     * @param initialGuess start 0 (and the values of fixed parameters), or null
     * @param executor     runs the starts
     * @param listener     told about each newly finished start, or null
     * @param finished     starts finished by an earlier, interrupted run with the same settings; they are reused,
     *                     not recomputed, and not reported to the listener again
     * @throws UserInputException when a finished start does not match this configuration (other seed, bounds or
     *                            start count)
     */
    public FitResult run(FitProblem problem, double[] initialGuess, TaskExecutor executor, StartListener listener,
                         Collection<StartResult> finished) {
        long t0 = System.nanoTime();
        double[][] pts = startPoints(problem, initialGuess);
        Map<Integer, StartResult> done = matchFinished(pts, finished);
        List<Integer> todo = new ArrayList<>();
        List<Callable<StartResult>> tasks = new ArrayList<>();
        for (int i = 0; i < starts; i++) {
            if (!done.containsKey(i)) {
                final int idx = i;
                final double[] x0 = pts[i];
                todo.add(i);
                tasks.add(() -> runStart(problem, idx, x0));
            }
        }
        List<StartResult> fresh = executor.runAll(tasks, listener == null ? null
                : (taskIndex, r) -> listener.startFinished(r));
        List<StartResult> all = new ArrayList<>(done.values());
        all.addAll(fresh);
        all.sort(StartResult.BY_NLL);
        StartResult best = all.get(0);
        boolean any = best.status() != StartStatus.FAILED;
        int near = 0;
        for (StartResult r : all) {
            if (any && r.status() != StartStatus.FAILED && r.nll() - best.nll() <= FitResult.NEAR_BEST_TOLERANCE) {
                near++;
            }
        }
        long ms = (System.nanoTime() - t0) / 1_000_000L;
        return new FitResult(problem.ids(), problem.scales(), any ? best.theta() : null,
                any ? best.nll() : Double.NaN, all, near, ms);
    }

    /**
     * Checks that starts finished by an earlier run belong to this configuration (same start points: seed, bounds,
     * start count, sampling), as {@link #run} does before reusing them; callers use it to refuse a mismatched
     * output folder before any work.
     *
     * @throws UserInputException naming the first start that does not belong
     */
    public void checkFinished(FitProblem problem, double[] initialGuess, Collection<StartResult> finished) {
        matchFinished(startPoints(problem, initialGuess), finished);
    }

    private Map<Integer, StartResult> matchFinished(double[][] pts, Collection<StartResult> finished) {
        Map<Integer, StartResult> done = new HashMap<>();
        for (StartResult r : finished) {
            if (r.index() < 0 || r.index() >= starts || !Arrays.equals(r.start(), pts[r.index()])) {
                throw UserInputException.of(null, "finished start %d does not belong to this run (other seed, bounds"
                        + " or start count); remove the stored starts or rerun with the same settings", r.index());
            }
            done.put(r.index(), r);
        }
        return done;
    }

    /**
     * Computes start {@code index} alone, exactly as {@link #run} would: the entry point for a worker that holds
     * the same problem and configuration (for example a distributed {@link TaskExecutor} shipping only indices).
     */
    public StartResult runStart(FitProblem problem, double[] initialGuess, int index) {
        if (index < 0 || index >= starts) {
            throw new IllegalArgumentException("start index " + index + " outside [0, " + starts + ")");
        }
        return runStart(problem, index, startPoints(problem, initialGuess)[index]);
    }

    private StartResult runStart(FitProblem problem, int index, double[] x0) {
        try {
            LocalFit f = optimizer.minimize(problem, x0);
            if (!Double.isFinite(f.nll())) {
                return StartResult.failed(index, x0, "non-finite negative log-likelihood " + f.nll());
            }
            return StartResult.of(index, x0, f);
        } catch (RuntimeException e) {
            // A start that cannot be evaluated is a result, not an abort (objective exceptions, user input
            // problems met only at some parameter values, numerical failures inside the model).
            String msg = e.getMessage() == null ? e.getClass().getSimpleName() : e.getMessage();
            return StartResult.failed(index, x0, msg);
        }
    }
}
