package org.switchfit.report;

import java.util.List;

/**
 * One JSON file of a fit directory: its name, record type and the command that writes it. The constants are the
 * complete list; {@link FitDirectory} reads and writes them. Immutable.
 *
 * @param <T> the record type of the file content
 */
public final class FitFile<T> {
    /** {@code result.json}: the multistart fit. */
    public static final FitFile<FitSummary> RESULT =
            new FitFile<>("result.json", FitSummary.class, "switchfit fit");
    /** {@code trajectories.json}: fitted observables on a fine grid with the data. */
    public static final FitFile<TrajectoriesFile> TRAJECTORIES =
            new FitFile<>("trajectories.json", TrajectoriesFile.class, "switchfit fit");
    /** {@code profiles.json}: profile likelihoods. */
    public static final FitFile<ProfilesFile> PROFILES =
            new FitFile<>("profiles.json", ProfilesFile.class, "switchfit profile");
    /** {@code branches.json}: one-parameter continuation. */
    public static final FitFile<BranchesFile> BRANCHES =
            new FitFile<>("branches.json", BranchesFile.class, "switchfit branches");
    /** {@code region.json}: two-parameter fold curves and bistable region. */
    public static final FitFile<RegionFile> REGION =
            new FitFile<>("region.json", RegionFile.class, "switchfit region");
    /** {@code sweep.json}: hysteresis ramps. */
    public static final FitFile<SweepFile> SWEEP =
            new FitFile<>("sweep.json", SweepFile.class, "switchfit sweep");
    /** {@code phaseplane.json}: nullclines and trajectories of two states. */
    public static final FitFile<PhasePlaneFile> PHASE_PLANE =
            new FitFile<>("phaseplane.json", PhasePlaneFile.class, "switchfit demo");

    /** All files, in report order. */
    public static final List<FitFile<?>> ALL = List.of(RESULT, TRAJECTORIES, PROFILES, BRANCHES, REGION, SWEEP,
            PHASE_PLANE);

    private final String fileName;
    private final Class<T> type;
    private final String producer;

    private FitFile(String fileName, Class<T> type, String producer) {
        this.fileName = fileName;
        this.type = type;
        this.producer = producer;
    }

    /** File name inside the fit directory. */
    public String fileName() {
        return fileName;
    }

    /** Record type of the content. */
    public Class<T> type() {
        return type;
    }

    /** The command that writes the file, e.g. {@code switchfit profile}. */
    public String producer() {
        return producer;
    }

    @Override
    public String toString() {
        return fileName;
    }
}
