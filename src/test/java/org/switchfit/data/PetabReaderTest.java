package org.switchfit.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.util.UserInputException;

/**
 * PEtab v1 reading on a tiny problem invented for these tests ({@code src/test/resources/.../petab-tiny}); the
 * expected values are the ones typed into its tables. Column semantics follow the PEtab v1 specification
 * (https://petab.readthedocs.io, "PEtab data format specification", format version 1).
 */
class PetabReaderTest {

    @TempDir
    Path dir;

    @Test
    void tinyProblemReadsAsWritten() {
        PetabProblem p = PetabReader.read(TestFiles.resource("petab-tiny/problem.yaml"));
        assertEquals(1, p.formatVersion());
        assertEquals(List.of("model.xml"), p.sbmlFiles().stream().map(f -> f.getFileName().toString()).toList());
        assertTrue(p.notes().isEmpty());

        assertEquals(2, p.conditions().size());
        PetabCondition starved = p.conditions().get(0);
        assertEquals("starved", starved.id());
        assertEquals("no feed", starved.name());
        assertEquals(ValueRef.ofNumber(0), starved.values().get("feed"));
        assertTrue(Double.isNaN(starved.values().get("P").number()), "empty field = NaN = keep the model value");
        assertEquals(ValueRef.ofParameter("k_conv"), starved.values().get("k_conv"));
        assertTrue(Double.isNaN(p.conditions().get(1).values().get("P").number()));
        assertEquals(ValueRef.ofParameter("k_conv_fed"), p.conditions().get(1).values().get("k_conv"));
        assertEquals(3, p.conditions().get(1).location().line());

        assertEquals(2, p.observables().size());
        PetabObservable q = p.observables().get(0);
        assertEquals("observableParameter1_q_obs * Q + observableParameter2_q_obs", q.formula());
        assertEquals("noiseParameter1_q_obs", q.noiseFormula());
        assertEquals(ParameterScale.LIN, q.transformation());
        assertEquals(PetabObservable.NoiseDistribution.NORMAL, q.noiseDistribution());
        PetabObservable pl = p.observables().get(1);
        assertEquals(ParameterScale.LOG10, pl.transformation());
        assertEquals(PetabObservable.NoiseDistribution.LAPLACE, pl.noiseDistribution());

        assertEquals(4, p.measurements().size());
        PetabMeasurement m0 = p.measurements().get(0);
        assertEquals("starved", m0.preequilibrationConditionId());
        assertEquals("fed", m0.simulationConditionId());
        assertEquals(0.12, m0.value(), 0.0);
        assertEquals(List.of(ValueRef.ofParameter("scale_q"), ValueRef.ofNumber(0.05)), m0.observableParameters());
        assertEquals(List.of(ValueRef.ofNumber(0.02)), m0.noiseParameters());
        assertEquals("ds1", m0.datasetId());
        assertEquals("1", m0.replicateId());
        PetabMeasurement m2 = p.measurements().get(2);
        assertNull(m2.preequilibrationConditionId());
        assertTrue(m2.isSteadyState());
        assertEquals(List.of(ValueRef.ofParameter("sd_q")), m2.noiseParameters());
        assertEquals(4, m2.location().line());
        assertTrue(p.measurements().get(3).observableParameters().isEmpty());

        assertEquals(6, p.parameters().size());
        assertEquals("fed", p.condition("fed").orElseThrow().id());
        assertEquals(ParameterScale.LOG10, p.observable("p_log").orElseThrow().transformation());
        assertTrue(p.parameter("sd_p").isPresent() && p.parameter("nope").isEmpty());
        assertEquals(4, p.estimatedParameters().size());
        PetabParameter k = p.parameters().get(0);
        assertEquals(ParameterScale.LOG10, k.scale());
        assertEquals(1e-3, k.lower(), 0.0);
        assertEquals(1e3, k.upper(), 0.0);
        assertEquals(0.5, k.nominal(), 0.0);
        assertEquals(new Prior(Prior.Type.PARAMETER_SCALE_UNIFORM, List.of()), k.initializationPrior());
        assertEquals(Prior.normal(0.5, 0.2), k.objectivePrior());
        assertEquals(Prior.logNormal(0, 1), p.parameters().get(1).objectivePrior());
        assertFalse(p.parameters().get(2).estimate());
        assertNull(p.parameters().get(2).objectivePrior());
        assertEquals(new Prior(Prior.Type.PARAMETER_SCALE_UNIFORM, List.of(-2.0, 2.0)),
                p.parameters().get(3).initializationPrior());
        assertEquals(new Prior(Prior.Type.PARAMETER_SCALE_NORMAL, List.of(-1.0, 0.5)),
                p.parameters().get(4).objectivePrior());
        PetabParameter fixed = p.parameters().get(5);
        assertTrue(Double.isNaN(fixed.lower()) && Double.isNaN(fixed.upper()), "empty bounds of a fixed parameter");
    }

