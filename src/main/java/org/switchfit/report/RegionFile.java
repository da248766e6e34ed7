package org.switchfit.report;

import java.util.List;

/**
 * Content of {@code region.json}, written by {@code switchfit region}: fold curves of the fitted model in the
 * plane of two control parameters, their cusp points and the region of bistability between them. Immutable.
 *
 * @param parameter1 id of the first control parameter (x axis)
 * @param parameter2 id of the second control parameter (y axis)
 * @param range1     {@code [min, max]} of parameter1 that was traced
 * @param range2     {@code [min, max]} of parameter2 that was traced
 * @param curves     fold curves
 * @param cusps      cusp points
 * @param bistable   polygon of the bistable region (empty arrays when none was found)
 * @param closedByChord whether the polygon had to be closed by a straight chord at the edge of the traced range
 * @param fitted     the fitted (parameter1, parameter2) point, or null
 */
public record RegionFile(String parameter1, String parameter2, double[] range1, double[] range2, List<Curve> curves,
                         List<Cusp> cusps, Curve bistable, boolean closedByChord, Cusp fitted) {

    /** Validates and copies. */
    public RegionFile {
        range1 = FileArrays.copy(range1, "range1");
        range2 = FileArrays.copy(range2, "range2");
        if (range1.length != 2 || range2.length != 2) {
            throw new IllegalArgumentException("range1 and range2 must be [min, max]");
        }
        curves = curves == null ? List.of() : List.copyOf(curves);
        cusps = cusps == null ? List.of() : List.copyOf(cusps);
        if (bistable == null) {
            bistable = new Curve(new double[0], new double[0]);
        }
    }

    @Override
    public double[] range1() {
        return range1.clone();
    }

    @Override
    public double[] range2() {
        return range2.clone();
    }

    /**
     * A polyline or polygon in the parameter plane.
     *
     * @param p1 parameter1 values
     * @param p2 parameter2 values, same length
     */
    public record Curve(double[] p1, double[] p2) {
        /** Validates and copies. */
        public Curve {
            p1 = FileArrays.copy(p1, "p1");
            p2 = FileArrays.copy(p2, "p2");
            FileArrays.sameLength(p1.length, p2, "p2");
        }

        @Override
        public double[] p1() {
            return p1.clone();
        }

        @Override
        public double[] p2() {
            return p2.clone();
        }
    }

    /**
     * A point in the parameter plane.
     *
     * @param p1 parameter1 value
     * @param p2 parameter2 value
     */
    public record Cusp(double p1, double p2) {
    }
}
