package org.switchfit.data;

import java.nio.file.Path;
import java.util.List;
import java.util.Optional;

/**
 * A PEtab v1 problem as read from its YAML file and tables (Schmiester et al. 2021, PLoS Comput Biol
 * 17(1):e1008646, doi:10.1371/journal.pcbi.1008646). Entries of several {@code problems} items are concatenated.
 * Immutable.
 *
 * @param yamlFile           the problem YAML file
 * @param formatVersion      format_version (1)
 * @param parameters         rows of the parameter table(s)
 * @param sbmlFiles          SBML model files, resolved against the YAML folder
 * @param conditions         rows of the condition tables
 * @param measurements       rows of the measurement tables
 * @param observables        rows of the observable tables
 * @param visualizationFiles visualization tables (not read; paths only)
 * @param notes              things this reader ignored, such as unknown YAML keys, one line each
 */
public record PetabProblem(Path yamlFile, int formatVersion, List<PetabParameter> parameters,
        List<Path> sbmlFiles, List<PetabCondition> conditions, List<PetabMeasurement> measurements,
        List<PetabObservable> observables, List<Path> visualizationFiles, List<String> notes) {

    /** Copies the lists. */
    public PetabProblem {
        parameters = List.copyOf(parameters);
        sbmlFiles = List.copyOf(sbmlFiles);
        conditions = List.copyOf(conditions);
        measurements = List.copyOf(measurements);
        observables = List.copyOf(observables);
        visualizationFiles = List.copyOf(visualizationFiles);
        notes = List.copyOf(notes);
    }

    /** The condition with that id, if any. */
    public Optional<PetabCondition> condition(String id) {
        return conditions.stream().filter(c -> c.id().equals(id)).findFirst();
    }

    /** The observable with that id, if any. */
    public Optional<PetabObservable> observable(String id) {
        return observables.stream().filter(o -> o.id().equals(id)).findFirst();
    }

    /** The parameter-table row with that id, if any. */
    public Optional<PetabParameter> parameter(String id) {
        return parameters.stream().filter(p -> p.id().equals(id)).findFirst();
    }

    /** Parameters with estimate = 1, in table order. */
    public List<PetabParameter> estimatedParameters() {
        return parameters.stream().filter(PetabParameter::estimate).toList();
    }
}
