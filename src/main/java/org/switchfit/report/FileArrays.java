package org.switchfit.report;

/** Array checks and copies for the fit-directory records. */
final class FileArrays {
    private FileArrays() {
    }

    /** A copy of {@code a}; throws IllegalArgumentException naming {@code what} when it is missing. */
    static double[] copy(double[] a, String what) {
        if (a == null) {
            throw new IllegalArgumentException("'" + what + "' is missing");
        }
        return a.clone();
    }

    /** A copy of {@code a}, or null. */
    static double[] copyOrNull(double[] a) {
        return a == null ? null : a.clone();
    }

    /** Throws IllegalArgumentException unless {@code a} is null or has length n. */
    static void sameLength(int n, double[] a, String what) {
        if (a != null && a.length != n) {
            throw new IllegalArgumentException("'" + what + "' has " + a.length + " values, expected " + n);
        }
    }
}
