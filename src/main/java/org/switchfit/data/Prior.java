package org.switchfit.data;

import java.util.List;
import java.util.Locale;

/**
 * A prior distribution on a parameter, as written in a problem file. The meaning of {@code parameters} depends on
 * the type (see {@link Type}); for the {@code PARAMETER_SCALE_*} types the distribution is on the parameter's
 * estimation scale, for the others on the linear scale (PEtab v1 specification, "Parameter table"). An empty
 * parameter list for a uniform type means "the parameter's bounds". Immutable.
 *
 * @param type       the distribution family
 * @param parameters the family's parameters in the order listed on {@link Type}
 */
public record Prior(Type type, List<Double> parameters) {

    /** Distribution families. */
    public enum Type {
        /** Uniform(lower, upper). */
        UNIFORM("uniform", 2),
        /** Normal(mean, standard deviation). */
        NORMAL("normal", 2),
        /** Laplace(location, scale). */
        LAPLACE("laplace", 2),
        /** Log-normal(mu, sigma): log of the parameter is normal with mean mu and standard deviation sigma. */
        LOG_NORMAL("logNormal", 2),
        /** Log-Laplace(location, scale) on the natural log of the parameter. */
        LOG_LAPLACE("logLaplace", 2),
        /** Uniform on the estimation scale. */
        PARAMETER_SCALE_UNIFORM("parameterScaleUniform", 2),
        /** Normal(mean, sd) on the estimation scale. */
        PARAMETER_SCALE_NORMAL("parameterScaleNormal", 2),
        /** Laplace(location, scale) on the estimation scale. */
        PARAMETER_SCALE_LAPLACE("parameterScaleLaplace", 2);

        private final String petabName;
        private final int arity;

        Type(String petabName, int arity) {
            this.petabName = petabName;
            this.arity = arity;
        }

        /** Spelling in PEtab v1 parameter tables. */
        public String petabName() {
            return petabName;
        }

        /** Number of distribution parameters. */
        public int arity() {
            return arity;
        }

        /** The type spelled {@code name} in a PEtab table (case-insensitive), or null. */
        public static Type fromPetabName(String name) {
            String n = name.strip().toLowerCase(Locale.ROOT);
            for (Type t : values()) {
                if (t.petabName.toLowerCase(Locale.ROOT).equals(n)) {
                    return t;
                }
            }
            return null;
        }

        /** Whether the parameter list may be left empty (uniform types default to the bounds). */
        public boolean parametersOptional() {
            return this == UNIFORM || this == PARAMETER_SCALE_UNIFORM;
        }
    }

    /**
     * @throws IllegalArgumentException when the number of parameters does not fit the type
     */
    public Prior {
        parameters = List.copyOf(parameters);
        if (parameters.size() != type.arity() && !(parameters.isEmpty() && type.parametersOptional())) {
            throw new IllegalArgumentException(String.format(Locale.ROOT,
                    "prior %s takes %d parameters, got %d", type.petabName(), type.arity(), parameters.size()));
        }
    }

    /** Normal(mean, sd) on the linear scale. */
    public static Prior normal(double mean, double sd) {
        return new Prior(Type.NORMAL, List.of(mean, sd));
    }

    /** Log-normal: ln(parameter) ~ Normal(mu, sigma). */
    public static Prior logNormal(double mu, double sigma) {
        return new Prior(Type.LOG_NORMAL, List.of(mu, sigma));
    }

    /** Parameter {@code i} of the family. */
    public double parameter(int i) {
        return parameters.get(i);
    }
}
