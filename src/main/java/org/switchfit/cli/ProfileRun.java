package org.switchfit.cli;

import java.nio.charset.StandardCharsets;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.concurrent.Callable;
import java.util.function.Consumer;
import java.util.zip.CRC32;
import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LocalTaskExecutor;
import org.switchfit.objective.Prediction;
import org.switchfit.profile.Compensation;
import org.switchfit.profile.ConfidenceInterval;
import org.switchfit.profile.Identifiability;
import org.switchfit.profile.Profile;
import org.switchfit.profile.ProfileLikelihood;
import org.switchfit.profile.ProfilePoint;
import org.switchfit.report.Csv;
import org.switchfit.report.ProfilesFile;
import org.switchfit.report.ResultStore;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Runs a list of profile tasks (parameters, fold positions, predictions) in parallel, one task per profile, storing
 * each finished profile atomically in a {@link ResultStore} so an interrupted run resumes, and converts profiles to
 * the {@link ProfilesFile} entries (linear scale). Results do not depend on the thread count: each profile is a pure
 * function of the problem, the optimum and its target.
 */
final class ProfileRun {

    /** One profiled quantity. */
    record Task(ProfilesFile.Kind kind, String id, int parameterIndex, Prediction prediction) {

        /** Result-store key: kind, sanitised id and a checksum of the id (ids may hold any character). */
        String key() {
            String clean = id.replaceAll("[^A-Za-z0-9._-]", "_");
            if (clean.length() > 80) {
                clean = clean.substring(0, 80);
            }
            CRC32 crc = new CRC32();
            crc.update(id.getBytes(StandardCharsets.UTF_8));
            return String.format(Locale.ROOT, "%s-%s-%08x", kind.token(), clean, crc.getValue());
        }
    }

    private final FitProblem problem;
    private final double[] optimum;
    private final ProfileLikelihood likelihood;

    ProfileRun(FitProblem problem, double[] optimum, ProfileLikelihood likelihood) {
        this.problem = problem;
        this.optimum = optimum.clone();
        this.likelihood = likelihood;
    }

    /**
     * Runs the tasks not yet in {@code store} on {@code threads} threads and returns all stored results in task
     * order.
     *
     * @param onFinished told about each newly finished result (serialised), may be null
     * @throws UserInputException when the store holds results of another confidence level
     */
    List<ProfilesFile.Stored> run(List<Task> tasks, ResultStore store, int threads,
                                  Consumer<ProfilesFile.Stored> onFinished) {
        List<ProfilesFile.Stored> out = new ArrayList<>();
        List<Callable<ProfilesFile.Stored>> todo = new ArrayList<>();
        List<Integer> todoIndex = new ArrayList<>();
        for (int i = 0; i < tasks.size(); i++) {
            Task t = tasks.get(i);
            ProfilesFile.Stored s = store == null ? null : store.get(t.key(), ProfilesFile.Stored.class).orElse(null);
            if (s != null && s.level() != likelihood.level()) {
                throw new UserInputException(SourceLocation.ofFile(store.dir().resolve(t.key() + ".json").toString()),
                        String.format(Locale.ROOT, "was computed at level %s, not %s; use --level %s to resume it, "
                                + "or delete %s to start afresh", s.level(), likelihood.level(), s.level(),
                                store.dir()));
            }
            out.add(s);
            if (s == null) {
                todo.add(() -> stored(t, compute(t)));
                todoIndex.add(i);
            }
        }
        List<ProfilesFile.Stored> done = LocalTaskExecutor.ofThreads(threads).runAll(todo, (i, s) -> {
            if (store != null) {
                store.put(tasks.get(todoIndex.get(i)).key(), s);
            }
            if (onFinished != null) {
                onFinished.accept(s);
            }
        });
        for (int i = 0; i < done.size(); i++) {
            out.set(todoIndex.get(i), done.get(i));
        }
        return out;
    }

    /**
     * The results of this run's {@code tasks} together with every other profile stored in {@code store} at the same
     * level: what profiles.json should hold after a resumed run that asked for fewer profiles than an earlier one
     * (the store's run identity already guarantees the same inputs and optimum). Order: parameters in the fit's
     * order, then fold positions, then predictions, each kind in the order this run and then the store (sorted
     * keys) name them. Stored profiles of another level are left out, with one line each to {@code warn}.
     *
     * @param ids the fit's parameter ids, in θ order
     */
    static List<ProfilesFile.Stored> withEarlier(List<Task> tasks, List<ProfilesFile.Stored> results,
                                                 ResultStore store, double level, List<String> ids,
                                                 Consumer<String> warn) {
        List<ProfilesFile.Stored> all = new ArrayList<>(results);
        java.util.Set<String> ran = new java.util.HashSet<>();
        tasks.forEach(t -> ran.add(t.key()));
        for (String key : store.keys()) {
            if (ran.contains(key)) {
                continue;
            }
            ProfilesFile.Stored s = store.get(key, ProfilesFile.Stored.class).orElseThrow();
            if (s.level() != level) {
                warn.accept(String.format(Locale.ROOT, "%s was computed at level %s, not %s; not included in "
                        + "profiles.json", store.dir().resolve(key + ".json"), s.level(), level));
            } else {
                all.add(s);
            }
        }
        all.sort(java.util.Comparator.comparingInt((ProfilesFile.Stored s) -> s.entry().kind().ordinal())
                .thenComparingInt(s -> s.entry().kind() == ProfilesFile.Kind.PARAMETER
                        ? ids.indexOf(s.entry().id()) : 0));
        return all;
    }

