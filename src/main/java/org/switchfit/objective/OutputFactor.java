package org.switchfit.objective;

/**
 * A parameter θ_k that enters the residuals only as a factor of predictions: every residual that depends on it has
 * the form {@code r_i = (s g_i - m_i) / σ_i} with s the linear value of θ_k, g_i and the constant σ_i free of θ_k,
 * and nothing else depends on it (no model parameter, noise spread, prior or other residual). Typical case:
 * the scaling factor of relative data (an observable {@code scale * species}). For fixed other parameters the
 * residuals are then linear in s, so the s minimising ½|r|² is {@code s* = s Σ a_i b_i / Σ a_i²} with
 * {@code a_i = s g_i / σ_i} and {@code b_i = m_i / σ_i = a_i - r_i}, and after s → c s the residuals are
 * {@code c a_i - b_i} and every Jacobian entry of those rows is multiplied by c, except the column of θ_k itself
 * when θ_k is on the linear scale (there ∂r_i/∂s = g_i / σ_i does not change). Optimisation over such factors in
 * closed form is the hierarchical approach of Weber et al. 2011 ("Parameter estimation and identifiability of
 * biological networks using relative data", IFAC Proc. 44(1):11648-11653) and Loos et al. 2018 ("Hierarchical
 * optimization for the efficient parametrization of ODE models", Bioinformatics 34(24):4266-4273); citations from
 * memory.
 *
 * @param parameter the index k of θ_k
 * @param scale     how θ_k maps to the factor s
 * @param residuals the indices of the residuals it scales (ascending)
 */
public record OutputFactor(int parameter, Scale scale, int[] residuals) {

    /** The estimation scale of θ_k: s = θ, e^θ or 10^θ. */
    public enum Scale {
        /** s = θ. */
        LINEAR,
        /** s = e^θ. */
        LN,
        /** s = 10^θ. */
        LOG10;

        /** s for θ. */
        public double factor(double theta) {
            return this == LINEAR ? theta : this == LN ? Math.exp(theta) : Math.pow(10.0, theta);
        }

        /** θ for s; NaN for s &lt;= 0 on a log scale. */
        public double theta(double s) {
            if (this == LINEAR) {
                return s;
            }
            if (!(s > 0)) {
                return Double.NaN;
            }
            return this == LN ? Math.log(s) : Math.log10(s);
        }

        /** ds/dθ divided by s (1/s on the linear scale). */
        public double logDerivative(double s) {
            return this == LINEAR ? 1.0 / s : this == LN ? 1.0 : Math.log(10.0);
        }
    }

    /** Copies the indices. */
    public OutputFactor {
        residuals = residuals.clone();
    }

    @Override
    public int[] residuals() {
        return residuals.clone();
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof OutputFactor f && f.parameter == parameter && f.scale == scale
                && java.util.Arrays.equals(f.residuals, residuals);
    }

    @Override
    public int hashCode() {
        return 31 * parameter + java.util.Arrays.hashCode(residuals);
    }

    @Override
    public String toString() {
        return "OutputFactor[" + parameter + ", " + scale + ", " + residuals.length + " residuals]";
    }
}
