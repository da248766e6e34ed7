package org.switchfit.continuation;

/** Chooses the {@link LinearSolver} implementation; the single place to change when sparse LU arrives. */
final class LinearSolvers {
    private LinearSolvers() {
    }

    /** A fresh solver suited to systems of order n. */
    static LinearSolver forSize(int n) {
        return new DenseLuSolver();
    }
}
