package org.switchfit.continuation;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.LUDecomposition;
import org.apache.commons.math3.linear.SingularValueDecomposition;
import org.junit.jupiter.api.Test;

class ConservationLawsTest {

    /**
     * Goldbeter-Koshland cycle with explicit enzyme-substrate complexes (Goldbeter and Koshland 1981, PNAS
     * 78:6840-6844). Species S, Sp, E, F, ES, FSp; reactions S+E->ES, ES->S+E, ES->Sp+E, Sp+F->FSp, FSp->Sp+F,
     * FSp->S+F. Conserved by inspection (closed form): E+ES, F+FSp, S+Sp+ES+FSp.
     */
    private static final int[][] GK = {
        {-1, 1, 0, 0, 0, 1},
        {0, 0, 1, -1, 1, 0},
        {-1, 1, 1, 0, 0, 0},
        {0, 0, 0, -1, 1, 1},
        {1, -1, -1, 0, 0, 0},
        {0, 0, 0, 1, -1, -1}};
    private static final double[][] GK_EXPECTED = {
        {0, 0, 1, 0, 1, 0},
        {0, 0, 0, 1, 0, 1},
        {1, 1, 0, 0, 1, 1}};

    @Test
    void goldbeterKoshlandLawsAreExactAndSpanTheKnownOnes() {
        ConservationLaws laws = ConservationLaws.of(GK);
        assertEquals(3, laws.lawCount());
        double[][] stacked = new double[6][6];
        for (int c = 0; c < 3; c++) {
            long[] l = laws.coefficients(c);
            for (int j = 0; j < 6; j++) {
                long s = 0;
                for (int i = 0; i < 6; i++) {
                    s += l[i] * GK[i][j];
                }
                assertEquals(0, s, "law " + c + " times reaction " + j);
            }
            for (int i = 0; i < 6; i++) {
                assertTrue(l[i] == 0 || l[i] == 1, "small non-negative coefficients: " + java.util.Arrays.toString(l));
                stacked[c][i] = l[i];
            }
            stacked[c + 3] = GK_EXPECTED[c];
        }
        // Oracle: Commons Math SVD rank of [computed; expected] is 3 iff both span the same space.
        assertEquals(3, new SingularValueDecomposition(new Array2DRowRealMatrix(stacked)).getRank());
        assertEquals(3, laws.independentSpecies().length);
    }

    @Test
    void rationalEntriesGiveTheSameIntegerLaw() {
        // A -> 2B: law 2A + B (closed form); given as A -> 2B scaled by 1/2 and by 1/3.
        ConservationLaws a = ConservationLaws.of(new int[][] {{-1}, {2}});
        ConservationLaws b = ConservationLaws.of(new double[][] {{-0.5}, {1.0}});
        ConservationLaws c = ConservationLaws.of(new double[][] {{-1.0 / 3}, {2.0 / 3}});
        assertArrayEquals(new long[] {2, 1}, a.coefficients(0));
        assertArrayEquals(new long[] {2, 1}, b.coefficients(0));
        assertArrayEquals(new long[] {2, 1}, c.coefficients(0));
    }

