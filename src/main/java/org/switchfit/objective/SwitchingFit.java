package org.switchfit.objective;

import org.switchfit.data.ParameterScale;

/**
 * One switching-threshold or steady-state dose-response datum with the model's value at the evaluated θ, from
 * {@link LikelihoodObjective#evaluateDetailed}.
 *
 * @param data        which kind of datum
 * @param experiment  experiment id
 * @param control     id of the control parameter
 * @param direction   {@code up} / {@code down} (threshold: sweep direction) or {@code low} / {@code high}
 *                    (dose response: the state the steady state was approached from)
 * @param observable  observable id (dose response), or null (threshold)
 * @param dose        control value of a dose-response point, NaN for a threshold
 * @param measurement the measured value
 * @param model       the model's value: the threshold λ*(θ), or the observable at the steady state
 * @param sigma       noise spread, on the observable's transformed scale for a dose-response point
 * @param scale       the observable's transformation (LIN for a threshold)
 * @param note        threshold: {@code fold}, {@code steepest_response} (monostable model) or {@code range_end}
 *                    (monostable, steepest at an end of the swept range); null for a dose-response point
 */
public record SwitchingFit(Data data, String experiment, String control, String direction, String observable,
                           double dose, double measurement, double model, double sigma, ParameterScale scale,
                           String note) {

    /** Kind of datum. */
    public enum Data {
        /** a measured switching threshold */
        THRESHOLD,
        /** a steady-state dose-response point */
        DOSE_RESPONSE;

        /** Lower-case label for tables. */
        public String label() {
            return name().toLowerCase(java.util.Locale.ROOT);
        }
    }

    /**
     * The standardised difference {@code (m' - y') / σ} on the observable's scale (' = transformed), the sign
     * convention of the timecourse residuals: positive when the measurement lies above the model.
     */
    public double residual() {
        return standardised(scale, measurement, model, sigma);
    }

    /** {@code (m' - y') / σ} with ' the transformation {@code scale} (also used for the timecourse residuals). */
    public static double standardised(ParameterScale scale, double measurement, double model, double sigma) {
        return switch (scale) {
            case LOG -> (Math.log(measurement) - Math.log(model)) / sigma;
            case LOG10 -> (Math.log10(measurement) - Math.log10(model)) / sigma;
            default -> (measurement - model) / sigma;
        };
    }

    /** Column names of {@link #values()}, the layout of switching_residuals.csv and of check's JSON rows. */
    public static final java.util.List<String> COLUMNS = java.util.List.of("data", "experiment", "control",
            "direction", "observable", "dose", "measurement", "model", "sigma", "residual", "note");

    /** The row's values in {@link #COLUMNS} order (null for what does not apply: observable, dose, note). */
    public java.util.List<Object> values() {
        return java.util.Arrays.asList(data.label(), experiment, control, direction, observable,
                Double.isNaN(dose) ? null : dose, measurement, model, sigma, residual(), note);
    }
}
