package org.switchfit.problem;

import java.util.List;
import org.switchfit.util.SourceLocation;

/**
 * One measured value joined to the model. Immutable.
 *
 * @param observable      index into {@link EstimationProblem#observables()}
 * @param experiment      index into {@link EstimationProblem#experiments()}
 * @param time            time, {@code +inf} for a steady-state measurement
 * @param value           measured value (untransformed)
 * @param obsParameters   values of the observable's observableParameter placeholders, in order
 * @param noiseParameters values of the noise formula's noiseParameter placeholders, in order
 * @param fixedSigma      a known spread given with the data point that replaces the noise formula, or NaN
 * @param location        file and row
 */
public record Measurement(int observable, int experiment, double time, double value,
                          List<ValueSource> obsParameters, List<ValueSource> noiseParameters, double fixedSigma,
                          SourceLocation location) {

    public Measurement {
        obsParameters = List.copyOf(obsParameters);
        noiseParameters = List.copyOf(noiseParameters);
    }
}
