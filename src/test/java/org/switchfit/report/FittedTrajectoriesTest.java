package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.ProblemLoader;

/**
 * trajectories.json content from a PEtab problem: first-order decay X' = -k X, X(0) = x0, whose solution
 * X(t) = x0 exp(-k t) is known in closed form, with a linear and a log-transformed observable in two conditions.
 */
class FittedTrajectoriesTest {
    private static final SolverSettings TIGHT = SolverSettings.defaults().withTolerances(1e-10, 1e-14);

    @TempDir
    Path dir;

    static final String MODEL = """
            <?xml version="1.0" encoding="UTF-8"?>
            <sbml xmlns="http://www.sbml.org/sbml/level3/version2/core" level="3" version="2">
              <model id="decay">
                <listOfCompartments><compartment id="c" size="1" constant="true" spatialDimensions="3"/>
                </listOfCompartments>
                <listOfSpecies><species id="X" compartment="c" initialConcentration="1"
                  hasOnlySubstanceUnits="false" boundaryCondition="false" constant="false"/></listOfSpecies>
                <listOfParameters>
                  <parameter id="k" value="0.3" constant="true"/>
                  <parameter id="x0" value="2" constant="true"/>
                </listOfParameters>
                <listOfInitialAssignments>
                  <initialAssignment symbol="X"><math xmlns="http://www.w3.org/1998/Math/MathML"><ci>x0</ci></math>
                  </initialAssignment>
                </listOfInitialAssignments>
                <listOfReactions>
                  <reaction id="r" reversible="false">
                    <listOfReactants><speciesReference species="X" stoichiometry="1" constant="true"/>
                    </listOfReactants>
                    <kineticLaw><math xmlns="http://www.w3.org/1998/Math/MathML">
                      <apply><times/><ci>k</ci><ci>X</ci></apply></math></kineticLaw>
                  </reaction>
                </listOfReactions>
              </model>
            </sbml>
            """;

    private Path problem() throws IOException {
        Files.writeString(dir.resolve("model.xml"), MODEL);
        Files.writeString(dir.resolve("parameters.tsv"), "parameterId\tparameterScale\tlowerBound\tupperBound\t"
                + "nominalValue\testimate\nk\tlog10\t1e-3\t10\t0.2\t1\nx0\tlog10\t1e-2\t100\t1.0\t1\n");
        Files.writeString(dir.resolve("conditions.tsv"), "conditionId\tk\nc0\tk\nfast\t0.9\n");
        Files.writeString(dir.resolve("observables.tsv"), "observableId\tobservableFormula\tnoiseFormula\t"
                + "observableTransformation\tnoiseDistribution\nlinObs\t2 * X\t0.1\tlin\tnormal\n"
                + "logObs\tX\t0.2\tlog\tnormal\n");
        StringBuilder m = new StringBuilder("observableId\tsimulationConditionId\tmeasurement\ttime\n");
        double[] t = {0, 1, 2, 4, 8};
        for (double ti : t) {
            m.append("linObs\tc0\t").append(4 * Math.exp(-0.3 * ti) + 0.01).append('\t').append(ti).append('\n');
            m.append("logObs\tc0\t").append(2 * Math.exp(-0.3 * ti)).append('\t').append(ti).append('\n');
        }
        m.append("linObs\tfast\t1.5\t3\n");
        Files.writeString(dir.resolve("measurements.tsv"), m.toString());
        Path yaml = dir.resolve("problem.yaml");
        Files.writeString(yaml, "format_version: 1\nparameter_file: parameters.tsv\nproblems:\n"
                + "  - sbml_files: [model.xml]\n    condition_files: [conditions.tsv]\n"
                + "    measurement_files: [measurements.tsv]\n    observable_files: [observables.tsv]\n");
        return yaml;
    }

    @Test
    void fittedCurvesFollowTheClosedForm() throws IOException {
        EstimationProblem p = ProblemLoader.load(problem());
        double k = 0.3;
        double x0 = 2.0;
        double[] theta = {Math.log10(k), Math.log10(x0)};
        TrajectoriesFile tf = FittedTrajectories.compute(p, theta, TIGHT, 41);
        assertNull(tf.bandLevel());
        assertEquals(2, tf.experiments().size());
        TrajectoriesFile.Experiment c0 = tf.experiments().get(0);
        assertEquals(2, c0.observables().size());
        // Closed form X(t) = x0 exp(-k t); linObs = 2 X. BDF at rtol 1e-10: 1e-7 relative allows the usual one to
        // two orders of global error growth over the local tolerance (common practice), plus margin.
        double worst = 0;
        for (TrajectoriesFile.Observable o : c0.observables()) {
            double f = o.id().equals("linObs") ? 2.0 : 1.0;
            double[] t = o.time();
            double[] y = o.fitted();
            assertEquals(0.0, t[0], 0.0);
            assertEquals(8.0, t[t.length - 1], 0.0);
            assertEquals(41, t.length, "grid of 41 contains the measurement times 0, 1, 2, 4, 8 (multiples of 0.2)");
            for (int i = 0; i < t.length; i++) {
                double exact = f * x0 * Math.exp(-k * t[i]);
                worst = Math.max(worst, Math.abs(y[i] - exact) / exact);
            }
        }
        assertTrue(worst < 1e-7, "relative error " + worst);
        TrajectoriesFile.Observable lin = c0.observables().get(0);
        assertEquals("linObs", lin.id());
        assertArrayEquals(new double[] {0, 1, 2, 4, 8}, lin.dataTime(), 0.0);
        assertArrayEquals(new double[] {0.1, 0.1, 0.1, 0.1, 0.1}, lin.dataSigma(), 0.0);
        assertEquals(4 * Math.exp(-0.3 * 2) + 0.01, lin.dataValue()[2], 0.0);
        // log-transformed: sd on the data scale = value * sigma (first-order propagation, derived by hand)
        TrajectoriesFile.Observable lg = c0.observables().get(1);
        for (int i = 0; i < lg.dataTime().length; i++) {
            assertEquals(lg.dataValue()[i] * 0.2, lg.dataSigma()[i], 1e-15 * lg.dataValue()[i]);
        }
        // condition 'fast' fixes k = 0.9: linObs = 2 x0 exp(-0.9 t) on [0, 3]
        TrajectoriesFile.Observable fast = tf.experiments().get(1).observables().get(0);
        double[] t = fast.time();
        assertEquals(3.0, t[t.length - 1], 0.0);
        assertEquals(2 * x0 * Math.exp(-0.9 * 3), fast.fitted()[t.length - 1], 1e-7 * 2 * x0 * Math.exp(-2.7));
        // round trip through the fit directory
        FitDirectory d = FitDirectory.of(dir.resolve("out"));
        d.write(FitFile.TRAJECTORIES, tf);
        assertEquals(Json.toJson(tf), Json.toJson(d.read(FitFile.TRAJECTORIES)));
    }
}
