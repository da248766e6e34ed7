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
}
