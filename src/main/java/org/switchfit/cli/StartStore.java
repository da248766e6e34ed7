package org.switchfit.cli;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.function.Supplier;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.FitResult;
import org.switchfit.fit.LocalTaskExecutor;
import org.switchfit.fit.Multistart;
import org.switchfit.fit.StartListener;
import org.switchfit.fit.StartResult;
import org.switchfit.report.ResultStore;
import org.switchfit.util.UserInputException;

/**
 * A multistart run into a folder of finished starts ({@code fit} and {@code bench-fits}): each start is written
 * atomically as it finishes ({@link ResultStore}), and a run over a folder that already holds starts continues
 * from them when resuming is asked for (the same seed gives the same result). Not thread-safe.
 */
final class StartStore {
    private final ResultStore store;
    private final List<StartResult> finished = new ArrayList<>();

    /**
     * Opens the folder and reads the starts already in it.
     *
     * @param dir     the folder of the starts (created when missing)
     * @param resume  whether finished starts may be reused
     * @param refusal the error when the folder holds starts and {@code resume} is false
     * @throws UserInputException from {@code refusal}
     */
    StartStore(Path dir, boolean resume, Supplier<UserInputException> refusal) {
        this(dir, resume, refusal, null);
    }

    /**
     * As {@link #StartStore(Path, boolean, Supplier)}, guarding resumed starts by the run's identity: the SHA-256 of
     * every input file and the settings that change a start's result ({@link RunIdentity}), kept in
     * {@code <dir>-run.json} beside the folder. A resumed run whose inputs or settings differ from those the stored
     * starts were computed with is refused (reusing them would report results of other data under the new files'
     * checksums), as is a folder of starts without that record.
     *
     * @param identity the run's identity, or null for no guard
     */
    StartStore(Path dir, boolean resume, Supplier<UserInputException> refusal, RunIdentity identity) {
        store = new ResultStore(dir);
        boolean stored = !store.keys().isEmpty();
        if (stored && !resume) {
            throw refusal.get();
        }
        if (identity != null) {
            identity.guard(dir, stored);
        }
        if (stored) {
            finished.addAll(store.readAll(StartResult.class).values());
        }
    }

    /**
     * What a stored start depends on: the input files' contents (SHA-256, in the problem's order) and the settings
     * that change a start's path (seed, number of starts, tolerances, optimizer limits; not the thread count, which
     * never changes a result).
     *
     * @param inputs   input files with their SHA-256
     * @param settings the settings, as {@code name=value} entries
     */
    record RunIdentity(List<org.switchfit.report.FitSummary.InputFile> inputs, java.util.Map<String, String> settings) {

        /** The identity of a run on these files with these settings (files hashed now). */
        static RunIdentity of(List<Path> files, java.util.Map<String, String> settings) {
            List<org.switchfit.report.FitSummary.InputFile> in = new ArrayList<>();
            for (Path f : files) {
                in.add(org.switchfit.report.FitSummary.InputFile.of(f));
            }
            return new RunIdentity(List.copyOf(in), new java.util.LinkedHashMap<>(settings));
        }

        /**
         * Guards the results stored in folder {@code dir}: when it holds some ({@code stored}), refuses (one line)
         * unless {@code <dir>-run.json} beside it records this identity; then records this identity there.
         */
        void guard(Path dir, boolean stored) {
            Path record = dir.resolveSibling(dir.getFileName() + "-run.json");
            if (stored) {
                requireSameAs(record, dir);
            }
            org.switchfit.report.Json.write(record, this);
        }

        /** Refuses (one line) unless {@code record} holds this identity (file names may differ, contents not). */
        private void requireSameAs(Path record, Path dir) {
            if (!java.nio.file.Files.isRegularFile(record)) {
                throw new UserInputException(org.switchfit.util.SourceLocation.ofFile(dir.toString()), "holds "
                        + "finished results but no record of the inputs and settings they were computed with ("
                        + record.getFileName() + "), so they cannot be checked against this run; remove the folder "
                        + "or run into another --out folder");
            }
            RunIdentity old = org.switchfit.report.Json.read(record, RunIdentity.class);
            // a run of another problem file first: its settings and inputs differ as a consequence
            String oldProblem = old.inputs().isEmpty() ? null : old.inputs().get(0).file();
            if (!inputs.isEmpty() && oldProblem != null
                    && !inputs.get(0).sha256().equals(old.inputs().get(0).sha256())
                    && !sameFile(oldProblem, inputs.get(0).file())) {
                throw new UserInputException(org.switchfit.util.SourceLocation.ofFile(dir.toString()), "holds "
                        + "results of another problem file, " + oldProblem + ", not " + inputs.get(0).file()
                        + "; run into another --out folder, or remove this one");
            }
            for (java.util.Map.Entry<String, String> e : settings.entrySet()) {
                String was = old.settings().get(e.getKey());
                if (!e.getValue().equals(was)) {
                    throw new UserInputException(org.switchfit.util.SourceLocation.ofFile(dir.toString()),
                            "holds results computed with " + e.getKey() + " = " + was + ", but this run has "
                            + e.getValue() + "; rerun with the same setting, or remove the folder");
                }
            }
            if (old.inputs().size() != inputs.size()) {
                throw new UserInputException(org.switchfit.util.SourceLocation.ofFile(dir.toString()), "holds "
                        + "results computed from " + old.inputs().size() + " input files, this run reads "
                        + inputs.size() + "; remove the folder or run into another --out folder");
            }
            for (int i = 0; i < inputs.size(); i++) {
                if (!inputs.get(i).sha256().equals(old.inputs().get(i).sha256())) {
                    throw new UserInputException(org.switchfit.util.SourceLocation.ofFile(inputs.get(i).file()),
                            "changed since the stored results in " + dir + " were computed (SHA-256 differs), so "
                            + "they cannot be resumed; remove that folder or restore the file");
                }
            }
        }
    }

    /**
     * Whether two recorded paths name the same file: equal absolute paths, or, when one was recorded relative
     * (older records), equal file names.
     */
    static boolean sameFile(String a, String b) {
        Path pa = Path.of(a);
        Path pb = Path.of(b);
        if (pa.isAbsolute() && pb.isAbsolute()) {
            return pa.normalize().equals(pb.normalize());
        }
        return java.util.Objects.equals(pa.getFileName(), pb.getFileName());
    }

    /** The starts found when the folder was opened (unmodifiable). */
    List<StartResult> finished() {
        return List.copyOf(finished);
    }

    /**
     * Runs the remaining starts on {@code threads} worker threads, writing each finished start to the folder
     * before telling {@code listener}.
     *
     * @param guess    start 0, or null for sampled starts only
     * @param listener told about each newly finished start after it is stored, or null
     */
    FitResult run(Multistart multistart, FitProblem problem, double[] guess, int threads, StartListener listener) {
        return multistart.run(problem, guess, LocalTaskExecutor.ofThreads(threads), r -> {
            store.put(ResultStore.indexKey("start", r.index()), r);
            if (listener != null) {
                listener.startFinished(r);
            }
        }, finished);
    }
}