    private Path copy() {
        return TestFiles.copyFolder("petab-tiny", dir.resolve("p"));
    }

    private static void replaceLine(Path file, int line, String content) throws Exception {
        List<String> lines = new java.util.ArrayList<>(Files.readAllLines(file));
        lines.set(line - 1, content);
        Files.write(file, lines);
    }

    private static UserInputException fails(Path folder, String... parts) {
        UserInputException e = assertThrows(UserInputException.class,
                () -> PetabReader.read(folder.resolve("problem.yaml")));
        for (String part : parts) {
            assertTrue(e.getMessage().contains(part), "expected '" + part + "' in: " + e.getMessage());
        }
        assertFalse(e.getMessage().contains("\n"));
        return e;
    }

    @Test
    void measurementErrors() throws Exception {
        Path f = copy();
        replaceLine(f.resolve("measurements.tsv"), 3, "q_obs\tstarved\tfed\tlots\t2.5\t\t\t\t");
        fails(f, "measurements.tsv, line 3, column 4", "column 'measurement': 'lots' is not a number", "write");
        replaceLine(f.resolve("measurements.tsv"), 3, "q_ob\tstarved\tfed\t1\t2.5\t\t\t\t");
        fails(f, "measurements.tsv, line 3", "observableId 'q_ob' is not in the observable table",
                "did you mean 'q_obs'?", "add it there");
        replaceLine(f.resolve("measurements.tsv"), 3, "q_obs\tstarve\tfed\t1\t2.5\t1;0\t0.1\t\t");
        fails(f, "line 3", "preequilibrationConditionId 'starve' is not in the condition table",
                "did you mean 'starved'?");
        replaceLine(f.resolve("measurements.tsv"), 3, "q_obs\t\tfeed\t1\t2.5\t1;0\t0.1\t\t");
        fails(f, "line 3", "simulationConditionId 'feed'", "add the condition");
        replaceLine(f.resolve("measurements.tsv"), 3, "q_obs\t\tfed\t1\t2.5\t1;2 x\t\t\t");
        fails(f, "line 3, column 6", "'2 x' is neither a number nor a parameter id", "separated by ';'");
        replaceLine(f.resolve("measurements.tsv"), 3, "q_obs\t\tfed\t1\t-inf\t\t\t\t");
        fails(f, "line 3, column 5", "time '-inf' is not allowed", "inf for a steady-state");
        // PEtab v1: one override per observableParameterN_<id> / noiseParameterN_<id> placeholder.
        replaceLine(f.resolve("measurements.tsv"), 3, "q_obs\t\tfed\t1\t2.5\tscale_q\t0.02\t\t");
        fails(f, "measurements.tsv, line 3", "'observableParameters' gives 1 value(s) but observable 'q_obs' has 2",
                "one value per placeholder");
        replaceLine(f.resolve("measurements.tsv"), 3, "q_obs\t\tfed\t1\t2.5\tscale_q;1\t\t\t");
        fails(f, "line 3", "'noiseParameters' gives 0 value(s) but observable 'q_obs' has 1");
        replaceLine(f.resolve("measurements.tsv"), 3, "p_log\t\tfed\t1\t2.5\t\t0.3\t\t");
        fails(f, "line 3", "'noiseParameters' gives 1 value(s) but observable 'p_log' has 0");
        replaceLine(f.resolve("measurements.tsv"), 3, "q_obs\t\tfed\t1\t2.5\tscale_q;1\tsd_qq\t\t");
        fails(f, "measurements.tsv, line 3", "column 'noiseParameters': parameter 'sd_qq' is not in the parameter"
                + " table (did you mean 'sd_q'?)", "add a row for it");
    }

