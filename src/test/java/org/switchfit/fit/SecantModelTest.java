package org.switchfit.fit;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.SplittableRandom;
import org.apache.commons.math3.linear.Array2DRowRealMatrix;
import org.apache.commons.math3.linear.ArrayRealVector;
import org.apache.commons.math3.linear.CholeskyDecomposition;
import org.apache.commons.math3.linear.RealMatrix;
import org.junit.jupiter.api.Test;

/** {@link SecantModel} (Dennis, Gay and Welsch 1981 update) and the Cholesky kernel of the augmented model. */
class SecantModelTest {

    private static final long SEED = 20261202L;

    @Test
    void updateSatisfiesTheSecantEquationAndStaysSymmetric() {
        // Property stated with the update (Dennis, Gay and Welsch 1981, ACM TOMS 7(3), eq. for S+; Dennis and
        // Schnabel 1983, §10.3): S+ s = y# and S+ symmetric, for any S, s, y with yᵀs > 0.
        // Tolerance 1e-12 relative to |y#| + max|S| |s|, the size of the terms summed: a few dozen rounding
        // errors (1e-16 each) of products of that size.
        SplittableRandom rnd = new SplittableRandom(SEED);
        int n = 5;
        SecantModel sm = new SecantModel(n);
        for (int round = 0; round < 4; round++) {
            double[] s = random(rnd, n);
            double[] y = random(rnd, n);
            double[] ySharp = random(rnd, n);
            if (dot(y, s) <= 0) {
                for (int i = 0; i < n; i++) {
                    y[i] = -y[i];
                }
            }
            assertTrue(sm.update(s, y, ySharp), "seed " + SEED + " round " + round);
            double maxS = 0;
            for (int i = 0; i < n; i++) {
                for (int j = 0; j < n; j++) {
                    maxS = Math.max(maxS, Math.abs(sm.get(i, j)));
                }
            }
            double scale = Math.sqrt(dot(ySharp, ySharp)) + maxS * Math.sqrt(dot(s, s));
            for (int i = 0; i < n; i++) {
                double ss = 0;
                for (int j = 0; j < n; j++) {
                    ss += sm.get(i, j) * s[j];
                    assertEquals(sm.get(i, j), sm.get(j, i), 1e-14 * maxS, "symmetry, seed " + SEED);
                }
                assertEquals(ySharp[i], ss, 1e-12 * scale, "secant equation, seed " + SEED + " round " + round);
            }
        }
    }

    @Test
    void updateIsSkippedWhenCurvatureConditionFails() {
        // yᵀs <= 0: the denominators of the update are not positive; DGW skip the update then.
        SecantModel sm = new SecantModel(2);
        assertFalse(sm.update(new double[] {1, 0}, new double[] {-1, 0}, new double[] {3, 4}));
        assertEquals(0.0, sm.quadratic(new double[] {1, 1}), 0.0);
    }

    @Test
    void quadraticResidualModelIsRecoveredExactlyInOneDimension() {
        // Closed form: residual r(θ) = θ² - 2 (one residual). Then Σ r ∇²r = 2 r(θ), and the secant
        // y# = (J+ - J) r+ = (2θ+ - 2θ) r+ = 2 r+ s, so after one update S = y# / s = 2 r(θ+) exactly.
        double t0 = 3.0;
        double t1 = 2.0;
        double r1 = t1 * t1 - 2;
        double g0 = 2 * t0 * (t0 * t0 - 2);
        double g1 = 2 * t1 * r1;
        double s = t1 - t0;
        SecantModel sm = new SecantModel(1);
        assertTrue(sm.update(new double[] {s}, new double[] {g1 - g0}, new double[] {(2 * t1 - 2 * t0) * r1}));
        // Tolerance: 1e-14 relative, one division.
        assertEquals(2 * r1, sm.get(0, 0), 1e-14 * 2 * r1);
    }

    @Test
    void choleskySolveAgreesWithCommonsMath() {
        // Oracle: Apache Commons Math 3.6.1 CholeskyDecomposition on the same SPD matrix A = BᵀB + I.
        // Tolerance 1e-12 relative: condition number of A below 1e2 here, times rounding 1e-16 times n.
        SplittableRandom rnd = new SplittableRandom(SEED);
        int w = 6;
        double[] b = new double[w * w];
        for (int i = 0; i < b.length; i++) {
            b[i] = rnd.nextDouble(-1, 1);
        }
        double[] a = new double[w * w];
        for (int i = 0; i < w; i++) {
            for (int j = 0; j < w; j++) {
                double e = i == j ? 1.0 : 0.0;
                for (int k = 0; k < w; k++) {
                    e += b[k * w + i] * b[k * w + j];
                }
                a[i * w + j] = e;
            }
        }
        double[] rhs = random(rnd, w);
        double[] x = DampedLeastSquares.solveSymmetric(a, w, rhs);
        RealMatrix am = new Array2DRowRealMatrix(w, w);
        for (int i = 0; i < w; i++) {
            for (int j = 0; j < w; j++) {
                am.setEntry(i, j, a[i * w + j]);
            }
        }
        double[] expected = new CholeskyDecomposition(am).getSolver().solve(new ArrayRealVector(rhs)).toArray();
        assertArrayEquals(expected, x, 1e-12 * norm(expected), "seed " + SEED);
    }

    @Test
    void choleskyReportsIndefiniteMatrix() {
        // [[1, 2], [2, 1]] has eigenvalues 3 and -1 (closed form), so it has no Cholesky factor.
        assertNull(DampedLeastSquares.solveSymmetric(new double[] {1, 2, 2, 1}, 2, new double[] {1, 1}));
    }

    private static double[] random(SplittableRandom rnd, int n) {
        double[] v = new double[n];
        for (int i = 0; i < n; i++) {
            v[i] = rnd.nextDouble(-1, 1);
        }
        return v;
    }

    private static double dot(double[] a, double[] b) {
        double d = 0;
        for (int i = 0; i < a.length; i++) {
            d += a[i] * b[i];
        }
        return d;
    }

    private static double norm(double[] a) {
        return Math.sqrt(dot(a, a));
    }
}
