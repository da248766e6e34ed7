package org.switchfit.continuation;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.net.URISyntaxException;
import java.nio.file.Path;
import java.util.List;
import org.hipparchus.linear.Array2DRowRealMatrix;
import org.hipparchus.linear.SingularValueDecomposition;
import org.junit.jupiter.api.Test;
import org.switchfit.model.Model;
import org.switchfit.model.Reaction;
import org.switchfit.model.SpeciesRef;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.ModelCompiler;
import org.switchfit.ode.OdeSystem;
import org.switchfit.sbml.SbmlReader;

/** The rules of {@link ActiveNetwork} on a hand-made network whose answer is known (see the model's comment). */
class ActiveNetworkTest {

    private static CompiledModel load() throws URISyntaxException {
        Path p = Path.of(ActiveNetworkTest.class.getResource("/sbml/inert-network.xml").toURI());
        Model m = SbmlReader.read(p);
        return ModelCompiler.compile(m);
    }

    /** Integer stoichiometry species x reactions in model order. */
    private static double[][] stoichiometry(CompiledModel cm) {
        List<Reaction> rx = cm.form().model().reactions();
        double[][] n = new double[cm.stateCount()][rx.size()];
        for (int r = 0; r < rx.size(); r++) {
            for (SpeciesRef s : rx.get(r).reactants()) {
                n[cm.form().stateIndex(s.species())][r] -= 1;
            }
            for (SpeciesRef s : rx.get(r).products()) {
                n[cm.form().stateIndex(s.species())][r] += 1;
            }
        }
        return n;
    }

    private static double smallestSingularValueRatio(OdeSystem sys, double[] x, double[] q) {
        int n = sys.stateCount();
        double[] j = new double[n * n];
        sys.jacobianY(0, x, q, j);
        double[][] a = new double[n][n];
        for (int i = 0; i < n; i++) {
            System.arraycopy(j, i * n, a[i], 0, n);
        }
        double[] s = new SingularValueDecomposition(new Array2DRowRealMatrix(a, false)).getSingularValues();
        return s[n - 1] / s[0];
    }

    @Test
    void findsInactiveReactionsZeroFaceAndPassiveSpecies() throws URISyntaxException {
        CompiledModel cm = load();
        double[] y0 = new double[cm.stateCount()];
        double[] p = new double[cm.parameterCount()];
        cm.initialValues(0, cm.parameterValues(), y0, p);
        int k1 = cm.parameterIndex("k1");
        ActiveNetwork net = ActiveNetwork.find(cm, p, k1, 0.5, 2.0, y0, 7L);
        // Expected by inspection of the model (its comment): r1, r2 fire; r3, r8 have zero rate constants; r4-r7
        // need P, Z or EZ, which start at zero and are produced only by reactions that need them.
        boolean[] expectActive = {true, true, false, false, false, false, false, false};
        for (int r = 0; r < expectActive.length; r++) {
            assertEquals(expectActive[r], net.reactionActive(r), "reaction r" + (r + 1));
        }
        for (String s : List.of("P", "Z", "EZ")) {
            assertTrue(net.onZeroFace(cm.form().stateIndex(s)), s + " on the zero face");
        }
        assertFalse(net.onZeroFace(cm.form().stateIndex("ES")), "ES starts at zero but r1 produces it");
        for (String s : List.of("D", "Y")) {
            assertTrue(net.passive(cm.form().stateIndex(s)), s + " influences no rate");
        }
        for (String s : List.of("E", "S", "ES")) {
            assertFalse(net.held(cm.form().stateIndex(s)), s + " stays a state");
        }
        assertEquals(6, net.inactiveReactionCount());
        assertEquals(3, net.zeroFaceCount());
        assertEquals(2, net.passiveCount());
    }

    @Test
    void activeLawsMakeTheJacobianRegularWhereStoichiometricLawsDoNot() throws URISyntaxException {
        CompiledModel cm = load();
        double[] y0 = new double[cm.stateCount()];
        double[] p = new double[cm.parameterCount()];
        cm.initialValues(0, cm.parameterValues(), y0, p);
        double[][] n = stoichiometry(cm);
        ActiveNetwork net = ActiveNetwork.find(cm, p, cm.parameterIndex("k1"), 0.5, 2.0, y0, 7L);
        ReducedSystem whole = ConservationLaws.of(n).reduce(cm);
        ReducedSystem active = ConservationLaws.of(net.mask(n)).reduce(cm);
        // Whole stoichiometry: 3 laws (E+ES+EZ, Z+EZ, S+ES+P+D+Y), 5 states. Active part: E+ES, S+ES and one
        // law per held species (P, Z, EZ, D, Y), so a single state remains.
        assertEquals(3, whole.laws().lawCount());
        assertEquals(7, active.laws().lawCount());
        assertEquals(1, active.stateCount());
        double[] q = active.parameters(p, y0);
        SteadyState ss = SteadyStateSolver.defaults().solve(active, active.reducedState(y0), q);
        double[] y = active.fullState(ss.state(), q);
        // Closed form: k1 (1 - x)^2 = k2 x with k1 = k2 = 1 gives x = (3 - sqrt 5) / 2.
        double es = (3 - Math.sqrt(5)) / 2;
        assertEquals(es, y[cm.form().stateIndex("ES")], 1e-12, "Newton to |f| <= 1e-10 with |f'| ~ 2.2: 1e-12");
        assertEquals(1.0, y[cm.form().stateIndex("D")], 0.0, "passive species held at its start value");
        assertEquals(0.0, y[cm.form().stateIndex("P")], 0.0, "zero face held at zero");
        // The same point in the stoichiometric reduction: Y is constant (k8 = 0) but not in a law, so the
        // reduced Jacobian is singular there (exact zero singular value up to rounding, 1e-12 relative), while
        // the active reduction's 1 x 1 Jacobian is -(k1 (E + S) + k2) = -(2 (1 - x) + 1) != 0.
        double[] qw = whole.parameters(p, y);
        assertTrue(smallestSingularValueRatio(whole, whole.reducedState(y), qw) < 1e-12);
        assertTrue(smallestSingularValueRatio(active, ss.state(), q) > 0.5);
        double[] j = new double[1];
        active.jacobianY(0, ss.state(), q, j);
        assertEquals(-(2 * (1 - es) + 1), j[0], 1e-12, "closed form, rounding only");
    }

