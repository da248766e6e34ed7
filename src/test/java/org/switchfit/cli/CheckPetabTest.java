package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;

/**
 * {@code check} on small SYNTHETIC PEtab problems around the decay of {@link DecaySbml} (X' = -k X, X(0) = x0;
 * closed form X(t) = x0 e^{-k t}, derived by hand).
 */
class CheckPetabTest {
    private static final String PARAMS = "parameterId | parameterScale | lowerBound | upperBound | nominalValue | "
            + "estimate\nk | lin | 0.01 | 2 | 0.3 | 1";
    private static final String CONDS = "conditionId | x0\nlow | 1.0\nhigh | 2.0";
    private static final String OBS = "observableId | observableFormula | noiseFormula\nobs | X | 0.1";

    @TempDir
    Path dir;

    private static int run(StringWriter out, StringWriter err, String... args) {
        return Main.execute(args, new PrintWriter(out, true), new PrintWriter(err, true));
    }

    /** Rewrites the problem YAML with the given extra lines under the problem entry and at the top level. */
    private static void yaml(Path yaml, String measurementFiles, String problemExtra, String topExtra)
            throws IOException {
        Files.writeString(yaml, "format_version: 1\nparameter_file: parameters.tsv\nproblems:\n"
                + "  - sbml_files: [model.xml]\n    condition_files: [conditions.tsv]\n"
                + "    measurement_files: [" + measurementFiles + "]\n    observable_files: [observables.tsv]\n"
                + problemExtra + topExtra);
    }