    /** Profiles one task; a failure becomes a failed profile, not an abort. */
    Profile compute(Task t) {
        try {
            if (t.parameterIndex() >= 0) {
                return likelihood.profileParameter(problem, optimum, t.parameterIndex());
            }
            return likelihood.profilePrediction(problem, optimum, t.prediction(), t.id(), Double.NEGATIVE_INFINITY,
                    Double.POSITIVE_INFINITY);
        } catch (RuntimeException e) {
            return Profile.failed(t.id(), t.parameterIndex(), problem.clamp(optimum), likelihood.level(),
                    "profile failed: " + e.getMessage());
        }
    }

    /** Converts a profile to its stored form (linear scale). */
    ProfilesFile.Stored stored(Task t, Profile p) {
        boolean param = t.parameterIndex() >= 0;
        int k = t.parameterIndex();
        double q1 = likelihood.threshold(1);
        List<ProfilesFile.Point> pts = new ArrayList<>();
        List<double[]> thetas = new ArrayList<>();
        for (ProfilePoint pp : p.points()) {
            pts.add(new ProfilesFile.Point(linear(param, k, pp.value()), pp.nll()));
            double[] th = pp.theta();
            double[] lin = new double[th.length];
            for (int j = 0; j < th.length; j++) {
                lin[j] = problem.scale(j).toLinear(th[j]);
            }
            thetas.add(lin);
        }
        ConfidenceInterval ci = p.pointwise();
        ConfidenceInterval cs = p.simultaneous();
        List<String> comp = new ArrayList<>();
        List<ProfilesFile.Compensation> comps = new ArrayList<>();
        for (Compensation c : p.compensations()) {
            comp.add(c.parameterId());
            comps.add(new ProfilesFile.Compensation(c.parameterId(), c.slope(), c.min(), c.max()));
        }
        Double lo = end(param, k, ci.lower());
        Double hi = end(param, k, ci.upper());
        String bounds = null;
        if (!param) {
            bounds = lo != null && hi != null ? "pinned" : lo != null ? "bounded-below" : hi != null ? "bounded-above"
                    : "free";
        }
        String scale = param ? problem.scale(k).name().toLowerCase(Locale.ROOT) : "lin";
        scale = switch (scale) {
            case "linear" -> "lin";
            case "ln" -> "log";
            default -> scale;
        };
        ProfilesFile.Entry e = new ProfilesFile.Entry(t.id(), t.kind(), scale,
                linear(param, k, p.optimumValue()), lo, hi, end(param, k, cs.lower()), end(param, k, cs.upper()),
                p.optimumNll() + q1 / 2, identifiability(p.identifiability()), bounds, comp, comps, p.optimumNll(),
                p.betterOptimumFound(), p.lowerSide().name(), p.upperSide().name(), p.solves(), p.message(), pts);
        return new ProfilesFile.Stored(likelihood.level(), e, List.of(problem.ids()), thetas);
    }

    private double linear(boolean param, int k, double v) {
        return param ? problem.scale(k).toLinear(v) : v;
    }

    private Double end(boolean param, int k, double v) {
        return Double.isFinite(v) ? linear(param, k, v) : null;
    }

    static ProfilesFile.Identifiability identifiability(Identifiability c) {
        return switch (c) {
            case IDENTIFIABLE -> ProfilesFile.Identifiability.IDENTIFIABLE;
            case PRACTICALLY_NONIDENTIFIABLE -> ProfilesFile.Identifiability.PRACTICALLY_NONIDENTIFIABLE;
            case STRUCTURALLY_NONIDENTIFIABLE -> ProfilesFile.Identifiability.STRUCTURALLY_NONIDENTIFIABLE;
        };
    }

    /** The class name as written in profiles.json ({@code identifiable}, {@code practically-nonidentifiable}, ...). */
    static String className(Identifiability c) {
        return identifiability(c).token();
    }

    /** Writes the CSV of one stored profile: value, nll, Δχ², then each parameter's linear value per point. */
    static void writeCsv(Path file, ProfilesFile.Stored s, double bestNll) {
        List<String> head = new ArrayList<>(List.of("value", "nll", "delta_chi2"));
        head.addAll(s.parameterIds());
        Csv csv = new Csv(head.toArray(new String[0]));
        List<ProfilesFile.Point> pts = s.entry().points();
        for (int i = 0; i < pts.size(); i++) {
            Object[] row = new Object[3 + s.parameterIds().size()];
            row[0] = pts.get(i).value();
            row[1] = pts.get(i).nll();
            row[2] = 2 * (pts.get(i).nll() - s.entry().optimumNll());
            double[] th = s.pointParameters().get(i);
            for (int j = 0; j < th.length; j++) {
                row[3 + j] = th[j];
            }
            csv.row(row);
        }
        csv.write(file);
    }

    /** One task per named prediction, in map order. */
    static List<Task> predictionTasks(ProfilesFile.Kind kind, Map<String, Prediction> predictions) {
        List<Task> out = new ArrayList<>();
        for (Map.Entry<String, Prediction> e : predictions.entrySet()) {
            out.add(new Task(kind, e.getKey(), -1, e.getValue()));
        }
        return out;
    }
}
