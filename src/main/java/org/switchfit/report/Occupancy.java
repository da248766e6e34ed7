package org.switchfit.report;

/**
 * A coarse raster of the plot area recording where something has been drawn, used to put the legend in the corner
 * that hides the least. Cells are {@link #CELL} px squares; lines mark the cells they pass through, fills mark the
 * cells whose centre lies inside (even-odd rule). Not thread-safe; one per panel.
 */
final class Occupancy {
    static final double CELL = 6;

    private final double x0;
    private final double y0;
    private final int nx;
    private final int ny;
    private final byte[] cells;
    private int weight = 1;

    Occupancy(double x0, double y0, double width, double height) {
        this.x0 = x0;
        this.y0 = y0;
        this.nx = Math.max(1, (int) Math.ceil(width / CELL));
        this.ny = Math.max(1, (int) Math.ceil(height / CELL));
        this.cells = new byte[nx * ny];
    }

    /**
     * Sets the weight (1..100) given to cells marked from now on: how bad it is to hide them. Lines and fills use 1;
     * markers, error bars and text use more, because hiding a data point loses more than hiding part of a curve.
     */
    void weight(int w) {
        this.weight = w;
    }

    void point(double x, double y) {
        if (Double.isNaN(x) || Double.isNaN(y)) {
            return;
        }
        int i = (int) Math.floor((x - x0) / CELL);
        int j = (int) Math.floor((y - y0) / CELL);
        if (i >= 0 && i < nx && j >= 0 && j < ny && cells[j * nx + i] < weight) {
            cells[j * nx + i] = (byte) weight;
        }
    }

    void segment(double xa, double ya, double xb, double yb) {
        if (Double.isNaN(xa) || Double.isNaN(ya) || Double.isNaN(xb) || Double.isNaN(yb)) {
            return;
        }
        double len = Math.hypot(xb - xa, yb - ya);
        // Segments far outside the plot are clipped anyway; cap the sampling work.
        int steps = (int) Math.min(4000, Math.ceil(len / (CELL / 2)));
        for (int k = 0; k <= steps; k++) {
            double t = steps == 0 ? 0 : (double) k / steps;
            point(xa + t * (xb - xa), ya + t * (yb - ya));
        }
    }

    /** Marks cells whose centre is inside the rings given as pixel vertex lists (even-odd over all rings). */
    void fill(double[][] ringsX, double[][] ringsY) {
        for (int j = 0; j < ny; j++) {
            double cy = y0 + (j + 0.5) * CELL;
            for (int i = 0; i < nx; i++) {
                double cx = x0 + (i + 0.5) * CELL;
                boolean inside = false;
                for (int r = 0; r < ringsX.length; r++) {
                    inside ^= insideRing(ringsX[r], ringsY[r], cx, cy);
                }
                if (inside && cells[j * nx + i] < weight) {
                    cells[j * nx + i] = (byte) weight;
                }
            }
        }
    }

    /** Crossing-number point-in-polygon test (closed ring). */
    static boolean insideRing(double[] xs, double[] ys, double x, double y) {
        boolean in = false;
        int n = xs.length;
        for (int a = 0, b = n - 1; a < n; b = a++) {
            if ((ys[a] > y) != (ys[b] > y) && x < (xs[b] - xs[a]) * (y - ys[a]) / (ys[b] - ys[a]) + xs[a]) {
                in = !in;
            }
        }
        return in;
    }

    /** Total weight of the marked cells overlapping the rectangle [x, x + w] x [y, y + h]. */
    int count(double x, double y, double w, double h) {
        int i0 = Math.max(0, (int) Math.floor((x - x0) / CELL));
        int i1 = Math.min(nx - 1, (int) Math.floor((x + w - x0) / CELL));
        int j0 = Math.max(0, (int) Math.floor((y - y0) / CELL));
        int j1 = Math.min(ny - 1, (int) Math.floor((y + h - y0) / CELL));
        int c = 0;
        for (int j = j0; j <= j1; j++) {
            for (int i = i0; i <= i1; i++) {
                c += cells[j * nx + i];
            }
        }
        return c;
    }
}
