package org.switchfit.report;

import java.util.List;

/**
 * Content of {@code trajectories.json}, written at the end of {@code switchfit fit} (fitted curves) and extended
 * by {@code switchfit profile} (prediction bands): for each experiment and observable, the fitted observable on a
 * fine time grid and the measured data with their standard deviations. Immutable.
 *
 * @param bandLevel confidence level of the prediction bands, or null when there are none
 * @param experiments one entry per simulated experiment
 */
public record TrajectoriesFile(Double bandLevel, List<Experiment> experiments) {

    /** Copies the list. */
    public TrajectoriesFile {
        experiments = experiments == null ? List.of() : List.copyOf(experiments);
    }

    /**
     * One experiment.
     *
     * @param id          experiment id
     * @param observables its observables with data
     */
    public record Experiment(String id, List<Observable> observables) {
        /** Copies the list. */
        public Experiment {
            observables = observables == null ? List.of() : List.copyOf(observables);
        }
    }

    /**
     * One observable in one experiment.
     *
     * @param id        observable id
     * @param time      fine time grid, ascending
     * @param fitted    fitted observable at each grid time (untransformed)
     * @param lower     lower prediction band edge at each grid time, or null
     * @param upper     upper prediction band edge at each grid time, or null
     * @param dataTime  measurement times
     * @param dataValue measured values (untransformed)
     * @param dataSigma standard deviation of each measurement on the untransformed scale (NaN when unknown)
     */
    public record Observable(String id, double[] time, double[] fitted, double[] lower, double[] upper,
                             double[] dataTime, double[] dataValue, double[] dataSigma) {
        /** Validates and copies. */
        public Observable {
            time = FileArrays.copy(time, "time");
            fitted = FileArrays.copy(fitted, "fitted");
            FileArrays.sameLength(time.length, fitted, "fitted");
            lower = FileArrays.copyOrNull(lower);
            upper = FileArrays.copyOrNull(upper);
            FileArrays.sameLength(time.length, lower, "lower");
            FileArrays.sameLength(time.length, upper, "upper");
            if ((lower == null) != (upper == null)) {
                throw new IllegalArgumentException("'lower' and 'upper' must be given together");
            }
            dataTime = FileArrays.copy(dataTime, "dataTime");
            dataValue = FileArrays.copy(dataValue, "dataValue");
            dataSigma = FileArrays.copy(dataSigma, "dataSigma");
            FileArrays.sameLength(dataTime.length, dataValue, "dataValue");
            FileArrays.sameLength(dataTime.length, dataSigma, "dataSigma");
        }

        @Override
        public double[] time() {
            return time.clone();
        }

        @Override
        public double[] fitted() {
            return fitted.clone();
        }

        @Override
        public double[] lower() {
            return lower == null ? null : lower.clone();
        }

        @Override
        public double[] upper() {
            return upper == null ? null : upper.clone();
        }

        @Override
        public double[] dataTime() {
            return dataTime.clone();
        }

        @Override
        public double[] dataValue() {
            return dataValue.clone();
        }

        @Override
        public double[] dataSigma() {
            return dataSigma.clone();
        }

        /** Whether a prediction band is present. */
        public boolean hasBand() {
            return lower != null;
        }
    }
}