    @Test
    void parameterErrors() throws Exception {
        Path f = copy();
        Path t = f.resolve("parameters.tsv");
        replaceLine(t, 2, "k_conv\t\tlog10\t10\t1\t0.5\t1\t\t\t\t");
        fails(f, "parameters.tsv, line 2", "bounds [10, 1] do not form an interval", "lowerBound <= upperBound");
        replaceLine(t, 2, "k_conv\t\tlog10\t-1\t1\t0.5\t1\t\t\t\t");
        fails(f, "line 2, column 4", "lowerBound -1 is negative, impossible on log10 scale", "scale lin");
        replaceLine(t, 2, "k_conv\t\tln\t1\t2\t1.5\t1\t\t\t\t");
        fails(f, "line 2, column 3", "parameterScale 'ln' is unknown", "use lin, log or log10");
        replaceLine(t, 2, "k_conv\t\tlin\t1\t2\t1.5\tyes\t\t\t\t");
        fails(f, "line 2, column 7", "estimate 'yes' must be 0 (fixed) or 1");
        replaceLine(t, 2, "k_conv\t\tlin\t1\t2\t1.5\t1\t\t\tnormale\t1;2");
        fails(f, "line 2, column 10", "prior type 'normale' is unknown", "did you mean 'normal'?");
        replaceLine(t, 2, "k_conv\t\tlin\t1\t2\t1.5\t1\t\t\tnormal\t1");
        fails(f, "line 2, column 11", "prior normal needs 2 parameters", "separated by ';'");
        replaceLine(t, 2, "k_conv\t\tlin\t1\t2\t1.5\t1\t\t\tnormal\t1;b");
        fails(f, "line 2, column 11", "prior parameter 'b' is not a number", "e.g. 0;1");
        replaceLine(t, 2, "k_conv\t\tlin\t1\t2\t\t0\t\t\t\t");
        fails(f, "line 2, column 6", "not estimated but has no nominalValue", "give the fixed value");
        replaceLine(t, 2, "k_loss\t\tlin\t1\t2\t1\t0\t\t\t\t");
        fails(f, "line 4", "parameter id 'k_loss' is defined twice (first at", "line 2", "remove or rename");
    }

    @Test
    void tableAndYamlErrors() throws Exception {
        Path f = copy();
        replaceLine(f.resolve("observables.tsv"), 3, "p_log\tprecursor\tP\tsd_p\tlog2\tlaplace");
        fails(f, "observables.tsv, line 3, column 5", "observableTransformation 'log2' is unknown");
        replaceLine(f.resolve("observables.tsv"), 3, "p_log\tprecursor\tP\tsd_p\tlog\tcauchy");
        fails(f, "line 3, column 6", "noiseDistribution 'cauchy' is unknown", "use normal or laplace");
        replaceLine(f.resolve("observables.tsv"), 3, "q_obs\tprecursor\tP\tsd_p\tlog\tlaplace");
        fails(f, "observables.tsv, line 3", "observable id 'q_obs' is defined twice");
        Path g = TestFiles.copyFolder("petab-tiny", dir.resolve("g"));
        replaceLine(g.resolve("conditions.tsv"), 2, "starved\tno feed\t0\t\t2 mM");
        fails(g, "conditions.tsv, line 2, column 5", "condition 'starved', column 'k_conv': '2 mM'");
        Path h = TestFiles.copyFolder("petab-tiny", dir.resolve("h"));
        Files.delete(h.resolve("observables.tsv"));
        fails(h, "problem.yaml, line 11", "observable_files entry 'observables.tsv' does not exist",
                "relative to the YAML file's folder");
        Path i = TestFiles.copyFolder("petab-tiny", dir.resolve("i"));
        Files.writeString(i.resolve("problem.yaml"), "format_version: 2\nparameter_file: parameters.tsv\n");
        fails(i, "problem.yaml, line 1", "format_version '2' is not supported");
        Files.writeString(i.resolve("problem.yaml"), Files.readString(TestFiles.resource("petab-tiny/problem.yaml"))
                + "extra_key: 1\n");
        PetabProblem p = PetabReader.read(i.resolve("problem.yaml"));
        assertEquals(1, p.notes().size());
        assertTrue(p.notes().get(0).contains("'extra_key' is not a PEtab v1 key"), p.notes().get(0));
    }

