package org.switchfit.sbml;

import static org.junit.jupiter.api.Assertions.assertDoesNotThrow;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.model.Model;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.DormandPrinceIntegrator;
import org.switchfit.ode.ModelCompiler;
import org.switchfit.ode.ModelOutputs;
import org.switchfit.ode.Simulator;
import org.switchfit.ode.SolverSettings;
import org.switchfit.util.UserInputException;

/**
 * Models the SBML specification declares invalid (missing math, non-numeric attributes, constants changed by rules
 * or events, duplicate ids, negative delays, underdetermined algebraic rules) are refused with one line naming the
 * element, instead of being simulated with a default. All models are SYNTHETIC: x' = k0 - d x in compartment c.
 */
class SbmlValidityTest {
    @TempDir
    Path dir;

    private static final String MATH = "<math xmlns=\"http://www.w3.org/1998/Math/MathML\">";

    /** A SYNTHETIC L3V1 model with production k0 and decay d x; the slots add or replace parts. */
    private static String model(String version, String extraParams, String degLaw, String tail, String stoich) {
        return "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
                + "<sbml xmlns=\"http://www.sbml.org/sbml/level3/version" + version + "/core\" level=\"3\" version=\""
                + version + "\">\n<model id=\"m\">\n"
                + "<listOfCompartments><compartment id=\"c\" size=\"1\" spatialDimensions=\"3\" constant=\"true\"/>"
                + "</listOfCompartments>\n"
                + "<listOfSpecies><species id=\"x\" compartment=\"c\" initialConcentration=\"2\" "
                + "hasOnlySubstanceUnits=\"false\" boundaryCondition=\"false\" constant=\"false\"/></listOfSpecies>\n"
                + "<listOfParameters><parameter id=\"k0\" value=\"1\" constant=\"true\"/>"
                + "<parameter id=\"d\" value=\"1\" constant=\"true\"/>" + extraParams + "</listOfParameters>\n"
                + "<listOfReactions>\n<reaction id=\"prod\" reversible=\"false\"><listOfProducts>"
                + "<speciesReference species=\"x\" stoichiometry=\"1\" constant=\"true\"/></listOfProducts>"
                + "<kineticLaw>" + MATH + "<ci>k0</ci></math></kineticLaw></reaction>\n"
                + "<reaction id=\"deg\" reversible=\"false\"><listOfReactants>"
                + "<speciesReference species=\"x\" stoichiometry=\"" + stoich + "\" constant=\"true\"/>"
                + "</listOfReactants>" + degLaw + "</reaction>\n</listOfReactions>\n" + tail + "</model>\n</sbml>\n";
    }

    private static final String DEG = "<kineticLaw>" + MATH + "<apply><times/><ci>d</ci><ci>x</ci></apply>"
            + "</math></kineticLaw>";
    private static final String AT_HALF = MATH + "<apply><geq/><csymbol encoding=\"text\" "
            + "definitionURL=\"http://www.sbml.org/sbml/symbols/time\">time</csymbol><cn>0.5</cn></apply></math>";

    private Path write(String xml) throws IOException {
        Path f = dir.resolve("m.xml");
        Files.writeString(f, xml);
        return f;
    }

    private void assertRefused(String xml, String... words) throws IOException {
        Path f = write(xml);
        UserInputException e = assertThrows(UserInputException.class, () -> {
            Model m = SbmlReader.read(f);
            CompiledModel cm = ModelCompiler.compile(m);
            new Simulator(cm, new DormandPrinceIntegrator(SolverSettings.defaults())).simulate(new double[] {0, 1},
                    cm.parameterValues(), ModelOutputs.of(cm, java.util.List.of("x")));
        });
        for (String w : words) {
            assertTrue(e.getMessage().contains(w), e.getMessage() + " should contain " + w);
        }
        assertTrue(!e.getMessage().contains("\n"), "one line: " + e.getMessage());
    }

    @Test
    void validModelIsAccepted() throws IOException {
        Path f = write(model("1", "", DEG, "", "1"));
        assertDoesNotThrow(() -> SbmlReader.read(f));
    }

