package org.switchfit.fit;

import java.util.List;
import java.util.concurrent.Callable;

/**
 * Runs independent tasks (one per fit start or per profile) and returns their results in task order.
 *
 * <p>Contract: tasks are pure functions of their captured, immutable inputs (problem, configuration, task index);
 * they share no mutable state and draw randomness only from streams derived from (seed, index). Results must not
 * depend on the order or place in which tasks run, so an executor may run them on one thread, a pool, or other
 * machines. Tasks report their own failures as result values; an exception escaping a task is a programming error
 * and is rethrown by {@link #runAll} (wrapped in {@link IllegalStateException}) after the other tasks finish.
 *
 * <p>The completion callback is invoked once per task as it finishes, never concurrently with itself (the
 * executor serialises calls), in completion order, which may differ from task order.
 */
public interface TaskExecutor {

    /** Receives each finished task's index and result. */
    @FunctionalInterface
    interface Completion<T> {
        void finished(int taskIndex, T result);
    }

    /**
     * Runs all tasks and returns their results in task order.
     *
     * @param tasks      the tasks (not modified)
     * @param onFinished called as each task finishes; may be null
     */
    <T> List<T> runAll(List<? extends Callable<T>> tasks, Completion<? super T> onFinished);
}
