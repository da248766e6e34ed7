package org.switchfit.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.util.UserInputException;

/**
 * The switchfit problem format: the example of {@code src/test/resources/org/switchfit/data/own} read value by
 * value (expected values are those typed into the example files), and every validation error path, each checked
 * for what, where (file and line) and what to do.
 */
class ProblemFileReaderTest {

    @TempDir
    Path dir;

    private static final String HEAD = "switchfit_format: 1\nmodel: model.xml\n";
    private static final String PARAM = "parameters:\n  - {id: k_conv, lower: 0.001, upper: 1000, start: 0.5}\n";
    private static final String EXP_OBS = "experiments:\n  - id: fed\n    parameters: {feed: 0.2}\n"
            + "observables:\n  - {id: q_obs, formula: Q, noise: {type: gaussian, sigma: 0.1}}\n";

    @Test
    void exampleProblemReadsAsWritten() {
        SwitchfitProblem p = ProblemFileReader.read(TestFiles.resource("own/problem.yaml"));
        assertEquals(1, p.formatVersion());
        assertEquals("model.xml", p.modelFile().getFileName().toString());
        assertEquals(4, p.parameters().size());
        EstimatedParameter k = p.parameter("k_conv").orElseThrow();
        assertEquals(1e-3, k.lower(), 0.0);
        assertEquals(1e3, k.upper(), 0.0);
        assertEquals(ParameterScale.LOG10, k.scale());
        assertEquals(0.5, k.start(), 0.0);
        assertEquals(Prior.normal(0.5, 0.2), k.prior());
        assertEquals(7, k.location().line(), "line of '- id: k_conv' in problem.yaml");
        assertEquals(ParameterScale.LOG10, p.parameter("sigma_q").orElseThrow().scale(), "default scale");
        assertEquals(Prior.logNormal(-3, 1), p.parameter("sigma_q").orElseThrow().prior());
        assertEquals(ParameterScale.LOG, p.parameter("k_conv_fed").orElseThrow().scale());

        Experiment fed = p.experiment("fed").orElseThrow();
        assertEquals(ValueRef.ofNumber(0.2), fed.parameterValues().get("feed"));
        assertEquals(ValueRef.ofParameter("k_conv_fed"), fed.parameterValues().get("k_conv"));
        assertEquals(List.of("feed", "k_conv"), List.copyOf(fed.parameterValues().keySet()), "file order");
        assertEquals(ValueRef.ofNumber(1.5), fed.initialValues().get("P"));
        assertEquals("starved", fed.settleIn());
        assertEquals(2, fed.doses().size());
        assertEquals(new Dose(5, "feed", Dose.Action.SET, ValueRef.ofNumber(0.4), fed.doses().get(0).location()),
                fed.doses().get(0));
        assertEquals(Dose.Action.ADD, fed.doses().get(1).action());
        assertNull(p.experiment("starved").orElseThrow().settleIn());

        assertEquals(new NoiseModel.Gaussian(ValueRef.ofParameter("sigma_q")), p.observable("q_obs").get().noise());
        assertEquals("Q + 0.1 * P", p.observable("q_obs").get().formula());
        Observable pObs = p.observable("p_obs").orElseThrow();
        assertEquals("k_loss", pObs.scaleParameter());
        assertNull(pObs.offsetParameter());
        assertEquals(new NoiseModel.Proportional(ValueRef.ofNumber(0.01), ValueRef.ofNumber(0.05)), pObs.noise());
        assertEquals(new NoiseModel.Laplace(ValueRef.ofNumber(0.02)), p.observable("p_lap").get().noise());
        assertEquals(new NoiseModel.LogNormal(ValueRef.ofNumber(0.1)), p.observable("q_lognormal").get().noise());

        assertEquals(4, p.timecourses().size());
        TimecoursePoint t1 = p.timecourses().get(1);
        assertEquals("fed", t1.experiment());
        assertEquals(2.5, t1.time(), 0.0);
        assertEquals(0.55, t1.value(), 0.0);
        assertEquals(0.03, t1.sigma(), 0.0);
        assertEquals(4, t1.location().line(), "line of the row in the CSV, comment line counted");
        assertTrue(Double.isNaN(p.timecourses().get(0).sigma()), "empty sigma");
        assertTrue(Double.isNaN(p.timecourses().get(3).sigma()), "nan sigma");
        assertEquals("p_obs", p.timecourses().get(2).observable(), "quoted field");
        assertEquals(0.12, p.timecourses().get(2).value(), 0.0);

        assertEquals(2, p.doseResponses().size());
        assertEquals(DoseResponsePoint.History.LOW, p.doseResponses().get(0).history());
        assertEquals(DoseResponsePoint.History.HIGH, p.doseResponses().get(1).history());
        assertEquals("feed", p.doseResponses().get(1).control());

        assertEquals(2, p.thresholds().size());
        SwitchingThreshold up = p.thresholds().get(0);
        assertEquals(SwitchingThreshold.Direction.UP, up.direction());
        assertEquals(0.35, up.value(), 0.0);
        SwitchingThreshold down = p.thresholds().get(1);
        assertEquals(SwitchingThreshold.Direction.DOWN, down.direction());
        assertEquals(0.02, down.sigma(), 0.0);
        assertEquals(3, p.dataFiles().size());
    }

