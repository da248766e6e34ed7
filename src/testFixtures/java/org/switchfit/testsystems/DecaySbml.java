package org.switchfit.testsystems;

/**
 * SBML Level 3 text of first-order decay X' = -k X with X(0) = x0 through an initial assignment (species in a unit
 * compartment, k = 0.3, x0 = 2): closed form X(t) = x0 exp(-k t). Shared by the tests that write small problems;
 * {@link #withEvents} adds parameters and events (e.g. {@link #BOLUS}, {@link #RESET}).
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

    /** MathML of the SBML time symbol. */
    public static final String TIME = "<csymbol encoding=\"text\" "
            + "definitionURL=\"http://www.sbml.org/sbml/symbols/time\">time</csymbol>";

    /**
     * {@link #MODEL} with a bolus: parameters d = 1.5 and t1 = 2, event "bolus" (time &gt;= t1: X = X + d). Closed
     * form, derived by hand: X = x0 e^{-kt} for t &lt; t1, X = x0 e^{-kt} + d e^{-k(t - t1)} after.
     */
    public static final String BOLUS = withEvents(parameter("d", 1.5, true) + parameter("t1", 2.0, true),
            event("bolus", false, "<apply><geq/>" + TIME + "<ci>t1</ci></apply>", null, "X",
                    "<apply><plus/><ci>X</ci><ci>d</ci></apply>"));

    /**
     * {@link #MODEL} with a reset: parameters cth = 0.5 and xr = 1, event "reset" (X &lt; cth: X = xr, values from
     * the trigger time). Closed form, derived by hand: resets at t1 = ln(x0/cth)/k and t2 = t1 + ln(xr/cth)/k, ...,
     * X = xr e^{-k(t - t_last)} after the last reset.
     */
    public static final String RESET = withEvents(parameter("cth", 0.5, true) + parameter("xr", 1.0, true),
            event("reset", true, "<apply><lt/><ci>X</ci><ci>cth</ci></apply>", null, "X", "<ci>xr</ci>"));

    /**
     * The decay reparameterised by B = X(tStar): parameter x0 replaced by B (value 2) and X(0) = B e^{k tStar}, so
     * X(t) = B e^{-k (t - tStar)}.
     */
    public static String reparameterised(double tStar) {
        return MODEL.replace("<parameter id=\"x0\" value=\"2\" constant=\"true\"/>",
                        "<parameter id=\"B\" value=\"2\" constant=\"true\"/>")
                .replace("<ci>x0</ci>", "<apply><times/><ci>B</ci><apply><exp/><apply><times/><ci>k</ci><cn>"
                        + tStar + "</cn></apply></apply></apply>");
    }

    /** {@link #MODEL} with extra {@code <parameter>} elements (after x0) and {@code <event>} elements. */
    public static String withEvents(String parameters, String events) {
        return withEvents(parameters, events, true);
    }

    /**
     * As {@link #withEvents(String, String)}; with {@code constantRate} false the rate k is declared
     * non-constant (so events may assign it).
     */
    public static String withEvents(String parameters, String events, boolean constantRate) {
        String k = "<parameter id=\"k\" value=\"0.3\" constant=\"true\"/>";
        String x0 = "<parameter id=\"x0\" value=\"2\" constant=\"true\"/>";
        return MODEL.replace(k, constantRate ? k : k.replace("\"true\"", "\"false\""))
                .replace(x0, x0 + parameters)
                .replace("</listOfReactions>", "</listOfReactions><listOfEvents>" + events + "</listOfEvents>");
    }

    /** A {@code <parameter>} element. */
    public static String parameter(String id, double value, boolean constant) {
        return "<parameter id=\"" + id + "\" value=\"" + value + "\" constant=\"" + constant + "\"/>";
    }

    /**
     * An {@code <event>} element with one assignment; trigger initially false and persistent.
     *
     * @param fromTrigger useValuesFromTriggerTime
     * @param trigger     MathML of the trigger (inside {@code <math>})
     * @param delay       MathML of the delay, or null
     */
    public static String event(String id, boolean fromTrigger, String trigger, String delay, String variable,
                               String value) {
        String math = "<math xmlns=\"http://www.w3.org/1998/Math/MathML\">";
        return "<event id=\"" + id + "\" useValuesFromTriggerTime=\"" + fromTrigger + "\">"
                + "<trigger initialValue=\"false\" persistent=\"true\">" + math + trigger + "</math></trigger>"
                + (delay == null ? "" : "<delay>" + math + delay + "</math></delay>")
                + "<listOfEventAssignments><eventAssignment variable=\"" + variable + "\">" + math + value
                + "</math></eventAssignment></listOfEventAssignments></event>";
    }
}
