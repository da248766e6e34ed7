package org.switchfit.profile;

/**
 * Observer told about each finished profile (in completion order, never concurrently); a typical listener writes
 * it atomically so an interrupted run can resume.
 */
@FunctionalInterface
public interface ProfileListener {
    void profileFinished(Profile profile);
}
