package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.nio.file.Files;
import java.nio.file.Path;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;

/** User errors of the benchmark commands: one line, exit code 2, nothing run. */
class BenchCommandsTest {

    @TempDir
    Path dir;

    @Test
    void unknownProblemNameIsAUserError() throws Exception {
        Files.createDirectories(dir.resolve("Alpha_2020"));
        Files.createDirectories(dir.resolve("Beta_2021"));
        for (String cmd : new String[] {"bench-fits", "bench-petab"}) {
            StringWriter out = new StringWriter();
            StringWriter err = new StringWriter();
            String[] args = cmd.equals("bench-fits")
                    ? new String[] {cmd, dir.toString(), "--problems", "Alpha_2020,Gamma", "--out",
                            dir.resolve("out").toString()}
                    : new String[] {cmd, dir.toString(), "--problems", "Gamma"};
            int code = Main.execute(args, new PrintWriter(out, true), new PrintWriter(err, true));
            assertEquals(2, code, cmd + ": " + err);
            String msg = err.toString().strip();
            assertEquals(1, msg.split("\n").length, msg);
            assertTrue(msg.contains("'Gamma'") && msg.contains("Alpha_2020, Beta_2021"), msg);
        }
    }
}
