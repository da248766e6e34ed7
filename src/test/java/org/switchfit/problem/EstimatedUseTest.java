package org.switchfit.problem;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.util.UserInputException;

/**
 * Estimated parameters of the switchfit format that affect nothing are refused with one line naming the id and
 * why; the model is SYNTHETIC: A -> B with a local rate constant kc shadowing a global kc, B degraded at kd, an
 * assignment rule Tot = A + B and an initial assignment kd2 = 2 kd.
 */
class EstimatedUseTest {
    private static final String MATH = "<math xmlns=\"http://www.w3.org/1998/Math/MathML\">";
    private static final String MODEL = """
            <?xml version="1.0" encoding="UTF-8"?>
            <sbml xmlns="http://www.sbml.org/sbml/level3/version1/core" level="3" version="1">
              <model id="shadow">
                <listOfCompartments><compartment id="V" spatialDimensions="3" size="1" constant="true"/>
                </listOfCompartments>
                <listOfSpecies>
                  <species id="A" compartment="V" initialConcentration="4" hasOnlySubstanceUnits="false"
                           boundaryCondition="false" constant="false"/>
                  <species id="B" compartment="V" initialConcentration="0" hasOnlySubstanceUnits="false"
                           boundaryCondition="false" constant="false"/>
                </listOfSpecies>
                <listOfParameters>
                  <parameter id="kc" value="99" constant="true"/>
                  <parameter id="kd" value="0.2" constant="true"/>
                  <parameter id="kd2" value="1" constant="true"/>
                  <parameter id="Tot" value="0" constant="false"/>
                </listOfParameters>
                <listOfInitialAssignments>
                  <initialAssignment symbol="kd2">MATH<apply><times/><cn>2</cn><ci>kd</ci></apply></math>
                  </initialAssignment>
                </listOfInitialAssignments>
                <listOfRules>
                  <assignmentRule variable="Tot">MATH<apply><plus/><ci>A</ci><ci>B</ci></apply></math>
                  </assignmentRule>
                </listOfRules>
                <listOfReactions>
                  <reaction id="conv" reversible="false">
                    <listOfReactants><speciesReference species="A" stoichiometry="1" constant="true"/>
                    </listOfReactants>
                    <listOfProducts><speciesReference species="B" stoichiometry="1" constant="true"/></listOfProducts>
                    <kineticLaw>MATH<apply><times/><ci>kc</ci><ci>A</ci></apply></math>
                      <listOfLocalParameters><localParameter id="kc" value="0.3"/></listOfLocalParameters>
                    </kineticLaw>
                  </reaction>
                  <reaction id="deg" reversible="false">
                    <listOfReactants><speciesReference species="B" stoichiometry="1" constant="true"/>
                    </listOfReactants>
                    <kineticLaw>MATH<apply><times/><ci>kd</ci><ci>kd2</ci><ci>B</ci></apply></math></kineticLaw>
                  </reaction>
                </listOfReactions>
              </model>
            </sbml>
            """.replace("MATH", MATH);

    @TempDir
    Path dir;

    /** A problem estimating {@code estimated} (YAML list items), the experiment given by {@code experiment}. */
    private Path problem(String estimated, String experiment, String noise) throws IOException {
        Files.writeString(dir.resolve("model.xml"), MODEL);
        Files.writeString(dir.resolve("tc.csv"), "experiment,observable,time,value\ne1,b,1,0.3\ne1,b,2,0.5\n");
        return Files.writeString(dir.resolve("p.yaml"), "switchfit_format: 1\nmodel: model.xml\nparameters:\n"
                + estimated + "experiments:\n  - id: e1\n" + experiment
                + "observables:\n  - {id: b, formula: B, noise: {type: gaussian, sigma: " + noise + "}}\n"
                + "data:\n  timecourses:\n    - file: tc.csv\n");
    }

    private static String refused(Path yaml, String... parts) {
        UserInputException e = assertThrows(UserInputException.class, () -> ProblemLoader.load(yaml));
        String m = e.getMessage();
        assertFalse(m.contains("\n"), m);
        for (String p : parts) {
            assertTrue(m.contains(p), "'" + p + "' missing in: " + m);
        }
        return m;
    }