    @Test
    void reactionWithoutRateIsRefused() throws IOException {
        assertRefused(model("1", "", "", "", "1"), "'deg'", "kinetic law");
        assertRefused(model("1", "", "<kineticLaw></kineticLaw>", "", "1"), "'deg'", "kinetic law");
        assertRefused(model("1", "", "<kineticLaw>" + MATH + "</math></kineticLaw>", "", "1"), "'deg'");
    }

    @Test
    void missingMathIsRefusedBeforeLevel3Version2() throws IOException {
        String noTrigger = "<listOfEvents><event id=\"e1\" useValuesFromTriggerTime=\"true\"><trigger "
                + "initialValue=\"true\" persistent=\"true\"/><listOfEventAssignments><eventAssignment variable=\"x\">"
                + MATH + "<cn>5</cn></math></eventAssignment></listOfEventAssignments></event></listOfEvents>\n";
        assertRefused(model("1", "", DEG, noTrigger, "1"), "'e1'", "trigger", "no math");
        String noAssignMath = "<listOfEvents><event id=\"e1\" useValuesFromTriggerTime=\"true\"><trigger "
                + "initialValue=\"true\" persistent=\"true\">" + AT_HALF + "</trigger><listOfEventAssignments>"
                + "<eventAssignment variable=\"x\"/></listOfEventAssignments></event></listOfEvents>\n";
        assertRefused(model("1", "", DEG, noAssignMath, "1"), "'e1'", "'x'", "no math");
        String noIaMath = "<listOfInitialAssignments><initialAssignment symbol=\"x\"/></listOfInitialAssignments>\n";
        assertRefused(model("1", "", DEG, noIaMath, "1"), "initial assignment of 'x'", "no math");
        // SBML Level 3 Version 2 made the math optional (the element then has no effect; SBML Test Suite 01234)
        Path f = write(model("2", "", DEG, noIaMath, "1"));
        assertDoesNotThrow(() -> SbmlReader.read(f));
    }

    @Test
    void nonNumericAttributesAreRefused() throws IOException {
        assertRefused(model("1", "", DEG, "", "x1"), "stoichiometry=\"x1\"", "not a number");
        assertRefused(model("1", "<parameter id=\"q\" value=\"abc\" constant=\"true\"/>", DEG, "", "1"), "'q'",
                "value=\"abc\"");
        // attributes of annotations are not SBML's: anything goes there
        Path f = write(model("1", "", DEG, "", "1").replace("<model id=\"m\">", "<model id=\"m\"><annotation>"
                + "<my:level xmlns:my=\"http://example.org/my\" value=\"high\"/></annotation>"));
        assertDoesNotThrow(() -> SbmlReader.read(f));
    }

    @Test
    void rulesAndEventsMustNotChangeConstants() throws IOException {
        String rule = "<listOfRules><assignmentRule variable=\"k0\">" + MATH + "<cn>2</cn></math></assignmentRule>"
                + "</listOfRules>\n";
        assertRefused(model("1", "", DEG, rule, "1"), "'k0'", "constant");
        String ev = "<listOfEvents><event id=\"e1\" useValuesFromTriggerTime=\"true\"><trigger initialValue=\"true\" "
                + "persistent=\"true\">" + AT_HALF + "</trigger><listOfEventAssignments><eventAssignment "
                + "variable=\"d\">" + MATH + "<cn>5</cn></math></eventAssignment></listOfEventAssignments></event>"
                + "</listOfEvents>\n";
        assertRefused(model("1", "", DEG, ev, "1"), "event 'e1'", "'d'", "constant");
    }

    @Test
    void duplicateIdsAreRefused() throws IOException {
        assertRefused(model("1", "<parameter id=\"x\" value=\"1\" constant=\"true\"/>", DEG, "", "1"), "'x'",
                "species", "parameter", "unique");
        assertRefused(model("1", "<parameter id=\"m\" value=\"1\" constant=\"true\"/>", DEG, "", "1"), "'m'",
                "model", "unique");
    }