    @Test
    void nonRationalEntryIsRejectedWithPosition() {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class,
                () -> ConservationLaws.of(new double[][] {{-1, 0}, {Math.PI, 1}}));
        assertTrue(e.getMessage().contains("(1, 0)"), e.getMessage());
    }

    @Test
    void noLawsWhenFullRank() {
        ConservationLaws laws = ConservationLaws.of(new int[][] {{1, 0}, {-1, 1}});
        assertEquals(0, laws.lawCount());
    }

    @Test
    void reducedSystemHasExactJacobiansAndNonSingularJacobian() {
        ConservationLaws laws = ConservationLaws.of(TestSystems.PHOSPHO_STOICH);
        assertEquals(1, laws.lawCount());
        ReducedSystem red = laws.reduce(TestSystems.PHOSPHO_FEEDBACK);
        double[] p = {0.1, 1.0, 0.5, 1.0};
        double[] y = {0.7, 0.3};
        double[] q = red.parameters(p, y);
        assertEquals(1.0, q[4], 1e-15, "total S + Sp");
        double[] x = red.reducedState(y);
        assertArrayEquals(y, red.fullState(x, q), 1e-15);
        // Property test (common practice): analytic Jacobians against central differences; 1e-7 relative
        // covers the O(h^2) truncation with h = 1e-6.
        assertTrue(TestSystems.jacobianYError(red, x, q) < 1e-7);
        assertTrue(TestSystems.jacobianPError(red, x, q) < 1e-7);
        double[] fullJ = new double[4];
        TestSystems.PHOSPHO_FEEDBACK.jacobianY(0, y, p, fullJ);
        assertFalse(new LUDecomposition(new Array2DRowRealMatrix(new double[][] {
            {fullJ[0], fullJ[1]}, {fullJ[2], fullJ[3]}})).getSolver().isNonSingular(), "full J is singular");
        double[] redJ = new double[1];
        red.jacobianY(0, x, q, redJ);
        assertTrue(Math.abs(redJ[0]) > 0.1, "reduced J is regular");
    }

    @Test
    void wrongStateCountIsRejected() {
        ConservationLaws laws = ConservationLaws.of(GK);
        assertThrows(IllegalArgumentException.class, () -> laws.reduce(TestSystems.CUBIC));
    }

    @Test
    void enzymeComplexReductionHasExactJacobians() {
        ReducedSystem red = ConservationLaws.of(TestSystems.GK_STOICH).reduce(TestSystems.GK_FEEDBACK);
        double[] y = {0.6, 0.3, 0.02, 0.07, 0.01, 0.03};
        double[] q = red.parameters(new double[] {10, 1, 1, 10, 1, 1, 20, 0.2}, y);
        double[] x = red.reducedState(y);
        assertArrayEquals(y, red.fullState(x, q), 1e-15);
        // Property test (common practice): central differences, 1e-7 relative for h = 1e-6.
        assertTrue(TestSystems.jacobianYError(TestSystems.GK_FEEDBACK, y, new double[] {10, 1, 1, 10, 1, 1, 20,
            0.2}) < 1e-7, "full model Jacobian");
        assertTrue(TestSystems.jacobianPError(TestSystems.GK_FEEDBACK, y, new double[] {10, 1, 1, 10, 1, 1, 20,
            0.2}) < 1e-7, "full model parameter Jacobian");
        assertTrue(TestSystems.jacobianYError(red, x, q) < 1e-7);
        assertTrue(TestSystems.jacobianPError(red, x, q) < 1e-7);
    }

    /**
     * A seeded signalling-like network owned by this test: 40 monomers, 110 complexes formed by binding two
     * earlier species (A + B <-> C), some conversions A -> B, synthesis and degradation of a few monomers, and a
     * half-integer stoichiometry on one reaction. 150 species, so the large-network path (two elimination orders)
     * runs. The moieties of monomers without synthesis/degradation are conserved by construction.
     */
    private static double[][] bindingNetwork(long seed) {
        java.util.SplittableRandom rng = new java.util.SplittableRandom(seed);
        int monomers = 40;
        int n = 150;
        java.util.List<double[]> cols = new java.util.ArrayList<>();
        for (int c = monomers; c < n; c++) {
            int a = rng.nextInt(c);
            int b = rng.nextInt(c);
            double[] fwd = new double[n];
            fwd[a] -= 1;
            fwd[b] -= 1;
            fwd[c] += 1;
            cols.add(fwd);
            double[] back = new double[n];
            for (int i = 0; i < n; i++) {
                back[i] = -fwd[i];
            }
            cols.add(back);
        }
        for (int k = 0; k < 20; k++) {
            double[] conv = new double[n];
            int a = rng.nextInt(n);
            int b = rng.nextInt(n);
            if (a != b) {
                conv[a] = -1;
                conv[b] = 1;
                cols.add(conv);
            }
        }
        for (int k = 0; k < 6; k++) {
            double[] syn = new double[n];
            syn[rng.nextInt(monomers)] = 1;
            cols.add(syn);
        }
        double[] half = new double[n];
        half[monomers] = -0.5;
        half[monomers + 1] = 0.5;
        cols.add(half);
        double[][] stoich = new double[n][cols.size()];
        for (int r = 0; r < cols.size(); r++) {
            for (int i = 0; i < n; i++) {
                stoich[i][r] = cols.get(r)[i];
            }
        }
        return stoich;
    }

    private static void assertSameLaws(ConservationLaws expected, ConservationLaws actual) {
        assertEquals(expected.lawCount(), actual.lawCount());
        assertArrayEquals(expected.dependentSpecies(), actual.dependentSpecies());
        assertArrayEquals(expected.independentSpecies(), actual.independentSpecies());
        for (int c = 0; c < expected.lawCount(); c++) {
            assertArrayEquals(expected.coefficients(c), actual.coefficients(c), "law " + c);
        }
    }

    /** l^T N = 0 exactly (BigInteger arithmetic on the stoichiometry doubled, which makes it integer). */
    private static void assertExact(ConservationLaws laws, double[][] stoich) {
        for (int c = 0; c < laws.lawCount(); c++) {
            long[] l = laws.coefficients(c);
            for (int j = 0; j < stoich[0].length; j++) {
                java.math.BigInteger s = java.math.BigInteger.ZERO;
                for (int i = 0; i < stoich.length; i++) {
                    s = s.add(java.math.BigInteger.valueOf(l[i]).multiply(
                            java.math.BigInteger.valueOf(Math.round(2 * stoich[i][j]))));
                }
                assertEquals(0, s.signum(), "law " + c + " times reaction " + j);
            }
        }
    }

    @Test
    void longEliminationGivesTheLawsOfTheBigIntegerEliminationOnABindingNetwork() {
        double[][] stoich = bindingNetwork(20261202L);
        ConservationLaws fast = ConservationLaws.of(stoich);
        ConservationLaws reference = ConservationLaws.ofBigIntegerOnly(stoich, null);
        assertSameLaws(reference, fast);
        assertExact(fast, stoich);
        // Oracle for the count: n - rank N, rank from a Commons Math SVD (entries 0, +-1, +-0.5: well separated).
        int rank = new SingularValueDecomposition(new Array2DRowRealMatrix(stoich)).getRank();
        assertEquals(stoich.length - rank, fast.lawCount());
        assertTrue(fast.lawCount() > 0, "the network has conserved moieties by construction");
        // The abundance-ordered variant (used by the switch-analysis commands) takes the same two paths.
        double[] abundance = new double[stoich.length];
        java.util.SplittableRandom rng = new java.util.SplittableRandom(7L);
        for (int i = 0; i < abundance.length; i++) {
            abundance[i] = Math.pow(10, 12 * rng.nextDouble() - 6);
        }
        assertSameLaws(ConservationLaws.ofBigIntegerOnly(stoich, abundance), ConservationLaws.of(stoich, abundance));
        // Held species (zero rows) and switched-off reactions (zero columns), as ActiveNetwork#mask produces.
        double[][] masked = new double[stoich.length][];
        for (int i = 0; i < stoich.length; i++) {
            masked[i] = i % 7 == 3 ? new double[stoich[i].length] : stoich[i].clone();
            for (int j = 0; j < masked[i].length; j += 5) {
                masked[i][j] = 0;
            }
        }
        assertSameLaws(ConservationLaws.ofBigIntegerOnly(masked, abundance), ConservationLaws.of(masked, abundance));
    }

    @Test
    void overflowOfTheLongEliminationFallsBackToBigIntegerWithTheSameLaws() {
        // Entries near 1e9 whose columns each sum to zero, so the only law is (1, 1, 1, 1, 1) (closed form: every
        // reaction conserves the sum; rank 4 by the Commons Math SVD below). The second elimination step already
        // needs products near 1e27, beyond the long range (9.2e18), while the law itself is small.
        double[][] stoich = {
            {999_999_937, 999_999_929, 1, 7},
            {-999_999_893, 2, 999_999_883, 1},
            {3, -999_999_797, 5, 999_999_761},
            {7, 11, -999_999_757, 13},
            {0, 0, 0, 0}};
        for (int j = 0; j < 4; j++) {
            double sum = 0;
            for (int i = 0; i < 4; i++) {
                sum += stoich[i][j];
            }
            stoich[4][j] = -sum;
        }
        long[][] t = new long[4][5];
        for (int i = 0; i < 5; i++) {
            for (int j = 0; j < 4; j++) {
                t[j][i] = (long) stoich[i][j];
            }
        }
        assertThrows(ArithmeticException.class,
                () -> ConservationLaws.eliminateLong(t, 5, 4, new int[] {0, 1, 2, 3, 4}),
                "the long path must detect the overflow (this matrix needs the fallback)");
        ConservationLaws laws = ConservationLaws.of(stoich);
        assertSameLaws(ConservationLaws.ofBigIntegerOnly(stoich, null), laws);
        assertEquals(1, laws.lawCount(), "5 species, 4 reactions of full rank (Commons Math SVD below)");
        assertArrayEquals(new long[] {1, 1, 1, 1, 1}, laws.coefficients(0));
        assertEquals(4, new SingularValueDecomposition(new Array2DRowRealMatrix(stoich)).getRank());
        assertExact(laws, stoich);
    }
}
