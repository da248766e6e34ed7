package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.io.IOException;
import java.io.PrintWriter;
import java.io.StringWriter;
import java.net.URISyntaxException;
import java.nio.file.Files;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.List;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.api.io.TempDir;
import org.switchfit.report.BranchesFile;
import org.switchfit.report.Json;
import org.switchfit.report.RegionFile;
import org.switchfit.report.SweepFile;

/** The switch-analysis commands (branches, region, sweep) end to end, and their user errors. */
class SwitchCommandsTest {

    /** The demo model (repository file; its generator notes hold independent fold values). */
    private static final String DEMO = Path.of("models", "stress_switch.xml").toString();

    @TempDir
    Path dir;

    private static String res(String name) {
        try {
            return Path.of(SwitchCommandsTest.class.getResource("/sbml/" + name).toURI()).toString();
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

    private BranchesFile branches(String... args) {
        Path json = dir.resolve("branches-" + System.nanoTime() + ".json");
        List<String> a = new ArrayList<>(List.of("branches"));
        a.addAll(List.of(args));
        a.add("--json");
        a.add(json.toString());
        Result r = run(a.toArray(new String[0]));
        assertEquals(0, r.code(), r.err());
        return Json.read(json, BranchesFile.class);
    }

    private static double[] foldValues(BranchesFile f) {
        return f.folds().stream().filter(s -> s.kind() == BranchesFile.Kind.FOLD)
                .mapToDouble(BranchesFile.Special::value).sorted().toArray();
    }

    @Test
    void cubicNormalFormFoldsMatchClosedForm() throws IOException {
        Path csv = dir.resolve("b.csv");
        BranchesFile f = branches(res("cubic-fold.xml"), "--vary", "p", "--from", "-1", "--to", "1", "--csv",
                csv.toString());
        // closed form: x' = -x^3 + x + p has folds where 3x^2 = 1, p = -+2/(3 sqrt 3), x = +-1/sqrt 3
        double pf = 2 / (3 * Math.sqrt(3));
        double[] v = foldValues(f);
        assertEquals(2, v.length);
        // refined folds: Newton on the augmented system to 1e-11 relative steps; 1e-8 relative leaves margin
        assertEquals(-pf, v[0], 1e-8 * pf);
        assertEquals(pf, v[1], 1e-8 * pf);
        for (BranchesFile.Special s : f.folds()) {
            assertEquals("p", s.parameter());
            double x = s.states().get("x");
            assertEquals(1 / Math.sqrt(3), Math.abs(x), 1e-6); // fold state, |x| = 1/sqrt 3; looser (sqrt of 1e-11)
            assertEquals(-Math.signum(s.value()), Math.signum(x), 0.0);
        }
        // stability: the outer branches (|x| > 1/sqrt 3) are stable, the middle one unstable (f'(x) = 1 - 3x^2)
        List<BranchesFile.Point> pts = f.branches().get(0).points();
        for (BranchesFile.Point p : pts) {
            double x = p.states()[0];
            if (Math.abs(Math.abs(x) - 1 / Math.sqrt(3)) > 1e-3) {
                assertEquals(Math.abs(x) > 1 / Math.sqrt(3), p.stable(), "x = " + x);
            }
            assertEquals(p.value(), x * x * x - x, 1e-9); // on the steady-state curve p = x^3 - x
        }
        assertEquals(-1, pts.get(0).value(), 0.0);
        assertEquals(1, pts.get(pts.size() - 1).value(), 1e-12);
        List<String> lines = Files.readAllLines(csv);
        assertEquals("branch,point,p,stable,x", lines.get(0));
        assertEquals(pts.size() + 1, lines.size());
    }

    @Test
    void foldsOfAModelWithAFastReactionAreThoseOfItsReducedSystem() {
        // cubic-fast.xml: the normal form with x <-> y at rapid equilibrium (y = x); the total x + y follows the
        // normal form, so the folds are at p = -+2/(3 sqrt 3) with x = y = +-1/sqrt 3 and the middle branch is
        // the unstable one (derived by hand, see the file's comment)
        BranchesFile f = branches(res("cubic-fast.xml"), "--vary", "p", "--from", "-1", "--to", "1");
        double pf = 2 / (3 * Math.sqrt(3));
        double[] v = foldValues(f);
        assertEquals(2, v.length);
        assertEquals(-pf, v[0], 1e-8 * pf); // tolerances as in the normal-form test above
        assertEquals(pf, v[1], 1e-8 * pf);
        for (BranchesFile.Special s : f.folds()) {
            assertEquals(1 / Math.sqrt(3), Math.abs(s.states().get("x")), 1e-6);
            assertEquals(s.states().get("x"), s.states().get("y"), 1e-6);
        }
        for (BranchesFile.Point p : f.branches().get(0).points()) {
            double x = p.states()[0];
            if (Math.abs(Math.abs(x) - 1 / Math.sqrt(3)) > 1e-3) {
                assertEquals(Math.abs(x) > 1 / Math.sqrt(3), p.stable(), "x = " + x);
            }
            assertEquals(p.value(), x * x * x - x, 1e-9);
            assertEquals(x, p.states()[1], 1e-9); // on the fast equilibrium
        }
    }

    /**
     * The invented toggle switch of the test resources (U' = (a1 + ind)/(1 + V³) - U, V' = a2/(1 + U³) - V, a1 = 0.2,
     * a2 = 3): its states span two orders of magnitude between the branches (U from 0.007 to 12), which in an
     * unweighted arclength exhausted the default 2000 points before the second fold. Closed form, derived by hand:
     * on the steady states ind(U) = U (1 + V(U)³) - a1 with V(U) = a2/(1 + U³), so the folds are the stationary
     * points of ind(U), dind/dU = 1 + V³ + 3 U V² V'(U) with V' = -3 a2 U²/(1 + U³)², found here by bisection.
     */
    @Test
    void toggleFoldsAcrossOrdersOfMagnitudeMatchClosedForm() throws Exception {
        String model = Path.of(SwitchCommandsTest.class.getResource("/org/switchfit/cli/toggle/toggle.xml").toURI())
                .toString();
        BranchesFile f = branches(model, "--vary", "ind", "--from", "0", "--to", "20");
        double[] v = foldValues(f);
        assertEquals(2, v.length, "both folds within the default point budget");
        java.util.function.DoubleUnaryOperator slope = u -> {
            double w = 3 / (1 + u * u * u);
            double dw = -3 * 3 * u * u / ((1 + u * u * u) * (1 + u * u * u));
            return 1 + w * w * w + 3 * u * w * w * dw;
        };
        double[] expected = new double[2];
        double[][] brackets = {{1.0, 3.0}, {0.3, 1.0}}; // switch-off (minimum of ind), switch-on (maximum)
        for (int k = 0; k < 2; k++) {
            double lo = brackets[k][0];
            double hi = brackets[k][1];
            for (int it = 0; it < 200; it++) {
                double mid = 0.5 * (lo + hi);
                if ((slope.applyAsDouble(mid) > 0) == (slope.applyAsDouble(lo) > 0)) {
                    lo = mid;
                } else {
                    hi = mid;
                }
            }
            double u = 0.5 * (lo + hi);
            double w = 3 / (1 + u * u * u);
            expected[k] = u * (1 + w * w * w) - 0.2;
        }
        assertEquals(expected[0], v[0], 1e-8 * expected[0]); // refined folds, 1e-8 relative margin as above
        assertEquals(expected[1], v[1], 1e-8 * expected[1]);
        assertEquals(2, f.branches().get(0).points().stream().filter(p -> p.value() == 0.0 || p.value() == 20.0)
                .count(), "the branch reaches both ends of the range");
    }

    @Test
    void aBranchCutByThePointLimitSaysSo() throws Exception {
        String model = Path.of(SwitchCommandsTest.class.getResource("/org/switchfit/cli/toggle/toggle.xml").toURI())
                .toString();
        Result r = run("branches", model, "--vary", "ind", "--from", "0", "--to", "20", "--max-points", "20");
        assertEquals(0, r.code(), r.err());
        assertTrue(r.out().contains("MAX_POINTS"), r.out());
        assertTrue(r.out().contains("note: a direction stopped at the point limit (20)"), r.out());
    }

    @Test
    void demoModelFoldsMatchIndependentValues() {
        BranchesFile f = branches(DEMO, "--vary", "stimulus", "--from", "0", "--to", "4");
        double[] v = foldValues(f);
        assertEquals(2, v.length);
        // datasets/stress_switch-generator-notes.md: sympy nsolve at 30 digits (independent of switchfit)
        assertEquals(0.825486114450160, v[0], 1e-8 * 0.825486114450160); // refined fold, 1e-8 relative margin
        assertEquals(2.06755334253028, v[1], 1e-8 * 2.06755334253028);
        BranchesFile.Special on = f.folds().stream().filter(s -> Math.abs(s.value() - 2.0675) < 1e-3).findFirst()
                .orElseThrow();
        // same notes: ZarnA = 0.15776031439233667, QuelA = 0.80889929433526782 at the switch-on fold
        assertEquals(0.15776031439233667, on.states().get("ZarnA"), 1e-5); // state at a fold: ~sqrt of Newton tol
        assertEquals(0.80889929433526782, on.states().get("QuelA"), 1e-5);
        assertEquals(List.of("ZarnI", "ZarnA", "QuelA", "QuelI"), f.stateIds());
    }

    @Test
    void totalAndInitialValueControlsAgreeAndAreFolds() {
        // at stimulus 1.5 (inside the bistable range) the ZarnI + ZarnA total has two folds
        double[] t = foldValues(branches(DEMO, "--vary", "total:ZarnA", "--from", "0.2", "--to", "3", "--set",
                "stimulus=1.5"));
        assertEquals(2, t.length);
        // ZarnA starts at 0, so init:ZarnI moves the same total one to one
        double[] i = foldValues(branches(DEMO, "--vary", "init:ZarnI", "--from", "0.2", "--to", "3", "--set",
                "stimulus=1.5"));
        assertEquals(t[0], i[0], 1e-9 * t[0]); // same computation up to rounding of the affine map
        assertEquals(t[1], i[1], 1e-9 * t[1]);
        // a fold is a property of the point, not of the parameter varied (f = 0, det J = 0): with the total at a
        // fold value, continuation in stimulus has a fold at stimulus 1.5
        double[] s = foldValues(branches(DEMO, "--vary", "stimulus", "--from", "0", "--to", "4", "--set",
                "ZarnI=" + t[1]));
        double nearest = Math.abs(s[0] - 1.5) < Math.abs(s[s.length - 1] - 1.5) ? s[0] : s[s.length - 1];
        assertEquals(1.5, nearest, 1e-7); // two refined folds (1e-11 each) chained through the total: 1e-7
    }

    @Test
    void regionOfCuspNormalForm() {
        Path json = dir.resolve("region.json");
        Result r = run("region", res("cubic-cusp.xml"), "--vary", "p", "--from", "-1", "--to", "1", "--and", "a",
                "--from2", "-0.5", "--to2", "1", "--json", json.toString());
        assertEquals(0, r.code(), r.err());
        RegionFile f = Json.read(json, RegionFile.class);
        // Kuznetsov 2004 sec. 8.2: cusp of x' = -x^3 + a x + p at (p, a) = (0, 0)
        assertEquals(1, f.cusps().size());
        assertEquals(0, f.cusps().get(0).p1(), 1e-8); // secant on the normal-form coefficient, 1e-8 abs
        assertEquals(0, f.cusps().get(0).p2(), 1e-8);
        // fold curve p = +-2 (a/3)^(3/2): every traced point on it
        RegionFile.Curve c = f.curves().get(0);
        for (int k = 0; k < c.p1().length; k++) {
            double a = c.p2()[k];
            assertEquals(2 * Math.pow(Math.max(a, 0) / 3, 1.5), Math.abs(c.p1()[k]), 1e-8, "a = " + a);
        }
        // area between the branches for a in [0, 1]: int 4 (a/3)^(3/2) da = 8 / (5 * 3^(3/2)) = 0.30792...
        double area = shoelace(f.bistable().p1(), f.bistable().p2());
        // polygon with straight chords between ~25 points: O(h^2) error, measured 0.3 %; 1 % allowed
        assertEquals(8 / (5 * Math.pow(3, 1.5)), area, 0.01 * 0.308);
        assertTrue(r.out().contains("cusp at p = "), r.out());
    }

    private static double shoelace(double[] x, double[] y) {
        double s = 0;
        for (int i = 0; i < x.length; i++) {
            int j = (i + 1) % x.length;
            s += x[i] * y[j] - x[j] * y[i];
        }
        return Math.abs(s) / 2;
    }

    @Test
    void sweepJumpsBeyondTheFolds() throws IOException {
        Path json = dir.resolve("sweep.json");
        Path csv = dir.resolve("sweep.csv");
        Result r = run("sweep", DEMO, "--vary", "stimulus", "--from", "0", "--to", "4", "--rate", "0.005",
                "--readout", "ZarnA", "--samples", "201", "--json", json.toString(), "--csv", csv.toString());
        assertEquals(0, r.code(), r.err());
        SweepFile f = Json.read(json, SweepFile.class);
        assertEquals(2, f.runs().size());
        double up = f.runs().get(0).jumps().get(0).value();
        double down = f.runs().get(1).jumps().get(0).value();
        // a slow passage jumps after the fold (delay ~ rate^(2/3), Haberman 1979): up beyond 2.0676, down below
        // 0.8255 (fold values from the generator notes), and within 0.3 of them at rate 0.005
        assertTrue(up > 2.06755334253028 && up < 2.37, "up jump at " + up);
        assertTrue(down < 0.825486114450160 && down > 0.52, "down jump at " + down);
        SweepFile.Run u = f.runs().get(0);
        // ZarnA between 0 and the Zarn total 1 (conservation law ZarnI + ZarnA = 1), low at the start, high at the end
        for (double y : u.response()) {
            assertTrue(y > -1e-9 && y < 1 + 1e-9, "ZarnA " + y);
        }
        assertTrue(u.response()[0] < 0.01 && u.response()[u.response().length - 1] > 0.8);
        assertEquals(2 * 201 + 1, Files.readAllLines(csv).size());
    }

    /** The switch-on fold of hill-switch.xml: bisection on d/dx (x - x^4 / (1/16 + x^4)) = 0 in (0.2, 0.5). */
    private static double hillFoldOn() {
        // closed form of the fold condition derived by hand: 1 = 4 x^3 K^4 / (K^4 + x^4)^2, K^4 = 1/16; the lower
        // fold's x lies in (0.2, 0.5) (the function is 1 - 4 x^3 K^4 / (K^4 + x^4)^2: positive at 0.2, negative at
        // 0.5)
        double lo = 0.2;
        double hi = 0.5;
        for (int i = 0; i < 200; i++) {
            double x = 0.5 * (lo + hi);
            double g = 1 - 4 * x * x * x / 16 / Math.pow(1.0 / 16 + x * x * x * x, 2);
            if (g > 0) {
                lo = x;
            } else {
                hi = x;
            }
        }
        double x = 0.5 * (lo + hi);
        return x - x * x * x * x / (1.0 / 16 + x * x * x * x);
    }

    @Test
    void sweepJumpIsTheLargestChangeBetweenSamplesAndNeverBeforeTheFold() {
        double fold = hillFoldOn(); // 0.19189...
        double h = 0.7 / 400; // sample spacing of the ramp from -0.2 to 0.5 with 401 samples
        for (String rate : new String[] {"1e-9", "1e-5"}) {
            Path json = dir.resolve("hill-" + rate + ".json");
            Result r = run("sweep", res("hill-switch.xml"), "--vary", "s", "--from", "-0.2", "--to", "0.5",
                    "--rate", rate, "--json", json.toString());
            assertEquals(0, r.code(), r.err());
            SweepFile.Run up = Json.read(json, SweepFile.class).runs().get(0);
            SweepFile.Jump j = up.jumps().get(0);
            // the jump leaves the lower branch (x < 0.5 there) for the upper one (x > 1) and its sample interval
            // [value - h/2, value + h/2] ends after the fold: an up ramp cannot jump before it (slow passage
            // delays the jump, Haberman 1979); at rate 1e-9 the delay (~rate^(2/3)) is far below one interval, so
            // the interval holds the fold
            assertTrue(j.before() < 0.5 && j.after() > 1, r.out());
            assertTrue(j.value() + h / 2 > fold, r.out());
            if (rate.equals("1e-9")) {
                assertTrue(j.value() - h / 2 <= fold, r.out());
            }
            // the largest change between consecutive samples of the response array is the one reported
            double[] y = up.response();
            double big = 0;
            for (int i = 0; i + 1 < y.length; i++) {
                big = Math.max(big, Math.abs(y[i + 1] - y[i]));
            }
            assertEquals(big, j.after() - j.before(), 0.0, r.out());
            assertTrue(r.out().contains("x jumps from"), r.out());
        }
    }

    @Test
    void nonSmoothTimedOrEventfulModelsAreFlagged() {
        // a switch on the state (u > 0.5): continuation assumes a smooth right-hand side
        Result pw = run("branches", res("piecewise-switch.xml"), "--vary", "s", "--from", "-1", "--to", "1");
        assertEquals(0, pw.code(), pw.err());
        assertTrue(pw.err().contains("switches on the states") && pw.err().contains("gt(u, 0.5)"), pw.err());
        Result reg = run("region", res("piecewise-switch.xml"), "--vary", "s", "--from", "-1", "--to", "1",
                "--and", "c", "--from2", "0.5", "--to2", "2");
        assertTrue(reg.err().contains("switches on the states"), reg.err());
        // explicit time and events are ignored by the continuation, and events by the ramp
        Result t = run("branches", res("time-decay.xml"), "--vary", "k", "--from", "0.5", "--to", "2");
        assertEquals(0, t.code(), t.err());
        assertTrue(t.err().contains("depends on time explicitly"), t.err());
        Result e = run("branches", res("decay-event.xml"), "--vary", "k", "--from", "0.5", "--to", "2");
        assertEquals(0, e.code(), e.err());
        assertTrue(e.err().contains("1 event(s); continuation ignores events"), e.err());
        Result sw = run("sweep", res("decay-event.xml"), "--vary", "k", "--from", "0.5", "--to", "2", "--rate",
                "0.1", "--samples", "11");
        assertTrue(sw.err().contains("the ramp ignores events"), sw.err());
        // a --set of the varied quantity is overridden by the range: said in a note
        Result o = run("branches", res("hill-switch.xml"), "--vary", "s", "--from", "-0.5", "--to", "0.5", "--set",
                "s=5");
        assertEquals(0, o.code(), o.err());
        assertTrue(o.err().contains("note: --set s=5 is overridden by the range of --vary s"), o.err());
        // a smooth autonomous model without events gets no warning
        Result h = run("branches", res("hill-switch.xml"), "--vary", "s", "--from", "-0.5", "--to", "0.5");
        assertFalse(h.err().contains("warning"), h.err());
    }

    @Test
    void regionTracesBothFoldCurvesWhenNoCuspJoinsThem() {
        // hill-switch.xml in (s, d) over [-0.5, 0.5] x [0.5, 2]: the cusp (max h'(x) = 2.13 = d) lies outside the
        // box, so the switch-on and switch-off folds lie on two separate curves and the bistable band lies between
        // them. Reference area: the closed-form fold curves s = d x - h(x) at h'(x) = d (derived by hand), the band
        // clipped to the box and integrated over d with SciPy quad: 0.3262596557656887.
        Path json = dir.resolve("region-hill.json");
        Result r = run("region", res("hill-switch.xml"), "--vary", "s", "--from", "-0.5", "--to", "0.5", "--and",
                "d", "--from2", "0.5", "--to2", "2", "--json", json.toString());
        assertEquals(0, r.code(), r.err());
        RegionFile f = Json.read(json, RegionFile.class);
        assertEquals(2, f.curves().size(), r.out());
        java.util.regex.Matcher m = java.util.regex.Pattern.compile("bistable area ([0-9.eE+-]+)").matcher(r.out());
        assertTrue(m.find(), r.out());
        // chords between ~20 points per curve under-resolve the curved boundary by O(h^2): 2e-3 relative
        assertEquals(0.3262596557656887, Double.parseDouble(m.group(1)), 2e-3 * 0.3263, r.out());
    }

    private static void assertUserError(Result r, String... fragments) {
        assertEquals(Main.EXIT_USER_ERROR, r.code(), "stderr: " + r.err() + " stdout: " + r.out());
        String err = r.err().strip();
        assertEquals(1, err.lines().count(), "one line expected, got: " + err);
        assertTrue(err.startsWith("error: "), err);
        for (String f : fragments) {
            assertTrue(err.contains(f), "'" + f + "' missing in: " + err);
        }
    }

    @Test
    void unknownControlSuggestsValidIds() {
        assertUserError(run("branches", DEMO, "--vary", "stimulos", "--from", "0", "--to", "4"),
                "stress_switch.xml", "no parameter or compartment 'stimulos'", "did you mean 'stimulus'?",
                "control ids include: ", "k_stim");
        assertUserError(run("branches", DEMO, "--vary", "ZarnA", "--from", "0", "--to", "4"),
                "'ZarnA' is a species", "init:ZarnA", "total:ZarnA");
        assertUserError(run("branches", DEMO, "--vary", "total:Zarn", "--from", "0", "--to", "4"),
                "no species state 'Zarn'", "did you mean");
        assertUserError(run("region", DEMO, "--vary", "stimulus", "--from", "0", "--to", "4", "--and", "K_in",
                "--from2", "0.1", "--to2", "1"), "--and K_in", "did you mean 'K_inh'?");
        assertUserError(run("sweep", DEMO, "--vary", "stimulus", "--from", "0", "--to", "4", "--rate", "0.1",
                "--readout", "Zarn_A"), "--readout Zarn_A", "did you mean 'ZarnA'?");
    }

    @Test
    void emptyRangeIsRejected() {
        assertUserError(run("branches", DEMO, "--vary", "stimulus", "--from", "4", "--to", "4"),
                "--from 4 --to 4", "range is empty", "give --from smaller than --to");
        assertUserError(run("branches", DEMO, "--vary", "stimulus", "--from", "3", "--to", "1"),
                "range is empty");
        assertUserError(run("region", DEMO, "--vary", "stimulus", "--from", "0", "--to", "4", "--and", "K_inh",
                "--from2", "1", "--to2", "0.1"), "--from2 1 --to2 0.1", "range is empty");
        assertUserError(run("sweep", DEMO, "--vary", "stimulus", "--from", "0", "--to", "4", "--rate", "0"),
                "--rate 0.0", "positive");
        // bounds that are no numbers are not an empty range
        assertUserError(run("branches", DEMO, "--vary", "stimulus", "--from", "0", "--to", "Infinity"),
                "--to Infinity", "the bound must be a finite number");
        assertUserError(run("branches", DEMO, "--vary", "stimulus", "--from", "NaN", "--to", "4"),
                "--from NaN", "the bound must be a finite number");
        assertUserError(run("region", DEMO, "--vary", "stimulus", "--from", "0", "--to", "4", "--and", "K_inh",
                "--from2", "-Infinity", "--to2", "1"), "--from2 -Infinity", "the bound must be a finite number");
        // too many samples: refused in one line before anything is allocated (was an OutOfMemoryError)
        assertUserError(run("sweep", DEMO, "--vary", "stimulus", "--from", "0", "--to", "4", "--rate", "0.1",
                "--samples", "100000000"), "--samples 100000000", "between 3 and 1000000");
    }

    @Test
    void malformedSetIsRejected() {
        assertUserError(run("branches", DEMO, "--vary", "stimulus", "--from", "0", "--to", "4", "--set", "k_stim"),
                "--set", "see 'switchfit branches --help'");
        assertUserError(run("branches", DEMO, "--vary", "stimulus", "--from", "0", "--to", "4", "--set",
                "k_stim=fast"), "--set k_stim", "'fast' is not a number");
        assertUserError(run("branches", DEMO, "--vary", "stimulus", "--from", "0", "--to", "4", "--set",
                "kstim=1"), "no parameter, compartment or species 'kstim'", "did you mean 'k_stim'?");
    }

    @Test
    void noSteadyStateOrNoFoldIsAUserError() {
        // x' = p + x^2 has no steady state for p > 0 (Strogatz sec. 3.1)
        assertUserError(run("branches", res("no-steady-state.xml"), "--vary", "p", "--from", "0.5", "--to", "2"),
                "no-steady-state.xml", "no steady state found at p = 1", "check the range");
        // the demo at K_inh = 1 ... is monostable in [0, 0.5]: no fold to start a fold curve from
        assertUserError(run("region", DEMO, "--vary", "stimulus", "--from", "0", "--to", "0.5", "--and", "K_inh",
                "--from2", "0.1", "--to2", "1"), "no fold in stimulus over [0, 0.5]", "widen --from/--to");
    }

    @Test
    void compartmentsOfDifferentSizes() {
        String m = res("two-compartments.xml");
        BranchesFile f = branches(m, "--vary", "k", "--from", "0.5", "--to", "4");
        // closed form (see the model's comment); states are reported as simulate reports them, concentrations:
        // [A] V_cyt + [B] V_nuc = T = 2 with V_cyt = 1, V_nuc = 0.5, and [A] = 2 / (1 + k / k2)
        for (BranchesFile.Point p : f.branches().get(0).points()) {
            double a = p.states()[f.stateIds().indexOf("A")];
            double b = p.states()[f.stateIds().indexOf("B")];
            assertEquals(2, a + 0.5 * b, 1e-12); // reconstruction from the law: rounding only
            assertEquals(2 / (1 + p.value()), a, 1e-9); // corrector tolerance 1e-11 relative, margin
        }
        // the amount of A does not depend on the nucleus size (k = k2 = 1: amounts A = B = 1), so [A] = 1 and
        // [B] = 1 / V_nuc with the nucleus size of each point (closed form from the model's comment)
        BranchesFile g = branches(m, "--vary", "nuc", "--from", "0.25", "--to", "1");
        assertTrue(g.branches().get(0).points().size() > 2);
        for (BranchesFile.Point p : g.branches().get(0).points()) {
            assertEquals(1, p.states()[g.stateIds().indexOf("A")], 1e-9); // as above
            assertEquals(1 / p.value(), p.states()[g.stateIds().indexOf("B")], 1e-9 / p.value()); // as above
        }
        // a sweep reports [B] too: the ramp starts at the steady state of k = 0.5, amount of B 2 - 2 / 1.5, so
        // [B] = (2 / 3) / 0.5 = 4 / 3 (closed form as above)
        Path sj = dir.resolve("sweep-nuc.json");
        Result r = run("sweep", m, "--vary", "k", "--from", "0.5", "--to", "4", "--rate", "0.01", "--readout", "B",
                "--samples", "11", "--json", sj.toString());
        assertEquals(0, r.code(), r.err());
        assertEquals(4.0 / 3, Json.read(sj, SweepFile.class).runs().get(0).response()[0], 1e-9); // as above
        // init:B in its declared unit (concentration): amount 0.5 [B]0, so T = 2 + 0.5 [B]0; at k = k2 = 1,
        // A = T / 2
        BranchesFile h = branches(m, "--vary", "init:B", "--from", "0", "--to", "2");
        for (BranchesFile.Point p : h.branches().get(0).points()) {
            assertEquals((2 + 0.5 * p.value()) / 2, p.states()[h.stateIds().indexOf("A")], 1e-9); // as above
        }
    }

    @Test
    void thresholdOfMissingExperimentIsReportedByCheck() throws IOException {
        Files.copy(Path.of(DEMO), dir.resolve("model.xml"));
        Path yaml = dir.resolve("problem.yaml");
        Files.writeString(yaml, "switchfit_format: 1\nmodel: model.xml\n"
                + "parameters:\n  - {id: k_stim, lower: 0.001, upper: 10, start: 0.5}\n"
                + "experiments:\n  - id: ramp\n    parameters: {stimulus: 0}\n"
                + "observables:\n  - {id: act, formula: ZarnA, noise: {type: gaussian, sigma: 0.1}}\n"
                + "data:\n  thresholds:\n    - {experiment: rmp, control: stimulus, direction: up, value: 2.1, "
                + "sigma: 0.05}\n");
        Result r = run("check", yaml.toString());
        assertUserError(r, "problem.yaml", "undeclared experiment 'rmp'", "did you mean 'ramp'?");
        assertFalse(r.err().contains("Exception"), r.err());
    }
}
