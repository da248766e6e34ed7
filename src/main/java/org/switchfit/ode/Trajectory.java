package org.switchfit.ode;

import java.util.List;

/**
 * Simulation result: output values at the requested times. Immutable.
 * Layout: {@code value(r, k)} is output k at times[r].
 */
public final class Trajectory {
    private final List<String> names;
    private final double[] times;
    private final double[][] values;

    public Trajectory(List<String> names, double[] times, double[][] values) {
        this.names = List.copyOf(names);
        this.times = times.clone();
        this.values = new double[values.length][];
        for (int r = 0; r < values.length; r++) {
            this.values[r] = values[r].clone();
        }
    }

    public List<String> names() {
        return names;
    }

    public int rows() {
        return times.length;
    }

    public double time(int r) {
        return times[r];
    }

    public double value(int r, int k) {
        return values[r][k];
    }

    /** Copy of the times. */
    public double[] times() {
        return times.clone();
    }

    /** Copy of column k. */
    public double[] column(int k) {
        double[] c = new double[times.length];
        for (int r = 0; r < c.length; r++) {
            c[r] = values[r][k];
        }
        return c;
    }
}
