package org.switchfit.report;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Locale;

/**
 * Ready-made panels for the figure kinds of our reports, built from plain arrays so that they do not depend on the
 * result types of the fitting, profiling and continuation packages. Each method returns a {@link Plot} (or series)
 * that callers may extend with further series before adding it to a {@link Figure}. Stateless.
 */
public final class Charts {
    private Charts() {
    }

    /**
     * A multistart "waterfall": final objective values sorted ascending against their rank, with a horizontal line
     * at {@code best + delta}. Non-finite values (failed starts) are left out and counted in the title.
     *
     * @param finalNll final negative log-likelihood of each start (any order; NaN for failed starts)
     * @param delta    offset of the reference line above the best value, e.g. chi2_1(0.95) / 2 for an NLL; NaN for
     *                 none
     * @return the panel
     */
    public static Plot waterfall(double[] finalNll, double delta) {
        double[] ok = Arrays.stream(finalNll).filter(Double::isFinite).sorted().toArray();
        int failed = finalNll.length - ok.length;
        double[] rank = new double[ok.length];
        for (int i = 0; i < rank.length; i++) {
            rank[i] = i + 1;
        }
        String title = String.format(Locale.ROOT, "Multistart: %d starts%s", finalNll.length,
                failed == 0 ? "" : String.format(Locale.ROOT, ", %d failed (not shown)", failed));
        Plot p = new Plot(title, Axis.linear("start, sorted by final value"), Axis.linear("final NLL"));
        p.add(Series.line("final NLL", rank, ok).marker(Series.Marker.CIRCLE).width(1.2));
        if (ok.length > 0 && Double.isFinite(delta)) {
            p.add(Series.horizontal(String.format(Locale.ROOT, "best + %.3g", delta), ok[0] + delta)
                    .color(Palette.VERMILLION));
        }
        return p;
    }

    /**
     * A profile-likelihood panel: the profile curve, the threshold as a horizontal line and the estimate as a
     * vertical line. NaN profile values (failed points) break the curve.
     *
     * @param name      parameter (or prediction) name, used as title and x label
     * @param values    parameter values along the profile, ascending
     * @param profile   profile value at each point, e.g. the increase of -2 log L over the optimum
     * @param threshold threshold, e.g. chi2_1(0.95) for a 95 % pointwise interval; NaN for none
     * @param estimate  the estimate; NaN for none
     * @param log10     whether the parameter axis is logarithmic
     * @return the panel
     */
    public static Plot profile(String name, double[] values, double[] profile, double threshold, double estimate,
                               boolean log10) {
        Plot p = new Plot(name, log10 ? Axis.log10(name) : Axis.linear(name),
                Axis.linear("\u0394(\u22122 log L)"));
        p.add(Series.line("profile", values, profile).marker(Series.Marker.CIRCLE).width(1.5));
        if (Double.isFinite(threshold)) {
            p.add(Series.horizontal(String.format(Locale.ROOT, "threshold %.3g", threshold), threshold)
                    .color(Palette.VERMILLION));
        }
        if (Double.isFinite(estimate)) {
            p.add(Series.vertical("estimate", estimate).dash(Series.Dash.DOTTED));
        }
        return p.legend(Plot.Legend.NONE);
    }

    /**
     * One continuation branch split into stable (solid) and unstable (dashed) pieces. Each run of equal stability
     * is drawn up to and including the first point of the next run, so the curve has no gaps; only the first
     * stable and the first unstable piece carry a legend label ({@code label + " (stable)"} / {@code "(unstable)"}).
     *
     * @param label  branch label for the legend, or null for none
     * @param p      continuation parameter at each point
     * @param x      plotted state (or output) at each point
     * @param stable stability at each point
     * @param color  colour "#rrggbb", or null for the next palette colour (pass one explicitly so that all pieces
     *               share it)
     * @return the pieces in order
     */
    public static List<Series> branch(String label, double[] p, double[] x, boolean[] stable, String color) {
        if (p.length != x.length || p.length != stable.length) {
            throw new IllegalArgumentException("branch arrays differ in length: " + p.length + ", " + x.length
                    + ", " + stable.length);
        }
        List<Series> out = new ArrayList<>();
        boolean labelledStable = false;
        boolean labelledUnstable = false;
        int start = 0;
        while (start < p.length) {
            int end = start;
            while (end + 1 < p.length && stable[end + 1] == stable[start]) {
                end++;
            }
            int last = Math.min(end + 1, p.length - 1);
            if (last > start) {
                boolean s = stable[start];
                String l = null;
                if (label != null && s && !labelledStable) {
                    l = label + " (stable)";
                    labelledStable = true;
                } else if (label != null && !s && !labelledUnstable) {
                    l = label + " (unstable)";
                    labelledUnstable = true;
                }
                Series.Line line = Series.line(l, Arrays.copyOfRange(p, start, last + 1),
                        Arrays.copyOfRange(x, start, last + 1)).color(color);
                out.add(s ? line : line.dashed());
            }
            start = end + 1;
        }
        return out;
    }

