package org.switchfit.linalg;

import org.ejml.data.Complex_F64;
import org.ejml.data.DMatrixRMaj;
import org.ejml.dense.row.factory.DecompositionFactory_DDRM;
import org.ejml.interfaces.decomposition.EigenDecomposition_F64;

/**
 * Eigenvalues of a dense real n x n matrix (no eigenvectors), on top of EJML's Hessenberg reduction and implicit
 * double-shift QR iteration with exceptional shifts (Francis 1961/62, The Computer Journal 4:265-271 and
 * 332-345; Golub and Van Loan, Matrix Computations, 4th ed., sec. 7.5). A second, independent implementation next
 * to the one the continuation package uses first: the QR iteration's convergence on strongly graded matrices
 * (entries spanning hundreds of orders of magnitude, as in scaled Jacobians of large signalling models) differs
 * between implementations, and a failure of one is not a property of the matrix.
 *
 * <p>Per-call allocation (setup cost, not for hot paths). Thread-safe (no shared state).
 */
public final class DenseEigenvalues {
    private DenseEigenvalues() {
    }

    /**
     * Writes the eigenvalues of the row-major matrix {@code a[i * n + j]} into re, im (unsorted; complex ones as
     * conjugate pairs).
     *
     * @param a  matrix, read only
     * @param n  order
     * @param re real parts, length &gt;= n, written
     * @param im imaginary parts, length &gt;= n, written
     * @return false when the iteration did not converge or produced a non-finite value
     */
    public static boolean compute(double[] a, int n, double[] re, double[] im) {
        if (a.length < n * n || re.length < n || im.length < n) {
            throw new IllegalArgumentException("need a of length n*n and re, im of length n for n = " + n);
        }
        if (n == 0) {
            return true;
        }
        DMatrixRMaj m = new DMatrixRMaj(n, n);
        System.arraycopy(a, 0, m.data, 0, n * n);
        EigenDecomposition_F64<DMatrixRMaj> eig = DecompositionFactory_DDRM.eig(n, false);
        if (!eig.decompose(m) || eig.getNumberOfEigenvalues() != n) {
            return false;
        }
        for (int i = 0; i < n; i++) {
            Complex_F64 c = eig.getEigenvalue(i);
            if (!Double.isFinite(c.real) || !Double.isFinite(c.imaginary)) {
                return false;
            }
            re[i] = c.real;
            im[i] = c.imaginary;
        }
        return true;
    }
}
