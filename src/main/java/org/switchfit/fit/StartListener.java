package org.switchfit.fit;

/**
 * Observer of a multistart run, told about each start as it finishes (in completion order, never concurrently).
 * A typical listener writes the start atomically so an interrupted run can resume.
 */
@FunctionalInterface
public interface StartListener {
    void startFinished(StartResult result);
}
