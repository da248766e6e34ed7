package org.switchfit.data;

/**
 * How a measured value scatters around the observable's prediction y. Each parameter is a number or the id of an
 * estimated parameter. Immutable.
 *
 * <ul>
 *   <li>{@link Gaussian}: value ~ Normal(y, sigma).</li>
 *   <li>{@link Proportional}: value ~ Normal(y, a + b |y|) (combined absolute and relative error).</li>
 *   <li>{@link Laplace}: value ~ Laplace(y, scale), density exp(-|value - y| / scale) / (2 scale).</li>
 *   <li>{@link LogNormal}: ln(value) ~ Normal(ln(y), sigma); values and predictions must be positive.</li>
 * </ul>
 */
public sealed interface NoiseModel permits NoiseModel.Gaussian, NoiseModel.Proportional, NoiseModel.Laplace,
        NoiseModel.LogNormal {

    /** The spelling of the model's type in problem files. */
    String typeName();

    /** Gaussian noise with standard deviation {@code sigma}. */
    record Gaussian(ValueRef sigma) implements NoiseModel {
        @Override
        public String typeName() {
            return "gaussian";
        }
    }

    /** Gaussian noise with standard deviation {@code absolute + relative * |y|}. */
    record Proportional(ValueRef absolute, ValueRef relative) implements NoiseModel {
        @Override
        public String typeName() {
            return "proportional";
        }
    }

    /** Laplace noise with scale {@code scale}. */
    record Laplace(ValueRef scale) implements NoiseModel {
        @Override
        public String typeName() {
            return "laplace";
        }
    }

    /** Log-normal noise: standard deviation {@code sigma} of the natural log of the value. */
    record LogNormal(ValueRef sigma) implements NoiseModel {
        @Override
        public String typeName() {
            return "lognormal";
        }
    }
}