    /**
     * Linear network y1 <-> y2 (rates 1 and 2), y2 -> y3 at rate constant 1e-22, y3 -> (degradation, rate 1): no
     * stoichiometric law, and no column of J is small, but y1 + y2 changes only through the 1e-22 reaction, so
     * J = [[-1, 2, 0], [1, -2 - 1e-22, 0], [0, 1e-22, -1]] has a singular value near 1e-22 against about 3.2
     * (closed form, by hand): a numerically singular direction v ~ (2, 1, 0), w ~ (1, 1, 0).
     */
    private static final OdeSystem SLOW_LEAK = new OdeSystem() {
        private static final double LEAK = 1e-22;

        public int stateCount() {
            return 3;
        }

        public int parameterCount() {
            return 0;
        }

        public void rhs(double t, double[] y, double[] p, double[] d) {
            d[0] = -y[0] + 2 * y[1];
            d[1] = y[0] - 2 * y[1] - LEAK * y[1];
            d[2] = LEAK * y[1] - y[2];
        }

        public void jacobianY(double t, double[] y, double[] p, double[] j) {
            double[] v = {-1, 2, 0, 1, -2 - LEAK, 0, 0, LEAK, -1};
            System.arraycopy(v, 0, j, 0, 9);
        }

        public void jacobianP(double t, double[] y, double[] p, double[] j) {
        }
    };

    @Test
    void numericallySingularDirectionIsHeldWhereNoColumnIsSmall() {
        // Stoichiometry of SLOW_LEAK (reactions y1->y2, y2->y1, y2->y3, y3->): full rank, no laws.
        double[][] n = {{-1, 1, 0, 0}, {1, -1, -1, 0}, {0, 0, 1, -1}};
        ReducedSystem red = ConservationLaws.of(n).reduce(SLOW_LEAK);
        assertEquals(3, red.stateCount());
        double[] x = {1.0, 0.5, 5e-23};
        double[] q = new double[0];
        assertEquals(0, ActiveNetwork.numericallyPassive(red, x, q).length, "rule 4 sees no small column");
        assertTrue(smallestSingularValueRatio(red, x, q) < 1e-20, "numerically singular (closed form ~3e-23)");
        // Hold the species with the largest |v_i w_i|: v = (2, 1, 0)/sqrt 5, w = (1, 1, 0)/sqrt 2 give 0.63 for
        // y1 and 0.32 for y2 (closed form).
        int[] held = ActiveNetwork.numericallySingular(red, x, q);
        assertEquals(1, held.length);
        assertEquals(0, held[0]);
        double[][] masked = {new double[4], n[1], n[2]};
        ReducedSystem kept = ConservationLaws.of(masked).reduce(SLOW_LEAK);
        assertEquals(2, kept.stateCount());
        double[] y = {1.0, 0.5, 5e-23};
        double[] qk = kept.parameters(new double[0], y);
        // Closed form: J without row and column 1 is [[-2 - 1e-22, 0], [1e-22, -1]], singular values 2 and 1.
        assertTrue(smallestSingularValueRatio(kept, kept.reducedState(y), qk) > 0.49);
        assertEquals(0, ActiveNetwork.numericallySingular(kept, kept.reducedState(y), qk).length,
                "numerical full rank after holding y1");
    }

    @Test
    void pickMinorChoosesRowsWithTheLargestDeterminantProduct() {
        // Two directions: V spans e0, e2 and W spans e2, e3 (closed form): only row 2 is shared, so the first
        // pivot is row 2; after eliminating it, V keeps only e0 and W only e3, whose products vanish on every
        // other row, so one row is chosen.
        double[][] v = {{1, 0, 1, 0}, {0, 0, 1, 0}};
        double[][] w = {{0, 0, 1, 0}, {0, 0, 1, 1}};
        int[] rows = ActiveNetwork.pickMinor(v, w, 4);
        org.junit.jupiter.api.Assertions.assertArrayEquals(new int[] {2}, rows);
        // Diagonal case: V = W = identity on rows 1, 3: both rows are chosen.
        double[][] v2 = {{0, 1, 0, 0}, {0, 0, 0, 1}};
        double[][] w2 = {{0, 1, 0, 0}, {0, 0, 0, 1}};
        int[] rows2 = ActiveNetwork.pickMinor(v2, w2, 4);
        java.util.Arrays.sort(rows2);
        org.junit.jupiter.api.Assertions.assertArrayEquals(new int[] {1, 3}, rows2);
    }
}
