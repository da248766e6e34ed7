package org.switchfit.report;

import java.util.List;
import java.util.Map;

/**
 * Content of {@code phaseplane.json}, computed by {@link PhasePlanes#compute} from the fitted model: the plane of
 * two states with their nullclines, the steady states in the window and a few trajectories. Other states (if any)
 * are held at the values in {@code heldStates}. Immutable.
 *
 * @param xState      id of the state on the x axis
 * @param yState      id of the state on the y axis
 * @param xRange      {@code [min, max]} of the window in x
 * @param yRange      {@code [min, max]} of the window in y
 * @param xNullcline  the curve dx/dt = 0 (pieces separated by NaN, written as null)
 * @param yNullcline  the curve dy/dt = 0 (pieces separated by NaN)
 * @param steadyStates steady states found in the window
 * @param trajectories trajectories from a few starting points
 * @param heldStates  values of the other states, by id (empty for two-state models)
 * @param note        what else the reader needs to know (control value, how eliminated states follow), or null
 */
public record PhasePlaneFile(String xState, String yState, double[] xRange, double[] yRange, Curve xNullcline,
                             Curve yNullcline, List<SteadyPoint> steadyStates, List<Curve> trajectories,
                             Map<String, Double> heldStates, String note) {

    /** A file without a note. */
    public PhasePlaneFile(String xState, String yState, double[] xRange, double[] yRange, Curve xNullcline,
                          Curve yNullcline, List<SteadyPoint> steadyStates, List<Curve> trajectories,
                          Map<String, Double> heldStates) {
        this(xState, yState, xRange, yRange, xNullcline, yNullcline, steadyStates, trajectories, heldStates, null);
    }

    /** The same plane with {@code text} as its note. */
    public PhasePlaneFile withNote(String text) {
        return new PhasePlaneFile(xState, yState, xRange, yRange, xNullcline, yNullcline, steadyStates, trajectories,
                heldStates, text);
    }

    /** Validates and copies. */
    public PhasePlaneFile {
        xRange = FileArrays.copy(xRange, "xRange");
        yRange = FileArrays.copy(yRange, "yRange");
        if (xRange.length != 2 || yRange.length != 2) {
            throw new IllegalArgumentException("xRange and yRange must be [min, max]");
        }
        if (xNullcline == null || yNullcline == null) {
            throw new IllegalArgumentException("'xNullcline' and 'yNullcline' are required");
        }
        steadyStates = steadyStates == null ? List.of() : List.copyOf(steadyStates);
        trajectories = trajectories == null ? List.of() : List.copyOf(trajectories);
        heldStates = heldStates == null ? Map.of()
                : java.util.Collections.unmodifiableMap(new java.util.LinkedHashMap<>(heldStates));
    }

    @Override
    public double[] xRange() {
        return xRange.clone();
    }

    @Override
    public double[] yRange() {
        return yRange.clone();
    }

    /**
     * A curve in the plane.
     *
     * @param x x values
     * @param y y values, same length
     */
    public record Curve(double[] x, double[] y) {
        /** Validates and copies. */
        public Curve {
            x = FileArrays.copy(x, "x");
            y = FileArrays.copy(y, "y");
            FileArrays.sameLength(x.length, y, "y");
        }

        @Override
        public double[] x() {
            return x.clone();
        }

        @Override
        public double[] y() {
            return y.clone();
        }
    }

    /**
     * A steady state.
     *
     * @param x      x state value
     * @param y      y state value
     * @param stable whether both eigenvalues of the 2x2 Jacobian have negative real part
     */
    public record SteadyPoint(double x, double y, boolean stable) {
    }
}
