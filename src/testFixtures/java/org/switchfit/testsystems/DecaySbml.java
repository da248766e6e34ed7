package org.switchfit.testsystems;

/**
 * SBML Level 3 text of first-order decay X' = -k X with X(0) = x0 through an initial assignment (species in a unit
 * compartment, k = 0.3, x0 = 2): closed form X(t) = x0 exp(-k t). Shared by the tests that write small problems.
 */
public final class DecaySbml {
    private DecaySbml() {
    }

    /** The model. */
    public static final String MODEL = """
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
}