    private Path problem(String yaml) {
        TestFiles.write(dir.resolve("model.xml"), "<sbml/>");
        return TestFiles.write(dir.resolve("p.yaml"), yaml);
    }

    private UserInputException fails(String yaml) {
        Path f = problem(yaml);
        return assertThrows(UserInputException.class, () -> ProblemFileReader.read(f));
    }

    private static void assertMessage(UserInputException e, String... parts) {
        for (String part : parts) {
            assertTrue(e.getMessage().contains(part), "expected '" + part + "' in: " + e.getMessage());
        }
        assertTrue(!e.getMessage().contains("\n"), "one line: " + e.getMessage());
        assertTrue(e.location() != null && e.location().file() != null, "has a location");
    }

    @Test
    void minimalProblemIsValid() {
        SwitchfitProblem p = ProblemFileReader.read(problem(HEAD + PARAM + EXP_OBS));
        assertEquals(1, p.parameters().size());
        assertTrue(p.timecourses().isEmpty());
    }

    @Test
    void unknownKeySuggestsTheClosest() {
        UserInputException e = fails(HEAD + "parameters:\n  - {id: k1, lower: 1, uper: 3, start: 2}\n");
        assertMessage(e, "unknown key 'uper'", "did you mean 'upper'?", "p.yaml, line 4", "allowed keys");
        e = fails(HEAD + "experimets: []\n");
        assertMessage(e, "'experimets'", "did you mean 'experiments'?", "line 3");
    }

    @Test
    void missingModelAndDataFiles() {
        UserInputException e = assertThrows(UserInputException.class, () -> ProblemFileReader.read(
                TestFiles.write(dir.resolve("q.yaml"), "switchfit_format: 1\nmodel: nowhere.xml\n")));
        assertMessage(e, "'nowhere.xml' does not exist", "q.yaml, line 2", "correct the path");
        e = fails("switchfit_format: 1\nmodel: .\n");
        assertMessage(e, "the SBML model '.' is a folder", "p.yaml, line 2", "name the file itself");
        e = fails(HEAD + EXP_OBS + "data:\n  timecourses:\n    - file: data/none.csv\n");
        assertMessage(e, "timecourse table 'data/none.csv' does not exist", "line 10", "relative to the problem");
        e = assertThrows(UserInputException.class, () -> ProblemFileReader.read(dir.resolve("absent.yaml")));
        assertMessage(e, "problem file not found", "absent.yaml");
    }

