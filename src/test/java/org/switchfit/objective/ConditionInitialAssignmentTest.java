package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;

/**
 * A condition that gives NaN for a quantity the model sets by an initial assignment keeps that assignment (PEtab v1:
 * NaN keeps the model's value; SBML: an initial assignment overrides the declared value), while a condition that
 * gives a number replaces it. SYNTHETIC model: X' = -kx X and Y' = -kx Y with X = s0 (X also declares 1), Y = 2 s0
 * (Y declares nothing) and kx = 2 kf by initial assignments; closed form X(t) = X(0) e^{-kx t}, derived by hand.
 */
class ConditionInitialAssignmentTest {
    /** Integration at rtol 1e-10: simulated values carry a relative error of about 1e-9 (common practice). */
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);
    /** Relative tolerance for simulated values: 100 x the integration tolerance. */
    private static final double REL = 1e-8;

    private static final String MODEL = """
            <?xml version="1.0" encoding="UTF-8"?>
            <sbml xmlns="http://www.sbml.org/sbml/level3/version1/core" level="3" version="1">
              <model id="synthetic_ia">
                <listOfCompartments><compartment id="cell" size="1" constant="true" spatialDimensions="3"/>
                </listOfCompartments>
                <listOfSpecies>
                  <species id="X" compartment="cell" initialConcentration="1" hasOnlySubstanceUnits="false"
                    boundaryCondition="false" constant="false"/>
                  <species id="Y" compartment="cell" hasOnlySubstanceUnits="false" boundaryCondition="false"
                    constant="false"/>
                </listOfSpecies>
                <listOfParameters>
                  <parameter id="kf" value="0.4" constant="true"/>
                  <parameter id="kx" value="0.7" constant="true"/>
                  <parameter id="s0" value="3" constant="true"/>
                </listOfParameters>
                <listOfInitialAssignments>
                  <initialAssignment symbol="kx"><math xmlns="http://www.w3.org/1998/Math/MathML">
                    <apply><times/><cn>2</cn><ci>kf</ci></apply></math></initialAssignment>
                  <initialAssignment symbol="X"><math xmlns="http://www.w3.org/1998/Math/MathML"><ci>s0</ci>
                    </math></initialAssignment>
                  <initialAssignment symbol="Y"><math xmlns="http://www.w3.org/1998/Math/MathML">
                    <apply><times/><cn>2</cn><ci>s0</ci></apply></math></initialAssignment>
                </listOfInitialAssignments>
                <listOfReactions>
                  <reaction id="degX" reversible="false">
                    <listOfReactants><speciesReference species="X" stoichiometry="1" constant="true"/>
                    </listOfReactants>
                    <kineticLaw><math xmlns="http://www.w3.org/1998/Math/MathML">
                      <apply><times/><ci>kx</ci><ci>X</ci><ci>cell</ci></apply></math></kineticLaw>
                  </reaction>
                  <reaction id="degY" reversible="false">
                    <listOfReactants><speciesReference species="Y" stoichiometry="1" constant="true"/>
                    </listOfReactants>
                    <kineticLaw><math xmlns="http://www.w3.org/1998/Math/MathML">
                      <apply><times/><ci>kx</ci><ci>Y</ci><ci>cell</ci></apply></math></kineticLaw>
                  </reaction>
                </listOfReactions>
              </model>
            </sbml>
            """;

    @TempDir
    Path dir;

    private Path problem() {
        return PetabFiles.write(dir, MODEL,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "kf | lin | 0.01 | 2 | 0.5 | 1\nx0 | lin | 0.1 | 10 | 2.5 | 1",
                // c1 keeps every initial assignment; c2 replaces all three, X by an estimated parameter
                "conditionId | s0 | X | Y | kx\nc1 | 4 | NaN | | NaN\nc2 | NaN | x0 | 1.5 | 0.3",
                "observableId | observableFormula | noiseFormula\nobsX | X | 0.1\nobsY | Y | 0.1",
                "observableId | simulationConditionId | measurement | time\nobsX | c1 | 1 | 1\nobsY | c1 | 1 | 1\n"
                        + "obsX | c2 | 1 | 1\nobsY | c2 | 1 | 2");
    }

    @Test
    void nanKeepsTheModelsInitialAssignmentAndAValueReplacesIt() {
        EstimationProblem p = ProblemLoader.load(problem());
        double[] sim = LikelihoodObjective.of(p, TIGHT).evaluateDetailed(p.nominalTheta()).simulated();
        // c1: X(0) = s0 = 4, Y(0) = 2 s0 = 8, kx = 2 kf = 1 (kf = 0.5 from the parameter table)
        double[] expected = {4 * Math.exp(-1.0), 8 * Math.exp(-1.0),
            // c2: X(0) = x0 = 2.5, Y(0) = 1.5, kx = 0.3
            2.5 * Math.exp(-0.3), 1.5 * Math.exp(-0.6)};
        for (int i = 0; i < expected.length; i++) {
            assertEquals(expected[i], sim[i], REL * expected[i], "row " + (i + 2));
        }
    }

    /** Both branches of the chosen initial value carry exact sensitivities (kf through kx in c1, x0 in c2). */
    @Test
    void gradientMatchesCentralDifferences() {
        EstimationProblem p = ProblemLoader.load(problem());
        GradientCheck.assertJacobian(LikelihoodObjective.of(p, TIGHT), new double[] {0.6, 2.0}, 1e-5);
    }

    /** The switchfit format shares the preparation: an experiment without an initial value keeps the assignment. */
    @Test
    void switchfitExperimentWithoutInitialValueKeepsTheAssignment() throws IOException {
        Path sf = dir.resolve("sf");
        Files.createDirectories(sf);
        Files.writeString(sf.resolve("model.xml"), DecaySbml.MODEL);
        Files.writeString(sf.resolve("tc.csv"), "experiment,observable,time,value,sigma\ne1,obs,1,1,0.1\n"
                + "e2,obs,1,1,0.1\n");
        Path yaml = sf.resolve("problem.yaml");
        Files.writeString(yaml, "switchfit_format: 1\nmodel: model.xml\nparameters:\n"
                + "  - {id: k, lower: 1e-3, upper: 10, scale: log10, start: 0.4}\n"
                + "experiments:\n  - id: e1\n    initial: {X: 5}\n  - id: e2\n"
                + "observables:\n  - {id: obs, formula: X, noise: {type: gaussian, sigma: 0.1}}\n"
                + "data:\n  timecourses:\n    - file: tc.csv\n");
        EstimationProblem p = ProblemLoader.load(yaml);
        double[] sim = LikelihoodObjective.of(p, TIGHT).evaluateDetailed(p.nominalTheta()).simulated();
        // DecaySbml: X = x0 = 2 by initial assignment (declared 1), k = 0.4 here; e1 sets X(0) = 5
        assertEquals(5 * Math.exp(-0.4), sim[0], REL * sim[0]);
        assertEquals(2 * Math.exp(-0.4), sim[1], REL * sim[1]);
    }
}
