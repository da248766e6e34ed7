package org.switchfit.testsystems;

/**
 * SBML Level 3 text of a state relaxing towards an input that switches on at a parameter time:
 * {@code x' = b + piecewise(0, time < t_on, u) - k x} (parameters k = 0.5, b = 1, u = 0, t_on = 3; x a parameter
 * with a rate rule, declared 0 so that a pre-equilibration sets it). With u = 0 the steady state is x = b/k; from
 * x(0) = b/k the closed form, derived by hand, is x = b/k for t &lt; t_on and
 * {@code x = b/k + (u/k)(1 - exp(-k (t - t_on)))} after. Shared by the tests of the right-hand-side switch after
 * pre-equilibration.
 */
public final class OnsetSbml {
    private OnsetSbml() {
    }

    private static final String MATH = "<math xmlns=\"http://www.w3.org/1998/Math/MathML\">";

    /** The model. */
    public static final String MODEL = """
            <?xml version="1.0" encoding="UTF-8"?>
            <sbml xmlns="http://www.sbml.org/sbml/level3/version2/core" level="3" version="2">
              <model id="onset">
                <listOfParameters>
                  <parameter id="k" value="0.5" constant="true"/>
                  <parameter id="b" value="1" constant="true"/>
                  <parameter id="u" value="0" constant="true"/>
                  <parameter id="t_on" value="3" constant="true"/>
                  <parameter id="x" value="0" constant="false"/>
                </listOfParameters>
                <listOfRules>
                  <rateRule variable="x">%s<apply><minus/><apply><plus/><ci>b</ci>
                    <piecewise><piece><cn>0</cn><apply><lt/>%s<ci>t_on</ci></apply></piece>
                    <otherwise><ci>u</ci></otherwise></piecewise></apply>
                    <apply><times/><ci>k</ci><ci>x</ci></apply></apply></math></rateRule>
                </listOfRules>
              </model>
            </sbml>
            """.formatted(MATH, DecaySbml.TIME);

    /**
     * Writes a PEtab problem of this model into {@code dir}: k (log10, [1e-2, 10]), b, uOn (lin, [0.1, 10]) and t_on
     * (lin, [0.1, 8]) estimated with the given nominal values, pre-equilibration condition {@code pre} (u = 0),
     * simulation condition {@code c0} (u = uOn), observable {@code obs = x} with noise σ, data m at times t (+inf
     * written as {@code inf}); returns the YAML path.
     */
    public static java.nio.file.Path writeProblem(java.nio.file.Path dir, double k, double b, double u, double tOn,
                                                  double sigma, double[] t, double[] m) {
        StringBuilder meas = new StringBuilder(
                "observableId | preequilibrationConditionId | simulationConditionId | measurement | time");
        for (int i = 0; i < t.length; i++) {
            meas.append("\nobs | pre | c0 | ").append(m[i]).append(" | ")
                    .append(t[i] == Double.POSITIVE_INFINITY ? "inf" : String.valueOf(t[i]));
        }
        return PetabFiles.write(dir, MODEL,
                "parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                        + "k | log10 | 1e-2 | 10 | " + k + " | 1\n"
                        + "b | lin | 0.1 | 10 | " + b + " | 1\n"
                        + "uOn | lin | 0.1 | 10 | " + u + " | 1\n"
                        + "t_on | lin | 0.1 | 8 | " + tOn + " | 1",
                "conditionId | u\npre | 0\nc0 | uOn",
                "observableId | observableFormula | noiseFormula\nobs | x | " + sigma,
                meas.toString());
    }
}
