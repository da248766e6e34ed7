package org.switchfit.data;

import java.nio.file.Path;
import java.util.List;
import java.util.Optional;

/**
 * Everything a switchfit problem file declares, parsed and validated but not yet tied to a model.
 * See {@code docs/problem-format.md}. Immutable; lists keep file order.
 *
 * @param problemFile   the YAML file read (paths below are resolved against its folder)
 * @param formatVersion format version declared in the file
 * @param modelFile     the SBML model
 * @param parameters    parameters to estimate; every other model parameter keeps its model value
 * @param experiments   experiments
 * @param observables   observables with their noise models
 * @param timecourses   timecourse data points, all files concatenated
 * @param doseResponses steady-state dose-response points
 * @param thresholds    switching thresholds
 * @param dataFiles     the data files referenced, in file order
 */
public record SwitchfitProblem(Path problemFile, int formatVersion, Path modelFile,
        List<EstimatedParameter> parameters, List<Experiment> experiments, List<Observable> observables,
        List<TimecoursePoint> timecourses, List<DoseResponsePoint> doseResponses, List<SwitchingThreshold> thresholds,
        List<DataFile> dataFiles) {

    /** Copies the lists. */
    public SwitchfitProblem {
        parameters = List.copyOf(parameters);
        experiments = List.copyOf(experiments);
        observables = List.copyOf(observables);
        timecourses = List.copyOf(timecourses);
        doseResponses = List.copyOf(doseResponses);
        thresholds = List.copyOf(thresholds);
        dataFiles = List.copyOf(dataFiles);
    }

    /** A data file referenced by the problem. */
    public record DataFile(Kind kind, Path file, String control) {
        /** What a data file holds. */
        public enum Kind {
            /** Timecourse table. */
            TIMECOURSE,
            /** Dose-response table; {@code control} names the dosed parameter. */
            DOSE_RESPONSE,
            /** Switching-threshold table. */
            THRESHOLD
        }
    }

    /** The experiment with that id, if declared. */
    public Optional<Experiment> experiment(String id) {
        return experiments.stream().filter(e -> e.id().equals(id)).findFirst();
    }

    /** The observable with that id, if declared. */
    public Optional<Observable> observable(String id) {
        return observables.stream().filter(o -> o.id().equals(id)).findFirst();
    }

    /** The estimated parameter with that id, if declared. */
    public Optional<EstimatedParameter> parameter(String id) {
        return parameters.stream().filter(p -> p.id().equals(id)).findFirst();
    }
}