    @Test
    void boundsAreChecked() {
        UserInputException e = fails(HEAD + "parameters:\n  - {id: k1, lower: 1, upper: 3, start: 5}\n");
        assertMessage(e, "parameter 'k1': start 5 lies outside the bounds [1, 3]", "line 4", "move the start");
        e = fails(HEAD + "parameters:\n  - {id: k1, lower: 3, upper: 3, start: 3}\n");
        assertMessage(e, "lower bound 3 is not below upper bound 3", "line 4", "swap them or widen");
        e = fails(HEAD + "parameters:\n  - {id: k1, lower: 4, upper: 3, start: 3}\n");
        assertMessage(e, "lower bound 4 is not below upper bound 3");
        e = fails(HEAD + "parameters:\n  - {id: k_deg, lower: 0, upper: 3, start: 1}\n");
        assertMessage(e, "parameter 'k_deg': lower bound 0 is impossible on log10 scale", "line 4",
                "positive bound such as 1e-8, or scale lin");
        e = fails(HEAD + "parameters:\n  - {id: k1, lower: -1, upper: 3, scale: log, start: 1}\n");
        assertMessage(e, "lower bound -1 is impossible on log scale");
        e = fails(HEAD + "parameters:\n  - {id: k1, lower: 1, upper: inf, scale: lin, start: 1}\n");
        assertMessage(e, "must be finite", "upper inf");
        e = fails(HEAD + "parameters:\n  - {id: k1, lower: 1, upper: 3, scale: log2, start: 2}\n");
        assertMessage(e, "unknown scale 'log2'", "did you mean 'log'?", "use lin, log or log10");
        e = fails(HEAD + "parameters:\n  - {id: k1, lower: one, upper: 3, start: 2}\n");
        assertMessage(e, "'one' is not a number", "line 4", "write a number");
        e = fails(HEAD + "parameters:\n  - {id: k1, lower: 1, upper: 3, start: 2, prior: {type: normal, mean: 2,"
                + " sd: 0}}\n");
        assertMessage(e, "prior normal needs", "positive finite spread", "line 4");
        e = fails(HEAD + "parameters:\n  - {id: k1, lower: 1, upper: 3, start: 2, prior: {type: gauss, mean: 2,"
                + " sd: 1}}\n");
        assertMessage(e, "unknown prior type 'gauss'", "use normal (mean, sd) or lognormal");
    }

    @Test
    void duplicateIds() {
        UserInputException e = fails(HEAD + "parameters:\n  - {id: k1, lower: 1, upper: 3, start: 2}\n"
                + "  - {id: k1, lower: 1, upper: 3, start: 2}\n");
        assertMessage(e, "parameter id 'k1' is declared twice (first on line 4)", "line 5", "rename one");
        e = fails(HEAD + "experiments:\n  - id: a\n  - id: a\n");
        assertMessage(e, "experiment id 'a' is declared twice", "line 5");
        e = fails(HEAD + EXP_OBS + "  - {id: q_obs, formula: P, noise: {type: laplace, scale: 1}}\n");
        assertMessage(e, "observable id 'q_obs' is declared twice", "line 8");
        e = fails(HEAD + "model: other.xml\n");
        assertMessage(e, "key 'model' appears twice", "line 3", "keep only one");
    }

