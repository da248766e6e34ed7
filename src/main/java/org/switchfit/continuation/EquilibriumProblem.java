package org.switchfit.continuation;

import org.switchfit.ode.OdeSystem;

/** Equilibria f(y, p(λ)) = 0 as a curve in u = (y, λ), λ = p[control]. Owns scratch; one thread. */
final class EquilibriumProblem implements CurveProblem {
    final OdeSystem sys;
    final int n;
    final int m;
    final int control;
    final double[] p;
    final LinearAlgebra linearAlgebra;
    private final double[] y;
    private final double[] jy;
    private final double[] jp;

    EquilibriumProblem(OdeSystem sys, double[] p, int control) {
        this(sys, p, control, LinearAlgebra.AUTO);
    }

    EquilibriumProblem(OdeSystem sys, double[] p, int control, LinearAlgebra linearAlgebra) {
        this.sys = sys;
        this.linearAlgebra = linearAlgebra;
        this.n = sys.stateCount();
        this.m = sys.parameterCount();
        this.control = control;
        this.p = p.clone();
        this.y = new double[n];
        this.jy = new double[n * n];
        this.jp = new double[n * m];
    }

    @Override
    public int equationCount() {
        return n;
    }

    /** Loads u = (y, λ) into the scratch y and p; returns the scratch y. */
    double[] load(double[] u) {
        System.arraycopy(u, 0, y, 0, n);
        p[control] = u[n];
        return y;
    }

    @Override
    public void evaluate(double[] u, double[] h) {
        sys.rhs(0, load(u), p, h);
    }

    @Override
    public void jacobian(double[] u, double[] jac) {
        load(u);
        sys.jacobianY(0, y, p, jy);
        sys.jacobianP(0, y, p, jp);
        int n1 = n + 1;
        for (int i = 0; i < n; i++) {
            System.arraycopy(jy, i * n, jac, i * n1, n);
            jac[i * n1 + n] = jp[i * m + control];
        }
    }

    /**
     * Row pattern of {@code [J, f_λ]} (J's pattern plus the last column) when the bordered systems are to use the
     * sparse LU ({@link LinearAlgebra}: always for SPARSE, for AUTO when the bordered matrix passes
     * {@link LinearSolvers#isSparseBordered}), else null (dense).
     */
    @Override
    public int[][] pattern() {
        int[][] jp = linearAlgebra == LinearAlgebra.DENSE ? null : sys.jacobianPattern();
        if (jp == null) {
            return null;
        }
        long nnz = 0;
        for (int[] row : jp) {
            nnz += row.length;
        }
        if (nnz >= (long) n * n) {
            return null; // no structure known (the default pattern claims a dense Jacobian)
        }
        int[][] out = new int[n][];
        for (int i = 0; i < n; i++) {
            out[i] = LinearSolvers.union(jp[i], 0, null, 0, n);
        }
        if (linearAlgebra == LinearAlgebra.AUTO && !LinearSolvers.isSparseBordered(n, out)) {
            return null;
        }
        return out;
    }

    /** Parameters with λ from u (a copy). */
    double[] parametersAt(double[] u) {
        double[] q = p.clone();
        q[control] = u[n];
        return q;
    }
}
