package org.switchfit.cli;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.function.Supplier;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.FitResult;
import org.switchfit.fit.LocalTaskExecutor;
import org.switchfit.fit.Multistart;
import org.switchfit.fit.StartListener;
import org.switchfit.fit.StartResult;
import org.switchfit.report.ResultStore;
import org.switchfit.util.UserInputException;

/**
 * A multistart run into a folder of finished starts ({@code fit} and {@code bench-fits}): each start is written
 * atomically as it finishes ({@link ResultStore}), and a run over a folder that already holds starts continues
 * from them when resuming is asked for (the same seed gives the same result). Not thread-safe.
 */
final class StartStore {
    private final ResultStore store;
    private final List<StartResult> finished = new ArrayList<>();

    /**
     * Opens the folder and reads the starts already in it.
     *
     * @param dir     the folder of the starts (created when missing)
     * @param resume  whether finished starts may be reused
     * @param refusal the error when the folder holds starts and {@code resume} is false
     * @throws UserInputException from {@code refusal}
     */
    StartStore(Path dir, boolean resume, Supplier<UserInputException> refusal) {
        store = new ResultStore(dir);
        if (!store.keys().isEmpty()) {
            if (!resume) {
                throw refusal.get();
            }
            finished.addAll(store.readAll(StartResult.class).values());
        }
    }

    /** The starts found when the folder was opened (unmodifiable). */
    List<StartResult> finished() {
        return List.copyOf(finished);
    }

    /**
     * Runs the remaining starts on {@code threads} worker threads, writing each finished start to the folder
     * before telling {@code listener}.
     *
     * @param guess    start 0, or null for sampled starts only
     * @param listener told about each newly finished start after it is stored, or null
     */
    FitResult run(Multistart multistart, FitProblem problem, double[] guess, int threads, StartListener listener) {
        return multistart.run(problem, guess, LocalTaskExecutor.ofThreads(threads), r -> {
            store.put(ResultStore.indexKey("start", r.index()), r);
            if (listener != null) {
                listener.startFinished(r);
            }
        }, finished);
    }
}
