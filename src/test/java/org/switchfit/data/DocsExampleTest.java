package org.switchfit.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** The complete example of {@code docs/problem-format.md} parses (user-guide snippets run as tests). */
class DocsExampleTest {

    @TempDir
    Path dir;

    @Test
    void completeExampleParses() throws Exception {
        String doc = Files.readString(Path.of("docs/problem-format.md"));
        int section = doc.indexOf("## A complete example");
        assertTrue(section > 0, "section present");
        int start = doc.indexOf("```yaml\n", section) + "```yaml\n".length();
        int end = doc.indexOf("```", start);
        String yaml = doc.substring(start, end);
        Path problem = TestFiles.write(dir.resolve("problems/switch.yaml"), yaml);
        TestFiles.write(dir.resolve("models/stress_switch.xml"), "<sbml/>");
        TestFiles.write(dir.resolve("problems/data/pulse.csv"),
                "experiment,observable,time,value,sigma\npulse,act_frac,0,0.05,0.01\npulse,act_frac,10,0.31,\n");
        TestFiles.write(dir.resolve("problems/data/dose_response.csv"),
                "experiment,observable,dose,value,sigma,history\nrest,act_frac,0.5,0.06,0.01,low\n"
                        + "rest,act_frac,0.5,0.82,0.02,high\n");
        SwitchfitProblem p = ProblemFileReader.read(problem);
        assertEquals(4, p.parameters().size());
        assertEquals(2, p.experiments().size());
        assertEquals("rest", p.experiment("pulse").orElseThrow().settleIn());
        assertEquals(2, p.observables().size());
        assertEquals(2, p.timecourses().size());
        assertEquals(2, p.doseResponses().size());
        assertEquals(2, p.thresholds().size());
        assertEquals(SwitchingThreshold.Direction.DOWN, p.thresholds().get(1).direction());
    }
}
