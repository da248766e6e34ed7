package org.switchfit.data;

import java.util.ArrayList;
import java.util.List;
import java.util.Set;
import org.switchfit.util.SourceLocation;

/**
 * Turns switchfit data tables into data points, checking numbers and that experiments and observables are
 * declared. Column names are those of {@code docs/problem-format.md}. Immutable, thread-safe.
 */
final class DataTableReader {

    static final List<String> TIMECOURSE_COLUMNS = List.of("experiment", "observable", "time", "value", "sigma");
    static final List<String> DOSE_COLUMNS = List.of("experiment", "observable", "dose", "value", "sigma", "history");
    static final List<String> THRESHOLD_COLUMNS = List.of("experiment", "control", "direction", "value", "sigma");

    private final Set<String> experiments;
    private final Set<String> observables;

    DataTableReader(Set<String> experiments, Set<String> observables) {
        this.experiments = Set.copyOf(experiments);
        this.observables = Set.copyOf(observables);
    }

    List<TimecoursePoint> timecourses(TextTable t) {
        t.requireColumns("timecourse table", "experiment", "observable", "time", "value");
        checkColumns(t, TIMECOURSE_COLUMNS);
        List<TimecoursePoint> out = new ArrayList<>();
        for (TextTable.Row r : t.rows()) {
            String exp = experiment(r);
            String obs = observable(r);
            double time = r.number("time");
            if (!Double.isFinite(time)) {
                throw Messages.error(r.location("time"), "time %s is not finite; timecourse times must be"
                        + " finite (put steady-state data in a dose-response table)", r.text("time"));
            }
            if (time < 0) {
                throw Messages.error(r.location("time"), "time %s is negative; experiments start at t = 0 (a"
                        + " settle_in experiment runs before that), so shift the times to start at 0",
                        r.text("time"));
            }
            double value = value(r);
            double sigma = sigma(r);
            out.add(new TimecoursePoint(exp, obs, time, value, sigma, r.location()));
        }
        return out;
    }

    List<DoseResponsePoint> doseResponses(TextTable t, String control) {
        t.requireColumns("dose-response table", "experiment", "observable", "dose", "value", "history");
        checkColumns(t, DOSE_COLUMNS);
        List<DoseResponsePoint> out = new ArrayList<>();
        for (TextTable.Row r : t.rows()) {
            String exp = experiment(r);
            String obs = observable(r);
            double dose = r.number("dose");
            if (!Double.isFinite(dose)) {
                throw Messages.error(r.location("dose"), "dose %s of '%s' is not finite; give a finite value",
                        r.text("dose"), control);
            }
            double value = value(r);
            double sigma = sigma(r);
            String h = ProblemFileReader.keyword(r.requireText("history"));
            DoseResponsePoint.History history;
            if ("low".equals(h)) {
                history = DoseResponsePoint.History.LOW;
            } else if ("high".equals(h)) {
                history = DoseResponsePoint.History.HIGH;
            } else {
                throw Messages.error(r.location("history"), "column 'history': '%s' is unknown; use low"
                        + " (steady state approached from the off state) or high (from the on state)",
                        r.text("history"));
            }
            out.add(new DoseResponsePoint(exp, obs, control, dose, value, sigma, history, r.location()));
        }
        return out;
    }

    List<SwitchingThreshold> thresholds(TextTable t) {
        t.requireColumns("threshold table", THRESHOLD_COLUMNS.toArray(new String[0]));
        checkColumns(t, THRESHOLD_COLUMNS);
        List<SwitchingThreshold> out = new ArrayList<>();
        for (TextTable.Row r : t.rows()) {
            String exp = experiment(r);
            String control = r.requireText("control");
            if (!ValueRef.isId(control)) {
                throw Messages.error(r.location("control"), "column 'control': '%s' is not a valid parameter"
                        + " id; use letters, digits and underscores", control);
            }
            SwitchingThreshold.Direction dir = direction(r.requireText("direction"));
            if (dir == null) {
                throw Messages.error(r.location("direction"), "column 'direction': '%s' is unknown; use up"
                        + " (switch-on while raising the control) or down (switch-off while lowering it)",
                        r.text("direction"));
            }
            double value = r.number("value");
            double sigma = r.number("sigma");
            checkThreshold(value, sigma, r.location());
            out.add(new SwitchingThreshold(exp, control, dir, value, sigma, r.location()));
        }
        return out;
    }

    static SwitchingThreshold.Direction direction(String text) {
        switch (ProblemFileReader.keyword(text)) {
            case "up":
                return SwitchingThreshold.Direction.UP;
            case "down":
                return SwitchingThreshold.Direction.DOWN;
            default:
                return null;
        }
    }

    static void checkThreshold(double value, double sigma, SourceLocation loc) {
        if (!Double.isFinite(value)) {
            throw Messages.error(loc, "threshold value %s is not finite; give the measured control value",
                    DataNumbers.format(value));
        }
        if (!(sigma > 0) || Double.isInfinite(sigma)) {
            throw Messages.error(loc, "threshold sigma %s must be a positive finite number; give the"
                    + " standard deviation of the measured threshold", DataNumbers.format(sigma));
        }
    }

    private static void checkColumns(TextTable t, List<String> known) {
        for (String c : t.columns()) {
            if (!known.contains(c)) {
                throw Messages.error(t.headerLocation(), "unknown column '%s'%s; allowed columns: %s", c,
                        Spelling.didYouMean(c, known), String.join(", ", known));
            }
        }
    }

    private String experiment(TextTable.Row r) {
        String exp = r.requireText("experiment");
        if (!experiments.contains(exp)) {
            throw Messages.error(r.location("experiment"), "experiment '%s' is not declared in the problem"
                    + " file%s; declare it under experiments or correct the name", exp,
                    Spelling.didYouMean(exp, experiments));
        }
        return exp;
    }

    private String observable(TextTable.Row r) {
        String obs = r.requireText("observable");
        if (!observables.contains(obs)) {
            throw Messages.error(r.location("observable"), "observable '%s' is not declared in the problem"
                    + " file%s; declare it under observables or correct the name", obs,
                    Spelling.didYouMean(obs, observables));
        }
        return obs;
    }

    private static double value(TextTable.Row r) {
        double v = r.number("value");
        if (!Double.isFinite(v)) {
            throw Messages.error(r.location("value"), "column 'value': %s is not a finite measurement;"
                    + " remove the row if the value is missing", r.text("value"));
        }
        return v;
    }

    private static double sigma(TextTable.Row r) {
        double s = r.number("sigma", Double.NaN);
        if (!Double.isNaN(s) && !(s > 0 && Double.isFinite(s))) {
            throw Messages.error(r.location("sigma"), "column 'sigma': %s must be a positive finite number;"
                    + " correct it or leave the field empty (or nan) to use the observable's noise model", r.text("sigma"));
        }
        return s;
    }
}