    @Test
    void dataErrorsNameFileLineAndColumn() {
        TestFiles.write(dir.resolve("tc.csv"), "experiment,observable,time,value\nfed,q_obs,1,0.5\n"
                + "fed,q_obs,2,abc\n");
        UserInputException e = fails(HEAD + EXP_OBS + "data:\n  timecourses:\n    - file: tc.csv\n");
        assertMessage(e, "tc.csv, line 3, column 4", "column 'value': 'abc' is not a number", "such as 0.25");

        TestFiles.write(dir.resolve("tc.csv"), "experiment,observable,time,value\nfed,q_obs,1,0.5\n"
                + "rise,q_obs,2,0.7\n");
        e = fails(HEAD + EXP_OBS + "data:\n  timecourses:\n    - file: tc.csv\n");
        assertMessage(e, "tc.csv, line 3, column 1", "experiment 'rise' is not declared",
                "declare it under experiments");

        TestFiles.write(dir.resolve("tc.csv"), "experiment,observable,time,value\nfed,q_ob,1,0.5\n");
        e = fails(HEAD + EXP_OBS + "data:\n  timecourses:\n    - file: tc.csv\n");
        assertMessage(e, "observable 'q_ob' is not declared", "did you mean 'q_obs'?", "line 2");

        TestFiles.write(dir.resolve("tc.csv"), "experiment,observable,time,value,sd\nfed,q_obs,1,0.5,1\n");
        e = fails(HEAD + EXP_OBS + "data:\n  timecourses:\n    - file: tc.csv\n");
        assertMessage(e, "unknown column 'sd'", "tc.csv, line 1", "allowed columns");

        TestFiles.write(dir.resolve("tc.csv"), "experiment,observable,value\nfed,q_obs,0.5\n");
        e = fails(HEAD + EXP_OBS + "data:\n  timecourses:\n    - file: tc.csv\n");
        assertMessage(e, "timecourse table has no column 'time'", "tc.csv, line 1", "add the column");

        TestFiles.write(dir.resolve("tc.csv"), "experiment,observable,time,value,sigma\nfed,q_obs,1,0.5,-2\n");
        e = fails(HEAD + EXP_OBS + "data:\n  timecourses:\n    - file: tc.csv\n");
        assertMessage(e, "column 'sigma': -2 must be a positive", "line 2, column 5", "leave the field empty");

        TestFiles.write(dir.resolve("tc.csv"), "experiment,observable,time,value\nfed,q_obs,inf,0.5\n");
        e = fails(HEAD + EXP_OBS + "data:\n  timecourses:\n    - file: tc.csv\n");
        assertMessage(e, "time inf is not finite", "line 2", "dose-response table");

        TestFiles.write(dir.resolve("tc.csv"), "experiment,observable,time,value\nfed,q_obs,0,0.5\n"
                + "fed,q_obs,-1,0.4\n");
        e = fails(HEAD + EXP_OBS + "data:\n  timecourses:\n    - file: tc.csv\n");
        assertMessage(e, "tc.csv, line 3, column 3", "time -1 is negative", "experiments start at t = 0",
                "shift the times");

        TestFiles.write(dir.resolve("tc.csv"), "experiment,observable,time,value\nfed,q_obs,1,nan\n");
        e = fails(HEAD + EXP_OBS + "data:\n  timecourses:\n    - file: tc.csv\n");
        assertMessage(e, "'value': nan is not a finite measurement", "remove the row");

        TestFiles.write(dir.resolve("dr.csv"), "experiment,observable,dose,value,history\nfed,q_obs,1,0.5,mid\n");
        e = fails(HEAD + EXP_OBS + "data:\n  dose_responses:\n    - {file: dr.csv, control: feed}\n");
        assertMessage(e, "dr.csv, line 2, column 5", "'mid' is unknown", "use low", "or high");
        // history is required (documented so): as a column and in every row
        TestFiles.write(dir.resolve("dr.csv"), "experiment,observable,dose,value\nfed,q_obs,1,0.5\n");
        e = fails(HEAD + EXP_OBS + "data:\n  dose_responses:\n    - {file: dr.csv, control: feed}\n");
        assertMessage(e, "dose-response table has no column 'history'", "dr.csv, line 1");
        TestFiles.write(dir.resolve("dr.csv"), "experiment,observable,dose,value,history\nfed,q_obs,1,0.5,\n");
        e = fails(HEAD + EXP_OBS + "data:\n  dose_responses:\n    - {file: dr.csv, control: feed}\n");
        assertMessage(e, "dr.csv, line 2, column 5", "history");

        TestFiles.write(dir.resolve("th.csv"), "experiment,control,direction,value,sigma\nfed,feed,upward,1,0.1\n");
        e = fails(HEAD + EXP_OBS + "data:\n  thresholds:\n    - file: th.csv\n");
        assertMessage(e, "th.csv, line 2, column 3", "'upward' is unknown", "use up");

        TestFiles.write(dir.resolve("th.csv"), "experiment,control,direction,value,sigma\nfed,feed,up,1,0\n");
        e = fails(HEAD + EXP_OBS + "data:\n  thresholds:\n    - file: th.csv\n");
        assertMessage(e, "threshold sigma 0 must be a positive", "th.csv, line 2");

        e = fails(HEAD + EXP_OBS + "data:\n  thresholds:\n    - {experiment: fd, control: feed, direction: up,"
                + " value: 1, sigma: 0.1}\n");
        assertMessage(e, "undeclared experiment 'fd'", "did you mean 'fed'?", "line 10");
    }