    private static final String KD = "  - {id: kd, lower: 0.01, upper: 10, start: 0.2}\n";

    @Test
    void usedParametersLoad() throws IOException {
        // kd in a kinetic law; s_b only as a noise sigma; k_e1 only as an experiment's value
        Path yaml = problem(KD + "  - {id: s_b, lower: 0.01, upper: 1, start: 0.1}\n"
                + "  - {id: k_e1, lower: 0.01, upper: 10, start: 1}\n", "    initial: {A: k_e1}\n", "s_b");
        assertEquals(3, ProblemLoader.load(yaml).parameterCount());
    }

    @Test
    void anIdUsedNowhereIsRefusedWithASuggestion() throws IOException {
        refused(problem(KD + "  - {id: kdd, lower: 0.01, upper: 10, start: 1}\n", "", "0.1"),
                "p.yaml, line 5", "estimated parameter 'kdd' affects nothing", "not an entity of model",
                "no observable, noise model or experiment", "correct the id or remove it");
        // used model parameters not estimated here: kd and kd2, both at edit distance 1; the first in model order
        refused(problem("  - {id: kdd, lower: 0.01, upper: 10, start: 1}\n", "", "0.1"), "(did you mean 'kd'?)");
    }

    @Test
    void anAssignmentRuleTargetIsRefused() throws IOException {
        refused(problem(KD + "  - {id: Tot, lower: 0.01, upper: 10, start: 1}\n", "", "0.1"),
                "estimated parameter 'Tot' is set by an assignment rule", "overwrites any estimated value",
                "line 5");
        refused(problem(KD, "    parameters: {Tot: 1}\n", "0.1"), "experiment 'e1' sets 'Tot', which an assignment "
                + "rule of model", "would be overwritten", "set the quantities the rule uses");
    }

    @Test
    void anInitialAssignmentTargetIsRefused() throws IOException {
        refused(problem(KD + "  - {id: kd2, lower: 0.01, upper: 10, start: 1}\n", "", "0.1"),
                "'kd2' is set by an initial assignment");
    }

    /**
     * The control of dose-response data is set by the table at each dose: estimating it is refused unless a
     * timecourse experiment runs with its estimated value.
     */
    @Test
    void aControlUsedOnlyByItsDoseResponseIsRefused() throws IOException {
        Path yaml = problem(KD, "", "0.1");
        Files.writeString(dir.resolve("dr.csv"), "experiment,observable,dose,value,history\ne1,b,0.5,0.2,low\n");
        String text = Files.readString(yaml);
        String dr = "  dose_responses:\n    - {file: dr.csv, control: kd}\n";
        // timecourses of e1 run with the estimated kd: it is used
        Files.writeString(yaml, text + dr);
        assertEquals(1, ProblemLoader.load(yaml).parameterCount());
        // without the timecourses nothing reads the estimated kd
        Files.writeString(yaml, text.replace("  timecourses:\n    - file: tc.csv\n", "") + dr);
        refused(yaml, "estimated parameter 'kd' is the control of the switching data at", "dr.csv, line 2",
                "remove it from parameters", "p.yaml, line 4");
        // nor when the only timecourse experiment sets kd itself
        Files.writeString(yaml, text.replace("  - id: e1\n", "  - id: e1\n    parameters: {kd: 0.3}\n") + dr);
        refused(yaml, "estimated parameter 'kd' is the control");
    }

    @Test
    void aGlobalParameterHiddenByLocalsIsRefused() throws IOException {
        refused(problem("  - {id: kc, lower: 0.01, upper: 100, start: 1}\n" + KD, "", "0.1"),
                "estimated parameter 'kc' affects nothing", "shadowed by local parameters of reaction conv",
                "line 4");
        // the same global used by an experiment's value (here the initial value of A) is used
        Path yaml = problem("  - {id: kc, lower: 0.01, upper: 100, start: 1}\n" + KD, "    initial: {A: kc}\n",
                "0.1");
        assertEquals(2, ProblemLoader.load(yaml).parameterCount());
    }
}
