package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.PetabFiles;

/**
 * Pre-equilibration of a model without a steady state stops at {@link SteadyState#MAX_STEPS} with a message that
 * says so; a damped model with the same oscillation still reaches its steady state.
 */
class PreequilibrationLimitTest {

    @TempDir
    Path dir;

    /** x' = w y - c x, y' = -w x - c y: rotation at angular frequency w, damped at rate c (c = 0: no steady state). */
    private static String oscillator(double c) {
        return """
                <?xml version="1.0" encoding="UTF-8"?>
                <sbml xmlns="http://www.sbml.org/sbml/level3/version2/core" level="3" version="2">
                  <model id="osc">
                    <listOfParameters>
                      <parameter id="w" value="2" constant="true"/>
                      <parameter id="c" value="%s" constant="true"/>
                      <parameter id="x" value="1" constant="false"/>
                      <parameter id="y" value="0" constant="false"/>
                    </listOfParameters>
                    <listOfRules>
                      <rateRule variable="x"><math xmlns="http://www.w3.org/1998/Math/MathML">
                        <apply><minus/><apply><times/><ci>w</ci><ci>y</ci></apply>
                          <apply><times/><ci>c</ci><ci>x</ci></apply></apply></math></rateRule>
                      <rateRule variable="y"><math xmlns="http://www.w3.org/1998/Math/MathML">
                        <apply><minus/><apply><minus/><apply><times/><ci>w</ci><ci>x</ci></apply></apply>
                          <apply><times/><ci>c</ci><ci>y</ci></apply></apply></math></rateRule>
                    </listOfRules>
                  </model>
                </sbml>
                """.formatted(c);
    }

    private LikelihoodObjective objective(double c, String name) {
        Path yaml = PetabFiles.write(dir.resolve(name), oscillator(c),
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "w | log10 | 0.1 | 10 | 2 | 1",
                "conditionId\npre\nc0",
                "observableId | observableFormula | noiseFormula | observableTransformation | noiseDistribution\n"
                        + "obs | x | 0.1 | lin | normal",
                "observableId | preequilibrationConditionId | simulationConditionId | measurement | time\n"
                        + "obs | pre | c0 | 0.0 | 1.0");
        return LikelihoodObjective.of(ProblemLoader.load(yaml), SolverSettings.defaults());
    }

    @Test
    void sustainedOscillationIsReportedWithinTheStepBudget() {
        LikelihoodObjective obj = objective(0.0, "undamped");
        double[] r = new double[obj.residualCount()];
        RuntimeException e = assertThrows(RuntimeException.class,
                () -> obj.evaluate(obj.problem().nominalTheta(), r, null));
        assertTrue(e.getMessage().contains("no steady state within " + SteadyState.MAX_STEPS + " solver steps"),
                e.getMessage());
    }

    @Test
    void dampedOscillationReachesItsSteadyState() {
        // Damped at c = 0.5 the state spirals into (0, 0) (closed form: e^{-ct} times a rotation, derived by hand).
        // The run stops once |f_i| <= 1e-12 + 1e-8 |y_i|; for this linear field |f|_2 = sqrt(w^2 + c^2) |(x, y)|_2,
        // so |x| <= ~1.5e-12 / 2.06 < 1e-12 then and it only decays over the next time unit: the residual
        // x / 0.1 is below 1e-11; the bound 1e-9 leaves two orders for the integration error of the last interval.
        LikelihoodObjective obj = objective(0.5, "damped");
        double[] r = new double[obj.residualCount()];
        obj.evaluate(obj.problem().nominalTheta(), r, null);
        assertEquals(0.0, r[0], 1e-9);
    }
}
