package org.switchfit.profile;

import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.fit.LocalFit;

/** Profile slice of one parameter: the parameter is fixed at z and the bounded LM re-optimises the others. */
final class ParameterSlice implements Slice {

    private final FitProblem fixedProblem;
    private final LevenbergMarquardt lm;
    private final int index;
    private int solves;

    ParameterSlice(FitProblem problem, int index, LevenbergMarquardt lm) {
        this.fixedProblem = problem.withFixed(index, true);
        this.lm = lm;
        this.index = index;
    }

    @Override
    public ProfilePoint solve(double z, double[] warm) {
        double[] start = warm.clone();
        start[index] = z;
        solves++;
        LocalFit f = lm.minimize(fixedProblem, start);
        return new ProfilePoint(z, f.nll(), f.theta());
    }

    @Override
    public double lowerLimit() {
        return fixedProblem.lower(index);
    }

    @Override
    public double upperLimit() {
        return fixedProblem.upper(index);
    }

    @Override
    public int solves() {
        return solves;
    }
}