    /** Two measurement files (one with an extra column): every row of both, in file order, its own simulation. */
    @Test
    void simulationsOfSeveralMeasurementFiles() throws Exception {
        Path yaml = PetabFiles.write(dir, DecaySbml.MODEL, PARAMS, CONDS, OBS,
                "observableId | simulationConditionId | measurement | time\nobs | low | 0.7 | 1\nobs | low | 0.5 | 2");
        Files.writeString(dir.resolve("m2.tsv"), "observableId\tsimulationConditionId\tmeasurement\ttime\t"
                + "datasetId\nobs\thigh\t1.5\t1\td2\n");
        yaml(yaml, "measurements.tsv, m2.tsv", "", "");
        Path sims = dir.resolve("sims.tsv");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(0, run(out, err, "check", yaml.toString(), "--simulations", sims.toString()), err.toString());
        List<String> lines = Files.readAllLines(sims);
        assertEquals(4, lines.size(), String.join("\n", lines));
        List<String> header = List.of(lines.get(0).split("\t"));
        int sim = header.indexOf("simulation");
        assertEquals(header.indexOf("measurement") + 1, sim);
        String[] condition = {"low", "low", "high"};
        double[] expected = {Math.exp(-0.3), Math.exp(-0.6), 2 * Math.exp(-0.3)};
        for (int i = 0; i < 3; i++) {
            String[] cells = lines.get(i + 1).split("\t", -1);
            assertEquals(header.size(), cells.length, lines.get(i + 1));
            assertEquals(condition[i], cells[header.indexOf("simulationConditionId")]);
            // rtol 1e-8 of the default integration; 1e-6 leaves a margin
            assertEquals(expected[i], Double.parseDouble(cells[sim]), 1e-6 * expected[i], lines.get(i + 1));
        }
        assertEquals("d2", lines.get(3).split("\t", -1)[header.indexOf("datasetId")]);
        assertEquals("", lines.get(1).split("\t", -1)[header.indexOf("datasetId")]);
    }
    /**
     * A nominal value outside a uniform prior's support: check reports an infinite NLL naming the parameter (PEtab
     * v1: density 0 outside [a, b]), JSON stays valid (null), and a fit's box is the support, so starts and steps
     * stay where the NLL is finite.
     */
    @Test
    void uniformPriorSupport() throws Exception {
        Path yaml = PetabFiles.write(dir, DecaySbml.MODEL, "parameterId | parameterScale | lowerBound | upperBound | "
                + "nominalValue | estimate | objectivePriorType | objectivePriorParameters\n"
                + "k | log10 | 0.01 | 2 | 0.3 | 1 | uniform | 0.5;1", CONDS, OBS,
                "observableId | simulationConditionId | measurement | time\nobs | low | 0.7 | 1");
        Path json = dir.resolve("check.json");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(0, run(out, err, "check", yaml.toString(), "--json", json.toString()), err.toString());
        assertTrue(out.toString().contains("note: parameter 'k' = 0.300000 lies outside the support [0.500000, "
                + "1.00000] of its uniform prior"), out.toString());
        assertTrue(new com.fasterxml.jackson.databind.ObjectMapper().readTree(json.toFile()).get("nllAtNominal")
                .isNull());
        org.switchfit.problem.EstimationProblem p = org.switchfit.problem.ProblemLoader.load(yaml);
        org.switchfit.fit.FitProblem fp = FitCommand.fitProblem(p,
                org.switchfit.objective.LikelihoodObjective.of(p, org.switchfit.ode.SolverSettings.defaults()));
        assertEquals(Math.log10(0.5), fp.lower(0), 1e-15);
        assertEquals(0.0, fp.upper(0), 1e-15);
    }
    /**
     * A log-transformed observable whose prediction at the nominal values is 0 (X(0) = x0 = 0): check refuses with one
     * line naming the row, the experiment, the time and what to do, exit code 2.
     */
    @Test
    void logObservableWithZeroPredictionAtTheNominalValues() throws Exception {
        Path yaml = PetabFiles.write(dir, DecaySbml.MODEL, PARAMS, "conditionId | x0\nzero | 0",
                "observableId | observableFormula | noiseFormula | observableTransformation\nobsL | X | 0.1 | log",
                "observableId | simulationConditionId | measurement | time\nobsL | zero | 1 | 0");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(Main.EXIT_USER_ERROR, run(out, err, "check", yaml.toString()));
        String msg = err.toString().strip();
        assertEquals(1, msg.lines().count(), msg);
        for (String s : List.of("error: ", "measurements.tsv, line 2", "nominal parameter values", "experiment 'zero'",
                "t = 0", "observable 'obsL' is log-transformed", "prediction is 0", "add an offset")) {
            assertTrue(msg.contains(s), "'" + s + "' missing in: " + msg);
        }
    }
    /**
     * Input that loads but is probably not what was meant gives warning lines (stderr, and "warnings" in the JSON):
     * a misspelt optional column, an estimated parameter without nominal value (check uses the midpoint of its
     * bounds on its scale: lin bounds 0.01 and 2 give 1.005) and an estimated parameter nothing uses.
     */
    @Test
    void warningsForMisspeltColumnMissingNominalValueAndUnusedParameter() throws Exception {
        Path yaml = PetabFiles.write(dir, DecaySbml.MODEL, PARAMS.replace("0.3 | 1", " | 1")
                + "\nscale_typo | log10 | 0.01 | 100 | 1 | 1", CONDS, OBS,
                "observableId | simulationConditionId | measurement | time | datasetID\nobs | low | 0.7 | 1 | d1");
        Path json = dir.resolve("check.json");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(0, run(out, err, "check", yaml.toString(), "--json", json.toString()), err.toString());
        List<String> warnings = err.toString().strip().lines().toList();
        assertEquals(3, warnings.size(), err.toString());
        for (String w : warnings) {
            assertTrue(w.startsWith("warning: "), w);
        }
        assertTrue(warnings.get(0).contains("measurements.tsv, line 1: column 'datasetID'")
                && warnings.get(0).contains("did you mean 'datasetId'?"), warnings.get(0));
        assertTrue(warnings.get(1).contains("parameters.tsv, line 2: estimated parameter 'k' has no nominalValue")
                && warnings.get(1).contains("midpoint of its bounds on its lin scale, 1.00500"), warnings.get(1));
        assertTrue(warnings.get(2).contains("parameters.tsv, line 3: estimated parameter 'scale_typo' is used by no "
                + "model element"), warnings.get(2));
        assertEquals(3, new com.fasterxml.jackson.databind.ObjectMapper().readTree(json.toFile()).get("warnings")
                .size());
    }
    /**
     * The maximal relative deviation from a reference is taken over the nonzero reference values: a reference 0
     * beside a simulation of 7.4e-10 (x0 = 1e-9) no longer makes it infinite; with only zero references it is n/a
     * (null in JSON). Reference for 'low': e^{-0.3} (1 + 5e-4), closed form of the decay (the integration error,
     * about 1e-7 relative at rtol 1e-8, leaves the 3 digits shown).
     */
    @Test
    void relativeDeviationOverNonzeroReferences() throws Exception {
        Path yaml = PetabFiles.write(dir, DecaySbml.MODEL, PARAMS, "conditionId | x0\nlow | 1.0\ntiny | 1e-9", OBS,
                "observableId | simulationConditionId | measurement | time\nobs | low | 0.7 | 1\nobs | tiny | 0 | 1");
        Path ref = dir.resolve("ref.tsv");
        Files.writeString(ref, "observableId\tsimulationConditionId\tsimulation\ttime\nobs\tlow\t"
                + Math.exp(-0.3) * (1 + 5e-4) + "\t1\nobs\ttiny\t0\t1\n");
        Path json = dir.resolve("check.json");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(0, run(out, err, "check", yaml.toString(), "--reference", ref.toString(), "--json",
                json.toString()), out + "\n" + err);
        assertTrue(out.toString().contains("max rel deviation 0.000500 (over nonzero references)"), out.toString());
        Files.writeString(ref, "observableId\tsimulationConditionId\tsimulation\ttime\nobs\tlow\t0\t1\n"
                + "obs\ttiny\t0\t1\n");
        out = new StringWriter();
        assertEquals(CheckCommand.EXIT_MISMATCH, run(out, err, "check", yaml.toString(), "--reference",
                ref.toString(), "--json", json.toString()), out + "\n" + err);
        assertTrue(out.toString().contains("max rel deviation n/a"), out.toString());
        com.fasterxml.jackson.databind.JsonNode j = new com.fasterxml.jackson.databind.ObjectMapper()
                .readTree(json.toFile());
        assertTrue(j.get("maxRelDeviation").isNull(), j.toString());
        assertTrue(j.get("observables").get(0).get("maxRelDeviation").isNull(), j.toString());
    }

