package org.switchfit.linalg;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.Arrays;
import java.util.Random;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.EigenDecomposition;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

class DenseEigenvaluesTest {

    private static final long SEED = 20261202L;

    /** Sorts (re, im) pairs by real part, then imaginary part, as rows of a 2 x n array. */
    private static double[][] sorted(double[] re, double[] im, int n) {
        Integer[] idx = new Integer[n];
        for (int i = 0; i < n; i++) {
            idx[i] = i;
        }
        Arrays.sort(idx, (x, y) -> {
            int c = Double.compare(Math.rint(re[x] * 1e9), Math.rint(re[y] * 1e9));
            return c != 0 ? c : Double.compare(im[x], im[y]);
        });
        double[][] out = new double[2][n];
        for (int i = 0; i < n; i++) {
            out[0][i] = re[idx[i]];
            out[1][i] = im[idx[i]];
        }
        return out;
    }

    @ParameterizedTest
    @ValueSource(ints = {1, 2, 7, 40})
    void matchesCommonsMathOnRandomNonsymmetricMatrices(int n) {
        Random rnd = new Random(SEED + n);
        double[] a = DenseLuTest.randomMatrix(rnd, n);
        double[] re = new double[n];
        double[] im = new double[n];
        assertTrue(DenseEigenvalues.compute(a, n, re, im));
        // Oracle: Apache Commons Math 3.6.1 EigenDecomposition of the same matrix.
        EigenDecomposition cm = new EigenDecomposition(new Array2DRowRealMatrix(DenseLuTest.toRows(a, n)));
        double[][] ours = sorted(re, im, n);
        double[][] theirs = sorted(cm.getRealEigenvalues(), cm.getImagEigenvalues(), n);
        for (int i = 0; i < n; i++) {
            // Gaussian entries, n <= 40: well-conditioned eigenvalues of size ~sqrt(n); both backward stable, so
            // they agree to a few hundred eps times the norm: 1e-9 absolute leaves a wide margin.
            assertEquals(theirs[0][i], ours[0][i], 1e-9, "real part " + i);
            assertEquals(theirs[1][i], ours[1][i], 1e-9, "imaginary part " + i);
        }
    }

    @Test
    void companionMatrixHasTheRootsOfItsPolynomial() {
        // Closed form: the companion matrix of (x - 1)(x - 2)(x^2 + 1) = x^4 - 3x^3 + 3x^2 - 3x + 2 has eigenvalues
        // 1, 2, +-i.
        double[] a = {
            3, -3, 3, -2,
            1, 0, 0, 0,
            0, 1, 0, 0,
            0, 0, 1, 0};
        double[] re = new double[4];
        double[] im = new double[4];
        assertTrue(DenseEigenvalues.compute(a, 4, re, im));
        double[][] s = sorted(re, im, 4);
        // Simple roots of a degree-4 polynomial with O(1) coefficients: rounding-level error, 1e-12 absolute.
        double[][] expected = {{0, 0, 1, 2}, {-1, 1, 0, 0}};
        for (int i = 0; i < 4; i++) {
            assertEquals(expected[0][i], s[0][i], 1e-12);
            assertEquals(expected[1][i], s[1][i], 1e-12);
        }
    }
}
