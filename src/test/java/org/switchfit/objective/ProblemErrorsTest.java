package org.switchfit.objective;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.ode.SolverSettings;
import org.switchfit.problem.ProblemLoader;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;
import org.switchfit.util.UserInputException;

/** Bad problem files give one line naming what, where and what to do. */
class ProblemErrorsTest {
    private static final String PARAMS = "parameterId | parameterScale | lowerBound | upperBound | nominalValue | "
            + "estimate\nk | log10 | 1e-3 | 10 | 0.3 | 1";
    private static final String CONDS = "conditionId\nc0";
    private static final String OBS = "observableId | observableFormula | noiseFormula\nobs | X | 0.1";
    private static final String MEAS = "observableId | simulationConditionId | measurement | time\nobs | c0 | 1.0 | 1";

    @TempDir
    Path dir;

    private String failure(String params, String conds, String obs, String meas, String... expected) {
        Path yaml = PetabFiles.write(dir, DecaySbml.MODEL, params, conds, obs, meas);
        UserInputException e = assertThrows(UserInputException.class, () -> LikelihoodObjective.of(
                ProblemLoader.load(yaml), SolverSettings.defaults()));
        String msg = e.getMessage();
        assertFalse(msg.contains("\n"), "one line: " + msg);
        for (String s : expected) {
            assertTrue(msg.contains(s), "'" + s + "' missing in: " + msg);
        }
        return msg;
    }

    @Test
    void unknownObservableInMeasurements() {
        failure(PARAMS, CONDS, OBS, "observableId | simulationConditionId | measurement | time\nobz | c0 | 1 | 1",
                "measurements.tsv", "line 2", "'obz'", "observable table");
    }

    @Test
    void unknownConditionInMeasurements() {
        failure(PARAMS, CONDS, OBS, "observableId | simulationConditionId | measurement | time\nobs | c9 | 1 | 1",
                "measurements.tsv", "line 2", "'c9'", "condition table");
    }

    @Test
    void unknownSymbolInObservableFormula() {
        failure(PARAMS, CONDS, "observableId | observableFormula | noiseFormula\nobs | X * scale | 0.1", MEAS,
                "observables.tsv", "'scale'", "parameter table");
    }

    @Test
    void conditionColumnThatIsNotAModelEntity() {
        // the column is wrong, not a row: the location is the header line
        failure(PARAMS, "conditionId | kk\nc0 | 1", OBS, MEAS, "conditions.tsv, line 1", "'kk'", "remove the column");
    }

    @Test
    void logScaleWithZeroLowerBound() {
        failure("parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate\n"
                + "k | log10 | 0 | 10 | 0.3 | 1", CONDS, OBS, MEAS, "parameters.tsv", "'k'", "positive bound");
    }

    @Test
    void nonPositiveDataOnLogScale() {
        failure(PARAMS, CONDS, "observableId | observableFormula | noiseFormula | observableTransformation\n"
                + "obs | X | 0.1 | log", "observableId | simulationConditionId | measurement | time\nobs | c0 | 0 | 1",
                "measurements.tsv", "line 2", "not positive", "observableTransformation lin");
    }

    @Test
    void zeroNoiseNamesTheDataRowAndTheObservableDefinition() {
        failure(PARAMS, CONDS, "observableId | observableFormula | noiseFormula\nobs | X | 0", MEAS,
                "measurements.tsv, line 2", "noise spread of observable 'obs' evaluates to 0.0", "must be positive",
                "noise definition (", "observables.tsv, line 2)");
    }

    /** The format dispatcher reads the file first: a binary file or a folder gets a message saying so. */
    @Test
    void notUtf8OrAFolder() throws java.io.IOException {
        Path binary = java.nio.file.Files.write(dir.resolve("problem.yaml"), new byte[] {(byte) 0xFF, 'x'});
        UserInputException e = assertThrows(UserInputException.class, () -> ProblemLoader.load(binary));
        assertTrue(e.getMessage().contains("problem.yaml: the problem file is not UTF-8 text"), e.getMessage());
        e = assertThrows(UserInputException.class, () -> ProblemLoader.load(dir));
        assertTrue(e.getMessage().contains("is a folder, not a problem file"), e.getMessage());
    }

