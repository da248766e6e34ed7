package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.testsystems.DecaySbml;
import org.switchfit.testsystems.PetabFiles;
import picocli.CommandLine;

/**
 * Help, examples and the shared output options of every command: each command's --help shows at least one example,
 * every example parses against the command's own options (so examples cannot drift from the option names), and
 * --log / --quiet exist on every command and behave as documented.
 */
class CommandHelpTest {

    @TempDir
    Path dir;

    private static Map<String, CommandLine> commands() {
        return Main.configure(new CommandLine(new Main())).getSubcommands();
    }

    @Test
    void everyCommandHasExamplesThatParse() {
        List<String> problems = new ArrayList<>();
        for (Map.Entry<String, CommandLine> e : commands().entrySet()) {
            if (e.getKey().equals("help")) {
                continue;
            }
            ProfileCommandTest.Result r = ProfileCommandTest.run(e.getKey(), "--help");
            assertEquals(0, r.code(), e.getKey());
            int at = r.out().indexOf("Example");
            if (at < 0) {
                problems.add(e.getKey() + ": no examples in --help");
                continue;
            }
            for (String line : r.out().substring(at).lines().skip(1).toList()) {
                String t = line.strip();
                if (!t.startsWith("switchfit " + e.getKey())) {
                    continue;
                }
                String[] words = t.split("\\s+");
                String[] args = Arrays.copyOfRange(words, 1, words.length);
                try {
                    Main.configure(new CommandLine(new Main())).parseArgs(args);
                } catch (CommandLine.ParameterException ex) {
                    problems.add(t + ": " + ex.getMessage());
                }
            }
        }
        assertTrue(problems.isEmpty(), String.join("\n", problems));
    }

    @Test
    void everyHelpFormatsWithoutWarnings() {
        // picocli formats descriptions with String.format; a bare '%' (found in 'branches --lu': "10 % non-zeros")
        // printed a warning on standard error and left the description unformatted
        java.io.PrintStream old = System.err;
        java.io.ByteArrayOutputStream buf = new java.io.ByteArrayOutputStream();
        System.setErr(new java.io.PrintStream(buf, true, java.nio.charset.StandardCharsets.UTF_8));
        try {
            for (CommandLine c : commands().values()) {
                c.getUsageMessage();
            }
        } finally {
            System.setErr(old);
        }
        String err = buf.toString(java.nio.charset.StandardCharsets.UTF_8);
        assertTrue(err.isEmpty(), err);
    }

    @Test
    void everyCommandTakesLogAndQuiet() {
        for (Map.Entry<String, CommandLine> e : commands().entrySet()) {
            if (e.getKey().equals("help")) {
                continue;
            }
            CommandLine.Model.CommandSpec spec = e.getValue().getCommandSpec();
            assertTrue(spec.findOption("--log") != null && spec.findOption("--quiet") != null, e.getKey());
        }
    }

    @Test
    void logReceivesOutputAndErrors() throws IOException {
        Path log = dir.resolve("logs").resolve("run.log");
        Path model = dir.resolve("model.xml");
        Files.writeString(model, DecaySbml.MODEL);
        ProfileCommandTest.Result ok = ProfileCommandTest.run("simulate", model.toString(), "--times", "0,1,2",
                "--log", log.toString(), "--quiet");
        assertEquals(0, ok.code(), ok.err());
        ProfileCommandTest.Result bad = ProfileCommandTest.run("audit", dir.resolve("nowhere").toString(), "--log",
                log.toString());
        assertEquals(2, bad.code());
        Path yaml = PetabFiles.writeDecay(dir.resolve("decay"), new double[] {2.1, 1.45, 1.12, 0.78},
                new double[] {0, 1, 2, 3}, 0.1);
        ProfileCommandTest.Result fit = ProfileCommandTest.run("fit", yaml.toString(), "--out",
                dir.resolve("fit").toString(), "--starts", "2", "--log", log.toString());
        assertEquals(0, fit.code(), fit.err());
        String text = Files.readString(log);
        // The fit's progress (one line per start) reaches the log even without a terminal.
        assertTrue(text.contains("start 0 finished (") && text.contains("start 1 finished ("), text);
        // The simulation table printed on the terminal is in the log too, and so is the error line of the second run.
        assertTrue(text.contains(ok.out().lines().findFirst().orElseThrow()), text);
        assertTrue(text.contains("switchfit simulate") && text.contains("switchfit audit"), text);
        assertTrue(text.contains("error: ") && text.contains("nowhere"), text);
    }
}
