package org.switchfit.fit;

import java.util.ArrayList;
import java.util.Collections;
import java.util.List;
import java.util.concurrent.Callable;
import java.util.concurrent.ExecutionException;
import java.util.concurrent.ExecutorService;
import java.util.concurrent.Executors;
import java.util.concurrent.Future;
import java.util.concurrent.ThreadFactory;
import java.util.concurrent.atomic.AtomicInteger;

/**
 * {@link TaskExecutor} on a local pool of daemon threads created per {@link #runAll} call and shut down before it
 * returns (no threads outlive a run). With one thread the tasks run on the caller's thread, in order. Immutable and
 * thread-safe.
 */
public final class LocalTaskExecutor implements TaskExecutor {

    private final int threads;

    private LocalTaskExecutor(int threads) {
        this.threads = threads;
    }

    /** An executor with {@code threads} ≥ 1 worker threads. */
    public static LocalTaskExecutor ofThreads(int threads) {
        if (threads < 1) {
            throw new IllegalArgumentException("threads must be >= 1, got " + threads);
        }
        return new LocalTaskExecutor(threads);
    }

    /** Runs tasks on the calling thread. */
    public static LocalTaskExecutor sequential() {
        return new LocalTaskExecutor(1);
    }

    /** Number of worker threads. */
    public int threads() {
        return threads;
    }

    @Override
    public <T> List<T> runAll(List<? extends Callable<T>> tasks, Completion<? super T> onFinished) {
        int n = tasks.size();
        List<T> out = new ArrayList<>(Collections.nCopies(n, null));
        Object lock = new Object();
        if (threads == 1 || n <= 1) {
            for (int i = 0; i < n; i++) {
                T r = call(tasks.get(i), i);
                out.set(i, r);
                if (onFinished != null) {
                    onFinished.finished(i, r);
                }
            }
            return out;
        }
        AtomicInteger counter = new AtomicInteger();
        ThreadFactory tf = r -> {
            Thread t = new Thread(r, "switchfit-task-" + counter.incrementAndGet());
            t.setDaemon(true);
            return t;
        };
        ExecutorService pool = Executors.newFixedThreadPool(Math.min(threads, n), tf);
        try {
            List<Future<T>> futures = new ArrayList<>(n);
            for (int i = 0; i < n; i++) {
                final int idx = i;
                final Callable<T> task = tasks.get(i);
                futures.add(pool.submit(() -> {
                    T r = call(task, idx);
                    if (onFinished != null) {
                        synchronized (lock) {
                            onFinished.finished(idx, r);
                        }
                    }
                    return r;
                }));
            }
            RuntimeException first = null;
            for (int i = 0; i < n; i++) {
                try {
                    out.set(i, futures.get(i).get());
                } catch (ExecutionException e) {
                    Throwable c = e.getCause();
                    if (first == null) {
                        first = c instanceof RuntimeException ? (RuntimeException) c
                                : new IllegalStateException("task " + i + " failed: " + c, c);
                    }
                } catch (InterruptedException e) {
                    Thread.currentThread().interrupt();
                    throw new IllegalStateException("interrupted while waiting for task " + i, e);
                }
            }
            if (first != null) {
                throw first;
            }
            return out;
        } finally {
            pool.shutdownNow();
        }
    }

    private static <T> T call(Callable<T> task, int index) {
        try {
            return task.call();
        } catch (RuntimeException e) {
            throw new IllegalStateException("task " + index + " threw " + e, e);
        } catch (Exception e) {
            throw new IllegalStateException("task " + index + " threw " + e, e);
        }
    }
}