    @Test
    void simulatedDataAcceptsTheAlternativeConditionColumnNames() throws Exception {
        Path f = Files.writeString(dir.resolve("sim.tsv"), "\tobservableId\tpreequilibrationCondition"
                + "\tsimulationCondition\tsimulation\ttime\n0\tq_obs\tstarved\tfed\t0.5\t1.0\n");
        List<PetabMeasurement> rows = PetabReader.readSimulatedData(f);
        assertEquals(1, rows.size());
        assertEquals("starved", rows.get(0).preequilibrationConditionId());
        assertEquals("fed", rows.get(0).simulationConditionId());
        assertEquals(0.5, rows.get(0).value(), 0.0);
    }
    /** Keys whose content the reader would ignore are refused by name; empty values ask for nothing. */
    @Test
    void mappingFilesAndExtensionsAreRefused() throws Exception {
        Path f = TestFiles.copyFolder("petab-tiny", dir.resolve("keys"));
        String yaml = Files.readString(f.resolve("problem.yaml"));
        Files.writeString(f.resolve("mapping.tsv"), "petabEntityId\tmodelEntityId\nk\tk_conv\n");
        Files.writeString(f.resolve("problem.yaml"), yaml + "    mapping_files:\n      - mapping.tsv\n");
        fails(f, "problem.yaml, line 13", "key 'mapping_files' is not supported", "remove the key");
        Files.writeString(f.resolve("problem.yaml"), yaml + "    mapping_files: []\n");
        PetabReader.read(f.resolve("problem.yaml"));
        Files.writeString(f.resolve("problem.yaml"), yaml + "extensions:\n  sbml_extra: {version: 1}\n");
        fails(f, "problem.yaml, line 13", "key 'extensions' is not supported", "remove the key");
    }
    /**
     * A column close to a standard one (case or up to 2 edits) is still read as an extra column (PEtab allows extra
     * columns) but noted with the standard name; other extra columns are not.
     */
    @Test
    void nearMissColumnsAreNoted() throws Exception {
        Path f = copy();
        replaceLine(f.resolve("measurements.tsv"), 1, "observableId\tpreequilibrationConditionID\t"
                + "simulationConditionId\tmeasurement\ttime\tobservableParameters\tnoiseParameters\tdatasetId\t"
                + "replicate");
        replaceLine(f.resolve("observables.tsv"), 1, "observableId\tobservableName\tobservableFormula\tnoiseFormula\t"
                + "observableTransformation\tnoiseDistribution\tcomment");
        PetabProblem p = PetabReader.read(f.resolve("problem.yaml"));
        assertEquals(2, p.notes().size(), p.notes().toString());
        assertTrue(p.notes().get(0).contains("measurements.tsv, line 1: column 'preequilibrationConditionID' is not a "
                + "PEtab column"), p.notes().get(0));
        assertTrue(p.notes().get(0).contains("did you mean 'preequilibrationConditionId'?"), p.notes().get(0));
        assertTrue(p.notes().get(1).contains("column 'replicate'") && p.notes().get(1).contains("'replicateId'"),
                p.notes().get(1));
    }
}