    @Test
    void unparsableFormula() {
        String m = failure(PARAMS, CONDS, "observableId | observableFormula | noiseFormula\nobs | X * (1 + | 0.1",
                MEAS, "observables.tsv", "cannot parse formula 'X * (1 +': it ends too early", "write an infix");
        assertFalse(m.contains("Exception") || m.contains("org."), "no Java class names: " + m);
        // column 4 of 'X +* 2' is the second operator (1-based, as the message says)
        m = failure(PARAMS, CONDS, "observableId | observableFormula | noiseFormula\nobs | X +* 2 | 0.1", MEAS,
                "cannot parse formula 'X +* 2': unexpected '* 2' at column 4");
        assertFalse(m.contains("Exception") || m.contains("org."), "no Java class names: " + m);
        failure(PARAMS, CONDS, "observableId | observableFormula | noiseFormula\nobs | X $ 2 | 0.1", MEAS,
                "unexpected '$ 2' at column 3");
    }
    @Test
    void uniformPriorSupportOutsideTheBounds() {
        failure("parameterId | parameterScale | lowerBound | upperBound | nominalValue | estimate | "
                + "objectivePriorType | objectivePriorParameters\nk | log10 | 1e-3 | 10 | 0.3 | 1 | uniform | 20;30",
                CONDS, OBS, MEAS, "parameters.tsv", "line 2", "'k'", "does not overlap its bounds",
                "correct objectivePriorParameters");
    }
    private static final String PRIOR_PARAMS = "parameterId | parameterScale | lowerBound | upperBound | "
            + "nominalValue | estimate | objectivePriorType | objectivePriorParameters\n";
    private static final String NOISE_OBS = "observableId | observableFormula | noiseFormula\n"
            + "obs | observableParameter1_obs * X | noiseParameter1_obs + noiseParameter2_obs * X";

    /** Numeric noiseParameters that make σ = a + b X constant and not positive: refused at the row. */
    @Test
    void noiseParametersGivingNonPositiveSpread() {
        String meas = "observableId | simulationConditionId | measurement | time | observableParameters | "
                + "noiseParameters\nobs | c0 | 1.0 | 1 | 1 | 0.1;0.05\nobs | c0 | 1.0 | 2 | 1 | %s";
        failure(PARAMS, CONDS, NOISE_OBS, String.format(meas, "-0.2;0"), "measurements.tsv", "line 3", "-0.2",
                "must be positive", "noiseParameters");
        failure(PARAMS, CONDS, NOISE_OBS, String.format(meas, "0;0"), "measurements.tsv", "line 3", "0.0",
                "must be positive", "noiseParameters");
    }

    @Test
    void nanAmongObservableParameters() {
        failure(PARAMS, CONDS, NOISE_OBS, "observableId | simulationConditionId | measurement | time | "
                + "observableParameters | noiseParameters\nobs | c0 | 1.0 | 1 | NaN;1 | 0.1;0",
                "measurements.tsv", "line 2", "column 5", "observableParameters", "value 1", "NaN");
    }

    @Test
    void priorParametersOutsideTheirDomain() {
        failure(PRIOR_PARAMS + "k | log10 | 1e-3 | 10 | 0.3 | 1 | normal | 1;-0.5", CONDS, OBS, MEAS,
                "parameters.tsv", "line 2", "column 8", "positive finite standard deviation", "'1;-0.5'");
        failure(PRIOR_PARAMS + "k | log10 | 1e-3 | 10 | 0.3 | 1 | laplace | 1;0", CONDS, OBS, MEAS,
                "parameters.tsv", "line 2", "column 8", "positive finite scale", "'1;0'");
        failure(PRIOR_PARAMS + "k | log10 | 1e-3 | 10 | 0.3 | 1 | uniform | 5;1", CONDS, OBS, MEAS,
                "parameters.tsv", "line 2", "column 8", "lower < upper", "'5;1'");
    }

    /** A log-normal prior on a parameter that may be 0 or negative: said as such, at the lowerBound cell. */
    @Test
    void logNormalPriorOnAParameterThatCanBeNonPositive() {
        failure(PRIOR_PARAMS + "k | lin | -1 | 1 | 0.3 | 1 | logNormal | 0;1", CONDS, OBS, MEAS,
                "parameters.tsv", "line 2", "column 3", "positive values only", "lowerBound -1");
    }
    /** PEtab simulations start at t = 0, so a negative measurement time is refused at its cell. */
    @Test
    void negativeMeasurementTime() {
        failure(PARAMS, CONDS, OBS, "observableId | simulationConditionId | measurement | time\nobs | c0 | 1.0 | 1\n"
                + "obs | c0 | 1.0 | -1", "measurements.tsv", "line 3", "column 4", "negative", "t = 0");
    }
    /** PEtab v1 sets species values in the condition table; a species row in the parameter table is refused. */
    @Test
    void speciesInTheParameterTable() {
        failure(PARAMS + "\nX | lin | 0.1 | 10 | 0.9 | 1", CONDS, OBS, MEAS, "parameters.tsv", "line 3", "'X'",
                "names a species", "condition table");
        failure(PARAMS + "\nX | lin | 0.1 | 10 | 0.9 | 0", CONDS, OBS, MEAS, "parameters.tsv", "line 3", "'X'",
                "names a species", "condition table");
    }
}