    @Test
    void negativeDelayIsRefused() throws IOException {
        String ev = "<listOfEvents><event id=\"e1\" useValuesFromTriggerTime=\"true\"><trigger initialValue=\"true\" "
                + "persistent=\"true\">" + AT_HALF + "</trigger><delay>" + MATH + "<apply><minus/><cn>1</cn></apply>"
                + "</math></delay><listOfEventAssignments><eventAssignment variable=\"x\">" + MATH + "<cn>5</cn></math>"
                + "</eventAssignment></listOfEventAssignments></event></listOfEvents>\n";
        assertRefused(model("1", "", DEG, ev, "1"), "'e1'", "delay", "-1");
    }

    @Test
    void algebraicRuleWithTwoUnknownsIsRefused() throws IOException {
        String alg = "<listOfRules><algebraicRule>" + MATH + "<apply><minus/><apply><plus/><ci>u</ci><ci>v</ci>"
                + "</apply><cn>1</cn></apply></math></algebraicRule></listOfRules>\n";
        assertRefused(model("1", "<parameter id=\"u\" value=\"0\" constant=\"false\"/>"
                + "<parameter id=\"v\" value=\"0\" constant=\"false\"/>", DEG, alg, "1"), "'u'", "'v'",
                "undetermined");
    }

    @Test
    void requiredUnsupportedPackageIsRefused() throws IOException {
        String arrays = model("1", "", DEG, "", "1").replace("version=\"1\">", "version=\"1\" xmlns:arrays=\""
                + "http://www.sbml.org/sbml/level3/version1/arrays/version1\" arrays:required=\"true\">");
        assertRefused(arrays, "package 'arrays'", "required");
        String foo = model("1", "", DEG, "", "1").replace("version=\"1\">", "version=\"1\" xmlns:foo=\""
                + "http://example.org/foo/version1\" foo:required=\"true\">");
        assertRefused(foo, "package 'foo'");
        // not required: the package's elements may be ignored (SBML Level 3 core specification, from memory)
        Path f = write(model("1", "", DEG, "", "1").replace("version=\"1\">", "version=\"1\" xmlns:foo=\""
                + "http://example.org/foo/version1\" foo:required=\"false\">"));
        assertDoesNotThrow(() -> SbmlReader.read(f));
    }

    @Test
    void packageFunctionIsNamedPlainly() throws IOException {
        String law = "<kineticLaw>" + MATH + "<apply><csymbol encoding=\"text\" definitionURL=\""
                + "http://www.sbml.org/sbml/symbols/distrib/normal\">normal</csymbol><cn>1</cn><cn>0.1</cn></apply>"
                + "</math></kineticLaw>";
        String xml = model("1", "", law, "", "1").replace("version=\"1\">", "version=\"1\" xmlns:distrib=\""
                + "http://www.sbml.org/sbml/level3/version1/distrib/version1\" distrib:required=\"false\">");
        assertRefused(xml, "'normal'", "'distrib'");
    }

    @Test
    void wellFormedNonSbmlNamesItsRootElement() throws IOException {
        Path f = write("<html><head><title>t</title></head><body><p>not a model</p></body></html>\n");
        UserInputException e = assertThrows(UserInputException.class, () -> SbmlReader.read(f));
        assertTrue(e.getMessage().contains("<html>") && e.getMessage().contains("<sbml>"), e.getMessage());
        assertTrue(!e.getMessage().contains("JSBML"), e.getMessage());
    }

    @Test
    void floorOfTimeInTheRightHandSideIsRefused() throws IOException {
        // light = rem(floor(time/12), 2) switches every 12 h; its jumps were stepped over (x = 0 at t = 24, 48, ...)
        String light = "<kineticLaw>" + MATH + "<apply><rem/><apply><floor/><apply><divide/><csymbol encoding=\"text\""
                + " definitionURL=\"http://www.sbml.org/sbml/symbols/time\">time</csymbol><cn>12</cn></apply></apply>"
                + "<cn>2</cn></apply></math></kineticLaw>";
        String xml = model("2", "", DEG, "", "1").replace("<kineticLaw>" + MATH + "<ci>k0</ci></math></kineticLaw>",
                light);
        assertRefused(xml, "rem", "time", "piecewise");
    }
}
