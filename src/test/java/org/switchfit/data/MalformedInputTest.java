package org.switchfit.data;

import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;
import static org.junit.jupiter.api.Assertions.fail;

import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import java.util.SplittableRandom;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.util.UserInputException;

/**
 * Seeded mutations of valid inputs: the readers either succeed or throw a one-line {@link UserInputException} with
 * a location; never another exception type (a null pointer or class cast would be a bug, not a user error).
 */
class MalformedInputTest {

    private static final long SEED = 20261202L;
    private static final int CASES = 400;
    /** Fewer YAML cases: one Jackson YAML parse of the example takes a few ms on the shared test machine. */
    private static final int YAML_CASES = 150;

    @TempDir
    Path dir;

    private static String mutate(String text, SplittableRandom rnd) {
        StringBuilder sb = new StringBuilder(text);
        int edits = 1 + rnd.nextInt(3);
        String alphabet = " -:,{}[]\"'#\n\tx1.e";
        for (int k = 0; k < edits && sb.length() > 0; k++) {
            int pos = rnd.nextInt(sb.length());
            switch (rnd.nextInt(3)) {
                case 0 -> sb.deleteCharAt(pos);
                case 1 -> sb.insert(pos, alphabet.charAt(rnd.nextInt(alphabet.length())));
                default -> sb.setCharAt(pos, alphabet.charAt(rnd.nextInt(alphabet.length())));
            }
        }
        return sb.toString();
    }

    @Test
    void mutatedProblemFilesFailCleanly() throws Exception {
        Path root = TestFiles.copyFolder("own", dir.resolve("own"));
        String original = Files.readString(root.resolve("problem.yaml"));
        SplittableRandom rnd = new SplittableRandom(SEED);
        int accepted = 0;
        List<String> bugs = new ArrayList<>();
        for (int i = 0; i < YAML_CASES; i++) {
            Path f = root.resolve("m.yaml");
            String text = mutate(original, rnd);
            Files.writeString(f, text);
            try {
                ProblemFileReader.read(f);
                accepted++;
            } catch (UserInputException e) {
                if (e.getMessage().contains("\n") || e.location() == null) {
                    bugs.add("case " + i + ": message not one line or no location: " + e.getMessage());
                }
            } catch (RuntimeException e) {
                bugs.add("case " + i + " (seed " + SEED + "): " + e + "\n" + text);
            }
        }
        assertTrue(bugs.isEmpty(), String.join("\n", bugs));
        assertTrue(accepted < YAML_CASES, "some mutations must be rejected");
    }

    @Test
    void mutatedTablesFailCleanly() {
        String original = "experiment,observable,time,value,sigma\nfed,q_obs,0,0.10,\n\"fed\",q_obs,2.5,0.55,0.03\n"
                + "# comment\nfed,q_obs,1e1,-1.2e-1,nan\n";
        SplittableRandom rnd = new SplittableRandom(SEED + 1);
        for (int i = 0; i < CASES; i++) {
            String text = mutate(original, rnd);
            try {
                TextTable t = DelimitedReader.parse(text, "m.csv", ',');
                for (TextTable.Row r : t.rows()) {
                    for (String c : t.columns()) {
                        try {
                            r.number(c, Double.NaN);
                        } catch (UserInputException e) {
                            assertFalse(e.getMessage().contains("\n"));
                        }
                    }
                }
            } catch (UserInputException e) {
                assertTrue(e.location() != null && "m.csv".equals(e.location().file()), e.getMessage());
            } catch (RuntimeException e) {
                fail("case " + i + " (seed " + (SEED + 1) + "): " + e + "\n" + text, e);
            }
        }
    }
}