    /**
     * Fold points with horizontal interval bars in the parameter (e.g. profile-likelihood intervals of the fold
     * position).
     *
     * @param label legend label
     * @param p     fold parameter values
     * @param x     state at each fold
     * @param pLow  lower interval ends (NaN: no bar)
     * @param pHigh upper interval ends (NaN: no bar)
     * @return diamond markers with bars
     */
    public static Series.Points folds(String label, double[] p, double[] x, double[] pLow, double[] pHigh) {
        return Series.points(label, p, x).xErrors(pLow, pHigh).marker(Series.Marker.DIAMOND).size(10)
                .color(Palette.VERMILLION);
    }

    /**
     * Measured switching thresholds with horizontal sigma bars.
     *
     * @param label legend label
     * @param p     measured threshold (parameter value)
     * @param x     where to draw it on the state axis (e.g. the state at the matching fold)
     * @param sigma standard deviation of each threshold
     * @return square markers with bars
     */
    public static Series.Points thresholds(String label, double[] p, double[] x, double[] sigma) {
        return Series.points(label, p, x).xSigma(sigma).marker(Series.Marker.SQUARE).color(Palette.GREEN);
    }

    /**
     * Data against a fitted trajectory: an optional prediction band, the fitted curve and the measurements with
     * optional 1-sigma bars, all in one colour except the data (black).
     *
     * @param title  panel title
     * @param tLabel time axis label (with unit)
     * @param yLabel observable axis label (with unit)
     * @param t      times of the fitted curve
     * @param y      fitted curve
     * @param lower  lower band edge at each t, or null for no band
     * @param upper  upper band edge at each t, or null for no band
     * @param tData  measurement times
     * @param yData  measurements (NaN: missing)
     * @param sigma  measurement standard deviations, or null for no bars
     * @param color  colour of curve and band "#rrggbb"
     * @return the panel
     */
    public static Plot timecourse(String title, String tLabel, String yLabel, double[] t, double[] y,
                                  double[] lower, double[] upper, double[] tData, double[] yData, double[] sigma,
                                  String color) {
        Plot p = new Plot(title, Axis.linear(tLabel), Axis.linear(yLabel));
        if (lower != null && upper != null) {
            p.add(Series.band("prediction band", t, lower, upper).color(color));
        }
        p.add(Series.line("fit", t, y).color(color));
        Series.Points d = Series.points("data", tData, yData).color(Palette.BLACK).size(6);
        p.add(sigma == null ? d : d.ySigma(sigma));
        return p;
    }

    /**
     * A hysteresis sweep: the response after each step of an upward and a downward parameter sweep, with
     * triangle and circle markers so the two directions stay apart in grey-scale print.
     *
     * @param pUp   parameter values of the upward sweep, in sweep order
     * @param xUp   response at each upward step
     * @param pDown parameter values of the downward sweep, in sweep order
     * @param xDown response at each downward step
     * @param pLabel parameter axis label
     * @param xLabel response axis label
     * @return the panel
     */
    public static Plot hysteresis(double[] pUp, double[] xUp, double[] pDown, double[] xDown, String pLabel,
                                  String xLabel) {
        Plot p = new Plot("Hysteresis sweep", Axis.linear(pLabel), Axis.linear(xLabel));
        p.add(Series.line("up sweep", pUp, xUp).marker(Series.Marker.TRIANGLE).width(1.2).color(Palette.BLUE));
        p.add(Series.line("down sweep", pDown, xDown).marker(Series.Marker.CIRCLE).width(1.2).dashed()
                .color(Palette.VERMILLION));
        return p;
    }
}
