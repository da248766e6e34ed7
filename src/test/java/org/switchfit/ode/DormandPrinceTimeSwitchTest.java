package org.switchfit.ode;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.sbml.SbmlReader;

/** The Dormand-Prince route stops at switches of the right-hand side on time, as the BDF route does. */
class DormandPrinceTimeSwitchTest {
    @TempDir
    Path dir;

    @Test
    void shortPulseBetweenTwoOutputTimesIsIntegratedExactly() throws IOException {
        // SYNTHETIC: y' = piecewise(1, 1.2 <= t < 1.3, 0), y(0) = 0, so y(3) = 0.1 (closed form by hand)
        String time = "<csymbol encoding=\"text\" definitionURL=\"http://www.sbml.org/sbml/symbols/time\">time"
                + "</csymbol>";
        String xml = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<sbml xmlns=\"http://www.sbml.org/sbml/level3/"
                + "version1/core\" level=\"3\" version=\"1\"><model id=\"pulse\"><listOfParameters>"
                + "<parameter id=\"y\" value=\"0\" constant=\"false\"/></listOfParameters><listOfRules>"
                + "<rateRule variable=\"y\"><math xmlns=\"http://www.w3.org/1998/Math/MathML\"><piecewise><piece>"
                + "<cn>1</cn><apply><and/><apply><geq/>" + time + "<cn>1.2</cn></apply><apply><lt/>" + time
                + "<cn>1.3</cn></apply></apply></piece><otherwise><cn>0</cn></otherwise></piecewise></math>"
                + "</rateRule></listOfRules></model></sbml>\n";
        Path f = dir.resolve("pulse.xml");
        Files.writeString(f, xml);
        CompiledModel cm = ModelCompiler.compile(SbmlReader.read(f));
        SolverSettings s = SolverSettings.defaults().withTolerances(1e-8, 1e-12);
        Trajectory tr = new Simulator(cm, new DormandPrinceIntegrator(s)).simulate(new double[] {0, 3},
                cm.parameterValues(), ModelOutputs.of(cm, List.of("y")));
        // the switch is bracketed to ~1e-12 and f is piecewise constant: 1e-9 absolute
        assertEquals(0.1, tr.value(1, 0), 1e-9);
    }
}