    @Test
    void experimentErrors() {
        UserInputException e = fails(HEAD + "experiments:\n  - {id: a, settle_in: b}\n");
        assertMessage(e, "settle_in names undeclared experiment 'b'", "line 4", "declare it");
        e = fails(HEAD + "experiments:\n  - {id: a, settle_in: a}\n");
        assertMessage(e, "experiment 'a' settles in itself", "remove settle_in");
        // settle_in is one level: a chain or a cycle is refused at the settle_in naming an experiment that has one
        e = fails(HEAD + "experiments:\n  - {id: a, settle_in: b}\n  - {id: b, settle_in: a}\n");
        assertMessage(e, "experiment 'a' settles in 'b', which itself has settle_in", "line 4", "one level");
        e = fails(HEAD + "experiments:\n  - {id: a}\n  - {id: b, settle_in: a}\n  - {id: c, settle_in: b}\n");
        assertMessage(e, "experiment 'c' settles in 'b', which itself has settle_in", "line 6");
        e = fails(HEAD + "experiments:\n  - id: a\n    doses:\n      - {at: 1, target: s, set: 1, add: 2}\n");
        assertMessage(e, "exactly one of 'set'", "line 6");
        e = fails(HEAD + "experiments:\n  - id: a\n    doses:\n      - {at: 3, target: s, set: 1}\n"
                + "      - {at: 2, target: s, set: 1}\n");
        assertMessage(e, "dose time 2", "list doses in time order", "line 7");
        e = fails(HEAD + "experiments:\n  - id: a\n    parameters: {feed: 2 mM}\n");
        assertMessage(e, "'2 mM' is neither a number nor a parameter id", "line 5");
        e = fails(HEAD + "experiments:\n  - id: 3a\n");
        assertMessage(e, "'3a' is not a valid id", "line 4", "starting with a letter");
    }

    @Test
    void observableErrors() {
        UserInputException e = fails(HEAD + "observables:\n  - {id: y, formula: Q, noise: {type: gausian,"
                + " sigma: 1}}\n");
        assertMessage(e, "unknown noise type 'gausian'", "did you mean 'gaussian'?", "line 4");
        e = fails(HEAD + "observables:\n  - {id: y, formula: Q, noise: {type: gaussian, sigma: -1}}\n");
        assertMessage(e, "noise sigma -1 must be a finite number > 0", "line 4");
        // a zero spread makes the likelihood infinite: refused at the noise entry, with what is allowed
        e = fails(HEAD + "observables:\n  - id: y\n    formula: Q\n    noise: {type: gaussian, sigma: 0}\n");
        assertMessage(e, "p.yaml, line 6", "observable 'y': noise sigma 0 must be a finite number > 0",
                "or an estimated parameter id");
        e = fails(HEAD + "observables:\n  - {id: y, formula: Q, noise: {type: laplace, scale: 0}}\n");
        assertMessage(e, "noise scale 0 must be a finite number > 0", "line 4");
        e = fails(HEAD + "observables:\n  - {id: y, formula: Q, noise: {type: lognormal, sigma: 0.0}}\n");
        assertMessage(e, "noise sigma 0.0 must be a finite number > 0", "line 4");
        e = fails(HEAD + "observables:\n  - {id: y, formula: Q, noise: {type: proportional, absolute: 0, relative:"
                + " 0}}\n");
        assertMessage(e, "absolute 0 and relative 0 has no spread", "give absolute > 0 or relative > 0", "line 4");
        e = fails(HEAD + "observables:\n  - {id: y, formula: Q, noise: {type: proportional, absolute: -1, relative:"
                + " 0.1}}\n");
        assertMessage(e, "noise absolute -1 must be a finite number >= 0", "line 4");
        // one part of the proportional spread may be 0
        SwitchfitProblem ok = ProblemFileReader.read(problem(HEAD + "observables:\n  - {id: y, formula: Q, noise: "
                + "{type: proportional, absolute: 0, relative: 0.1}}\n"));
        assertEquals(1, ok.observables().size());
        e = fails(HEAD + "observables:\n  - {id: y, formula: Q, noise: {type: proportional, absolute: 1}}\n");
        assertMessage(e, "has no 'relative'", "add it");
        e = fails(HEAD + "observables:\n  - {id: y, formula: Q}\n");
        assertMessage(e, "has no 'noise'", "line 4");
        e = fails(HEAD + "observables:\n  - {id: y, formula: '  ', noise: {type: laplace, scale: 1}}\n");
        assertMessage(e, "observable 'y' has an empty formula", "line 4");
    }

