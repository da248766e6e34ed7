package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.net.URISyntaxException;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;

/** The simulate command end to end, including user errors (one line, exit code 2). */
class SimulateCommandTest {

    private static String res(String name) {
        try {
            return Path.of(SimulateCommandTest.class.getResource("/sbml/" + name).toURI()).toString();
        } catch (URISyntaxException e) {
            throw new IllegalStateException(e);
        }
    }

    private record Result(int code, String out, String err) {
    }

    private static Result run(String... args) {
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.execute(args, new PrintWriter(out, true), new PrintWriter(err, true));
        return new Result(code, out.toString(), err.toString());
    }

    @Test
    void writesCsvWithTimeAndSpeciesColumns() {
        Result r = run("simulate", res("decay.xml"), "--times", "0:0.5:1", "--set", "k=0.1", "--method", "dp");
        assertEquals(0, r.code(), r.err());
        String[] lines = r.out().strip().split("\n");
        assertEquals("time,A", lines[0]);
        assertEquals(4, lines.length);
        // closed form with the override k = 0.1: [A](1) = 5 exp(-0.1)
        double a1 = Double.parseDouble(lines[3].split(",")[1]);
        assertEquals(5 * Math.exp(-0.1), a1, 1e-6); // default rtol 1e-8 on values ~5
    }

    private static void assertUserError(Result r, String... fragments) {
        assertEquals(2, r.code(), "stderr: " + r.err());
        String err = r.err().strip();
        assertEquals(1, err.lines().count(), "one line expected, got: " + err);
        assertTrue(err.startsWith("error: "), err);
        for (String f : fragments) {
            assertTrue(err.contains(f), "expected '" + f + "' in: " + err);
        }
    }

    @Test
    void aFitFolderIsSimulatedThroughItsFittedModel(@org.junit.jupiter.api.io.TempDir Path dir) throws Exception {
        java.nio.file.Files.copy(Path.of(res("decay.xml")), dir.resolve("model_fitted.xml"));
        Result viaFolder = run("simulate", dir.toString(), "--times", "0:0.5:1");
        assertEquals(0, viaFolder.code(), viaFolder.err());
        assertEquals(run("simulate", res("decay.xml"), "--times", "0:0.5:1").out(), viaFolder.out());
        Path empty = java.nio.file.Files.createDirectories(dir.resolve("empty"));
        assertUserError(run("simulate", empty.toString(), "--times", "0:1:2"), "without model_fitted.xml");
    }

    @Test
    void truncatedXmlIsOneLineUserError() {
        assertUserError(run("simulate", res("truncated.xml"), "--times", "0:1:2"), "truncated.xml", "XML");
    }

    @Test
    void nonSbmlXmlIsOneLineUserError() {
        assertUserError(run("simulate", res("not-sbml.xml"), "--times", "0:1:2"), "not-sbml.xml", "SBML");
    }

    @Test
    void undefinedIdInKineticLawIsOneLineUserError() {
        assertUserError(run("simulate", res("undefined-id.xml"), "--times", "0:1:2"), "undefined-id.xml",
                "'kk'", "deg", "define it");
    }

    @Test
    void unsupportedConstructIsOneLineUserError() {
        assertUserError(run("simulate", res("fast-coupled.xml"), "--times", "0:1:2"), "fast-coupled.xml",
                "more than three coupled fast reactions", "'ab'");
    }

    @Test
    void fastAttributeInLevel3Version2IsOneLineUserError() {
        assertUserError(run("simulate", res("fast-l3v2.xml"), "--times", "0:1:2"), "fast-l3v2.xml", "'bind'",
                "attribute 'fast'", "Level 3 Version 2", "Level 3 Version 1");
    }

    @Test
    void fastReactionWithoutEquilibriumIsOneLineUserErrorNamingIt() {
        assertUserError(run("simulate", res("fast-no-equilibrium.xml"), "--times", "0:1:2"),
                "fast-no-equilibrium.xml", "fast reaction 'flip'", "no equilibrium", "check the rate law");
    }

    @Test
    void danglingCompReferenceIsOneLineUserErrorNamingIt() {
        assertUserError(run("simulate", res("comp-dangling-deletion.xml"), "--times", "0:1:2"),
                "comp-dangling-deletion.xml", "no element has metaid 'no_such'");
    }

    @Test
    void unknownOverrideIsOneLineUserError() {
        assertUserError(run("simulate", res("decay.xml"), "--times", "0:1:2", "--set", "nope=1"), "nope",
                "settable");
    }

    @Test
    void nonFiniteOrZeroStartingValuesNameTheElementAndOption(@org.junit.jupiter.api.io.TempDir Path dir)
            throws Exception {
        // were "integration stopped at t = 0: step size fell to NaN" / "Newton corrector failed", naming nothing
        assertUserError(run("simulate", res("decay.xml"), "--times", "0:1:2", "--set", "k=NaN"), "'k'", "NaN",
                "--set k=VALUE");
        assertUserError(run("simulate", res("decay.xml"), "--times", "0:1:2", "--set", "cell=0"), "'cell'",
                "size", "positive", "--set");
        // SYNTHETIC: decay.xml with the species' initial concentration removed
        String xml = java.nio.file.Files.readString(Path.of(res("decay.xml")))
                .replace("initialConcentration=\"5\"", "");
        Path f = dir.resolve("noinit.xml");
        java.nio.file.Files.writeString(f, xml);
        assertUserError(run("simulate", f.toString(), "--times", "0:1:2"), "'A'", "initial value", "NaN");
    }

    @Test
    void negativeOrInfiniteOutputTimesAreRefused() {
        // simulations start at t = 0: -2 printed the initial state, Infinity repeated it
        assertUserError(run("simulate", res("decay.xml"), "--times=-2,-1,0,1"), "-2", "before 0");
        assertUserError(run("simulate", res("decay.xml"), "--times=-1:1:2"), "-1", "before 0");
        assertUserError(run("simulate", res("decay.xml"), "--times", "0,Infinity"), "Infinity", "finite");
    }

    @Test
    void unwritableOutputOrLogIsOneLineUserError(@org.junit.jupiter.api.io.TempDir Path dir) {
        // a directory given as output file: was "internal error" (exit 1), and for --log a stack trace
        assertUserError(run("simulate", res("decay.xml"), "--times", "0,1", "--out", dir.toString()),
                "is a directory", "give a file name");
        // a file in a folder that cannot be created (a regular file stands where the folder should be)
        Path blocker = dir.resolve("blocker");
        try {
            java.nio.file.Files.writeString(blocker, "x");
        } catch (java.io.IOException e) {
            throw new java.io.UncheckedIOException(e);
        }
        assertUserError(run("simulate", res("decay.xml"), "--times", "0,1", "--out",
                blocker.resolve("out.csv").toString()), "cannot write");
        assertUserError(run("simulate", res("decay.xml"), "--times", "0,1", "--log", dir.toString()), "--log");
    }
}