    /** Exit code 3 (simulations differ from the reference) is listed in the command's help. */
    @Test
    void helpListsTheMismatchExitCode() {
        StringWriter out = new StringWriter();
        run(out, new StringWriter(), "check", "--help");
        assertTrue(out.toString().contains("Exit codes:") && out.toString().contains("3   some simulated value "
                + "differs from the reference table"), out.toString());
    }

    /**
     * A steady-state measurement of x' = k (x = k t grows without limit, so it has none): check says so in one
     * line and exits 2 instead of reporting an internal error (the values are the user's; nothing failed inside).
     */
    @Test
    void noSteadyStateAtTheNominalValuesIsOneUserErrorLine() throws Exception {
        String model = """
                <?xml version="1.0" encoding="UTF-8"?>
                <sbml xmlns="http://www.sbml.org/sbml/level3/version2/core" level="3" version="2">
                  <model id="inflow">
                    <listOfParameters>
                      <parameter id="k" value="1" constant="true"/>
                      <parameter id="x" value="0" constant="false"/>
                    </listOfParameters>
                    <listOfRules>
                      <rateRule variable="x"><math xmlns="http://www.w3.org/1998/Math/MathML"><ci>k</ci></math>
                      </rateRule>
                    </listOfRules>
                  </model>
                </sbml>
                """;
        Path yaml = PetabFiles.write(dir, model, PARAMS, "conditionId\nc0",
                "observableId | observableFormula | noiseFormula\nobs | x | 0.1",
                "observableId | simulationConditionId | measurement | time\nobs | c0 | 1.0 | inf");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        assertEquals(2, run(out, err, "check", yaml.toString()), err.toString());
        String[] lines = err.toString().strip().split("\n");
        assertEquals(1, lines.length, err.toString());
        assertTrue(lines[0].startsWith("error: ") && lines[0].contains("no steady state")
                && lines[0].contains("grows without limit"), lines[0]);
    }
}