    /** Keyword values (scale, noise and prior type, direction, history) are case-insensitive; keys are not. */
    @Test
    void keywordValuesIgnoreCase() {
        TestFiles.write(dir.resolve("dr.csv"), "experiment,observable,dose,value,history\nfed,q_obs,1,0.5,High\n");
        SwitchfitProblem p = ProblemFileReader.read(problem(HEAD + "parameters:\n  - {id: k1, lower: 1, upper: 3,"
                + " scale: LOG10, start: 2, prior: {type: LogNormal, mu: 0, sigma: 1}}\n"
                + "experiments:\n  - id: fed\nobservables:\n  - {id: q_obs, formula: Q, noise: {type: Gaussian,"
                + " sigma: 0.1}}\n  - {id: p_obs, formula: P, noise: {type: LAPLACE, scale: 0.1}}\n"
                + "data:\n  dose_responses:\n    - {file: dr.csv, control: feed}\n"
                + "  thresholds:\n    - {experiment: fed, control: feed, direction: Up, value: 1, sigma: 0.1}\n"));
        assertEquals(ParameterScale.LOG10, p.parameter("k1").orElseThrow().scale());
        assertEquals(Prior.logNormal(0, 1), p.parameter("k1").orElseThrow().prior());
        assertEquals(new NoiseModel.Gaussian(ValueRef.ofNumber(0.1)), p.observable("q_obs").orElseThrow().noise());
        assertEquals(new NoiseModel.Laplace(ValueRef.ofNumber(0.1)), p.observable("p_obs").orElseThrow().noise());
        assertEquals(DoseResponsePoint.History.HIGH, p.doseResponses().get(0).history());
        assertEquals(SwitchingThreshold.Direction.UP, p.thresholds().get(0).direction());
        // keys stay case-sensitive
        UserInputException e = fails(HEAD + "parameters:\n  - {ID: k1, lower: 1, upper: 3, start: 2}\n");
        assertMessage(e, "unknown key 'ID'", "did you mean 'id'?");
    }

    @Test
    void documentErrors() {
        UserInputException e = fails("switchfit_format: 2\nmodel: model.xml\n");
        assertMessage(e, "switchfit_format 2 is not supported", "line 1", "format 1");
        e = fails("model: model.xml\n");
        assertMessage(e, "has no 'switchfit_format'", "add it");
        e = fails("");
        assertMessage(e, "the problem file is empty", "start it with");
        e = fails("switchfit_format: 1\nmodel: [model.xml\n");
        assertMessage(e, "not valid YAML", "check indentation");
        e = fails("- just\n- a list\n");
        assertMessage(e, "must be a map", "line 1");
        // a second document after '---' would be ignored: refused at its first line
        e = fails(HEAD + "---\nfoo: 1\n");
        assertMessage(e, "p.yaml, line 4", "a second YAML document starts here", "remove the '---' line");
        // not UTF-8 (a byte 0xFF can start no UTF-8 sequence)
        Path binary = dir.resolve("binary.yaml");
        try {
            java.nio.file.Files.write(binary, new byte[] {(byte) 0xFF, (byte) 0xFE, 'x', '\n'});
        } catch (java.io.IOException io) {
            throw new java.io.UncheckedIOException(io);
        }
        e = assertThrows(UserInputException.class, () -> ProblemFileReader.read(binary));
        assertMessage(e, "binary.yaml", "the problem file is not UTF-8 text", "saved as UTF-8");
        assertTrue(!e.getMessage().contains("Input length"), e.getMessage());
        e = assertThrows(UserInputException.class, () -> ProblemFileReader.read(dir));
        assertMessage(e, "is a folder, not a problem file", "pass the problem YAML file");
    }
}
