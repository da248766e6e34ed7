package org.switchfit.objective;

import org.switchfit.fit.FitProblem;
import org.switchfit.problem.EstimationProblem;
import org.switchfit.problem.FreeParameter;

/** Test helper: the fit problem of a likelihood objective, every parameter free within its bounds (θ scale). */
final class Fits {
    private Fits() {
    }

    static FitProblem problem(LikelihoodObjective obj) {
        EstimationProblem p = obj.problem();
        int np = p.parameterCount();
        String[] ids = new String[np];
        double[] lo = new double[np];
        double[] hi = new double[np];
        for (int j = 0; j < np; j++) {
            FreeParameter fp = p.parameters().get(j);
            ids[j] = fp.id();
            lo[j] = fp.thetaLower();
            hi[j] = fp.thetaUpper();
        }
        return FitProblem.of(obj, ids, lo, hi);
    }
}
