package org.switchfit.report;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.file.Path;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.continuation.BistableRegion;
import org.switchfit.continuation.Branch;
import org.switchfit.continuation.ContinuationSettings;
import org.switchfit.continuation.PseudoArclength;
import org.switchfit.continuation.SweepResult;
import org.switchfit.ode.OdeSystem;

/** Continuation results converted to the fit-directory records, on the cusp normal form. */
class ContinuationFilesTest {
    @TempDir
    Path dir;

    /** dx/dt = p + 3x - x^3 with p = {p}: steady states p = x^3 - 3x, folds at (p, x) = (+-2, -+1) (by hand). */
    static final class Cusp implements OdeSystem {
        @Override
        public int stateCount() {
            return 1;
        }

        @Override
        public int parameterCount() {
            return 1;
        }

        @Override
        public void rhs(double t, double[] y, double[] p, double[] dydt) {
            dydt[0] = p[0] + 3 * y[0] - y[0] * y[0] * y[0];
        }

        @Override
        public void jacobianY(double t, double[] y, double[] p, double[] jac) {
            jac[0] = 3 - 3 * y[0] * y[0];
        }

        @Override
        public void jacobianP(double t, double[] y, double[] p, double[] jac) {
            jac[0] = 1;
        }
    }

    @Test
    void branchWithTwoFolds() {
        // start on the lower branch at p = -4: x^3 - 3x = -4 has the real root x = -2.1958...; Newton inside trace
        Branch b = new PseudoArclength(ContinuationSettings.of(-4, 4)).trace(new Cusp(), new double[] {-2.2},
                new double[] {-4}, 0);
        BranchesFile f = ContinuationFiles.branches("p", new double[] {-4, 4}, List.of("x"), List.of(b), null,
                List.of(new BranchesFile.Threshold("up", 1.9, 0.1, "up", "fold1")));
        assertEquals(2, f.folds().size(), f.folds().toString());
        // Folds at p = +2 (x = -1), then p = -2 (x = +1) along the branch from the lower end; 1e-6 absolute covers
        // the fold refinement tolerance of the continuation (common practice: Newton to ~1e-10, margin x 1e4).
        assertEquals("fold1", f.folds().get(0).id());
        assertEquals(2.0, f.folds().get(0).value(), 1e-6);
        assertEquals(-1.0, f.folds().get(0).states().get("x"), 1e-6);
        assertEquals(-2.0, f.folds().get(1).value(), 1e-6);
        for (BranchesFile.Point pt : f.branches().get(0).points()) {
            double x = pt.states()[0];
            // stable iff f'(x) = 3 - 3x^2 < 0, i.e. |x| > 1; points within 1e-3 of the folds are skipped
            if (Math.abs(Math.abs(x) - 1) > 1e-3) {
                assertEquals(Math.abs(x) > 1, pt.stable(), "x = " + x);
            }
            assertEquals(x * x * x - 3 * x, pt.value(), 1e-8);
        }
        FitDirectory d = FitDirectory.of(dir);
        d.write(FitFile.BRANCHES, f);
        assertEquals(Json.toJson(f), Json.toJson(d.read(FitFile.BRANCHES)));
    }

    @Test
    void sweepAndRegion() {
        SweepResult up = new SweepResult(0.01, new double[] {0, 1, 2, 3}, new double[] {0, 0.1, 2, 2.1},
                SweepResult.Response.JUMP, 1);
        SweepResult down = new SweepResult(-0.01, new double[] {3, 2, 1, 0}, new double[] {2.1, 2, 1.9, 0},
                SweepResult.Response.JUMP, 2);
        SweepFile s = ContinuationFiles.sweep("p", "x", List.of(up, down));
        assertEquals(SweepFile.Direction.UP, s.runs().get(0).direction());
        assertEquals(SweepFile.Direction.DOWN, s.runs().get(1).direction());
        assertEquals(new SweepFile.Jump(1.5, 0.1, 2), s.runs().get(0).jumps().get(0));
        assertEquals(new SweepFile.Jump(0.5, 1.9, 0), s.runs().get(1).jumps().get(0));
        assertEquals(0.01, s.rate(), 0.0);
        BistableRegion reg = new BistableRegion(new double[][] {{0, 0}, {1, 1}, {1, -1}}, List.of(), true);
        RegionFile r = ContinuationFiles.region("a", "p", new double[] {0, 1}, new double[] {-1, 1}, List.of(), reg,
                new double[] {0.5, 0});
        assertArrayEquals(new double[] {0, 1, 1}, r.bistable().p1(), 0.0);
        assertArrayEquals(new double[] {0, 1, -1}, r.bistable().p2(), 0.0);
        assertTrue(r.closedByChord());
        assertEquals(new RegionFile.Cusp(0.5, 0), r.fitted());
    }

    /** A point whose eigenvalues were not computed is written with unknown stability, not as unstable. */
    @Test
    void stabilityUnknownWhenEigenvaluesMissing() throws Exception {
        org.switchfit.continuation.BranchPoint unknown = new org.switchfit.continuation.BranchPoint(0.5,
                new double[] {1}, -1, new double[0], new double[0], 1, 0);
        org.switchfit.continuation.BranchPoint stable = new org.switchfit.continuation.BranchPoint(0.5,
                new double[] {1}, 0, new double[] {-1}, new double[] {0}, 1, 0);
        assertEquals(null, ContinuationFiles.stability(unknown));
        assertEquals(Boolean.TRUE, ContinuationFiles.stability(stable));
        BranchesFile.Point pt = new BranchesFile.Point(0.5, new double[] {1}, null, null, null);
        String json = Json.toJson(pt);
        assertTrue(json.contains("\"stable\":null") || json.contains("\"stable\" : null"), json);
    }
}
