package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.PrintWriter;
import java.io.StringWriter;
import java.net.URISyntaxException;
import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.report.BranchesFile;
import org.switchfit.report.Json;

/**
 * {@code branches} on a network whose stoichiometric laws leave the reduced Jacobian singular everywhere (zero rate
 * constants, species that stay empty, species that influence no rate; test resource inert-network.xml): the
 * active-network reduction makes it continuable, and every point matches the closed form.
 */
class BranchesActiveNetworkTest {

    @TempDir
    Path dir;

    @Test
    void continuesTheActivePartAndMatchesTheClosedForm() throws URISyntaxException {
        String model = Path.of(getClass().getResource("/sbml/inert-network.xml").toURI()).toString();
        Path json = dir.resolve("b.json");
        StringWriter out = new StringWriter();
        StringWriter err = new StringWriter();
        int code = Main.execute(new String[] {"branches", model, "--vary", "k1", "--from", "0.5", "--to", "2",
            "--json", json.toString()}, new PrintWriter(out, true), new PrintWriter(err, true));
        assertEquals(0, code, err.toString());
        assertTrue(out.toString().contains("active network: 6 of 8 reactions cannot fire; states held: 3 at zero, "
                + "2 passive, 0 numerically passive, 0 spanning numerically singular directions; 1 reduced states"),
                out.toString());
        BranchesFile f = Json.read(json, BranchesFile.class);
        List<BranchesFile.Point> pts = f.branches().get(0).points();
        assertTrue(pts.size() >= 3);
        int es = f.stateIds().indexOf("ES");
        int e = f.stateIds().indexOf("E");
        assertEquals(0.5, pts.get(0).value(), 1e-12, "branch starts on the lower bound");
        assertEquals(2.0, pts.get(pts.size() - 1).value(), 1e-12, "and ends on the upper bound");
        for (BranchesFile.Point p : pts) {
            double k1 = p.value();
            // Closed form: k1 (1 - x)^2 = k2 x with k2 = 1, smaller root.
            double b = 2 * k1 + 1;
            double x = (b - Math.sqrt(b * b - 4 * k1 * k1)) / (2 * k1);
            // Corrector tolerance 1e-11 relative on O(1) unknowns.
            assertEquals(x, p.states()[es], 1e-9, "ES at k1 = " + k1);
            assertEquals(1 - x, p.states()[e], 1e-9, "E = E_T - ES");
            assertTrue(p.stable(), "the single eigenvalue -(k1 (E + S) + k2) is negative");
        }
    }
}
