package org.switchfit.data;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/**
 * Writing a problem and reading it back gives the same values (source locations aside), and writing is
 * idempotent: write(read(write(p))) produces the same bytes as write(p).
 */
class ProblemFileRoundTripTest {

    @TempDir
    Path dir;

    @Test
    void exampleSurvivesWriteAndRead() throws Exception {
        SwitchfitProblem original = ProblemFileReader.read(TestFiles.resource("own/problem.yaml"));
        Path first = dir.resolve("one/first.yaml");
        Files.createDirectories(first.getParent());
        List<Path> written = ProblemFileWriter.write(original, first);
        assertEquals(3, written.size(), "yaml, timecourses, one dose table");
        SwitchfitProblem again = ProblemFileReader.read(first);
        assertEquals(canonical(original), canonical(again));
        assertEquals(original.modelFile().toRealPath(), again.modelFile().toRealPath());

        Path second = dir.resolve("one/second.yaml");
        ProblemFileWriter.write(again, second);
        String a = Files.readString(first);
        String b = Files.readString(second).replace("second-", "first-");
        assertEquals(a, b);
        assertEquals(Files.readString(dir.resolve("one/first-timecourses.csv")),
                Files.readString(dir.resolve("one/second-timecourses.csv")));
    }

    /** Everything but source locations and file paths, as text. */
    private static List<String> canonical(SwitchfitProblem p) {
        List<String> out = new ArrayList<>();
        for (EstimatedParameter e : p.parameters()) {
            out.add(new EstimatedParameter(e.id(), e.lower(), e.upper(), e.scale(), e.start(), e.prior(), null)
                    .toString());
        }
        for (Experiment e : p.experiments()) {
            List<Dose> doses = new ArrayList<>();
            e.doses().forEach(d -> doses.add(new Dose(d.time(), d.target(), d.action(), d.amount(), null)));
            out.add(new Experiment(e.id(), e.parameterValues(), e.initialValues(), e.settleIn(), doses, null)
                    .toString());
        }
        for (Observable o : p.observables()) {
            out.add(new Observable(o.id(), o.formula(), o.scaleParameter(), o.offsetParameter(), o.noise(), null)
                    .toString());
        }
        for (TimecoursePoint t : p.timecourses()) {
            out.add(new TimecoursePoint(t.experiment(), t.observable(), t.time(), t.value(), t.sigma(), null)
                    .toString());
        }
        for (DoseResponsePoint d : p.doseResponses()) {
            out.add(new DoseResponsePoint(d.experiment(), d.observable(), d.control(), d.dose(), d.value(),
                    d.sigma(), d.history(), null).toString());
        }
        for (SwitchingThreshold t : p.thresholds()) {
            out.add(new SwitchingThreshold(t.experiment(), t.control(), t.direction(), t.value(), t.sigma(), null)
                    .toString());
        }
        return out;
    }
}
