package org.switchfit.profile;

import org.switchfit.fit.FitProblem;
import org.switchfit.fit.LevenbergMarquardt;
import org.switchfit.objective.Prediction;

/** What a profile holds fixed: a parameter or a prediction. Package-private. */
interface ProfileTarget {
    String name();

    int index();

    double value(double[] theta);

    double[] gradient(double[] theta);

    void fixSlope(double[] slope);

    Slice slice(LevenbergMarquardt lm, double sigmaZ, double[] theta);

    double maxStep(double sigmaZ, double[] theta);

    /**
     * First step from the curvature proposal (NaN when the curvature says nothing), floored so a locally flat
     * start does not crawl (the step then doubles while Δχ² stays flat) and capped at maxStep.
     */
    double firstStep(double proposal, double maxStep, double[] theta);

    double toLinear(double v);

    /** A parameter of the problem. */
    final class ParameterTarget implements ProfileTarget {
        private final FitProblem problem;
        private final int index;

        ParameterTarget(FitProblem problem, int index) {
            this.problem = problem;
            this.index = index;
        }

        @Override
        public String name() {
            return problem.id(index);
        }

        @Override
        public int index() {
            return index;
        }

        @Override
        public double value(double[] theta) {
            return theta[index];
        }

        @Override
        public double[] gradient(double[] theta) {
            double[] e = new double[theta.length];
            e[index] = 1;
            return e;
        }

        @Override
        public void fixSlope(double[] slope) {
            slope[index] = 1;
        }

        @Override
        public Slice slice(LevenbergMarquardt lm, double sigmaZ, double[] theta) {
            return new ParameterSlice(problem, index, lm);
        }

        @Override
        public double maxStep(double sigmaZ, double[] theta) {
            double range = problem.upper(index) - problem.lower(index);
            return Double.isFinite(range) ? 0.1 * range : Double.POSITIVE_INFINITY;
        }

        @Override
        public double firstStep(double proposal, double maxStep, double[] theta) {
            double floor = Double.isFinite(maxStep) ? 1e-4 * maxStep : 1e-4 * Math.max(1, Math.abs(theta[index]));
            double s = Double.isFinite(proposal) ? Math.max(proposal, floor) : 100 * floor;
            return Math.min(s, maxStep);
        }

        @Override
        public double toLinear(double v) {
            return problem.scale(index).toLinear(v);
        }
    }

    /** A prediction g(θ). */
    final class PredictionTarget implements ProfileTarget {
        private final FitProblem problem;
        private final Prediction g;
        private final String name;
        private final double lowerLimit;
        private final double upperLimit;

        PredictionTarget(FitProblem problem, Prediction g, String name, double lowerLimit, double upperLimit) {
            if (g.parameterCount() != problem.parameterCount()) {
                throw new IllegalArgumentException("prediction '" + name + "' has " + g.parameterCount()
                        + " parameters, the problem " + problem.parameterCount());
            }
            if (!(lowerLimit < upperLimit)) {
                throw new IllegalArgumentException("prediction limits must satisfy lower < upper, got "
                        + lowerLimit + ", " + upperLimit);
            }
            this.problem = problem;
            this.g = g;
            this.name = name;
            this.lowerLimit = lowerLimit;
            this.upperLimit = upperLimit;
        }

        @Override
        public String name() {
            return name;
        }

        @Override
        public int index() {
            return -1;
        }

        @Override
        public double value(double[] theta) {
            return g.evaluate(theta, null);
        }

        @Override
        public double[] gradient(double[] theta) {
            double[] grad = new double[theta.length];
            g.evaluate(theta, grad);
            for (int k = 0; k < grad.length; k++) {
                if (problem.isFixed(k)) {
                    grad[k] = 0;
                }
            }
            return grad;
        }

        @Override
        public void fixSlope(double[] slope) {
            // The curvature predictor is the only prior information; zeros (no prediction) when g is flat.
        }

        @Override
        public Slice slice(LevenbergMarquardt lm, double sigmaZ, double[] theta) {
            return new PredictionSlice(problem, g, lm, scale(sigmaZ, theta), lowerLimit, upperLimit);
        }

        private double scale(double sigmaZ, double[] theta) {
            if (Double.isFinite(sigmaZ) && sigmaZ > 0) {
                return sigmaZ;
            }
            return 1e-3 * Math.max(1.0, Math.abs(value(theta)));
        }

        @Override
        public double maxStep(double sigmaZ, double[] theta) {
            double range = upperLimit - lowerLimit;
            return Double.isFinite(range) ? 0.1 * range : Double.POSITIVE_INFINITY;
        }

        @Override
        public double firstStep(double proposal, double maxStep, double[] theta) {
            double floor = Double.isFinite(maxStep) ? 1e-4 * maxStep
                    : 1e-6 * Math.max(1, Math.abs(value(theta)));
            double s = Double.isFinite(proposal) ? Math.max(proposal, floor) : 1000 * floor;
            return Math.min(s, maxStep);
        }

        @Override
        public double toLinear(double v) {
            return v;
        }
    }
}
