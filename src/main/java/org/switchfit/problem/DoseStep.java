package org.switchfit.problem;

import org.switchfit.util.SourceLocation;

/**
 * A dose of a simulation experiment resolved against the compiled model: at {@code time} a state or a model
 * parameter is set to the amount or increased by it. The state and the parameter vector change there; the dose time
 * does not depend on θ, so the sensitivities are continuous except for the dosed quantity itself. Immutable.
 *
 * @param time          dose time (model time units, at or after 0)
 * @param state         index of the dosed state, or -1
 * @param parameter     index of the dosed entry of the model parameter vector p_eff, or -1 (exactly one of
 *                      state and parameter is set)
 * @param add           true: target += amount; false: target := amount
 * @param amount        the amount, a constant or an estimated parameter's linear value
 * @param sizeParameter index into p_eff of the compartment size that converts the amount (a concentration) into
 *                      the state (an amount): species given in concentration units whose state is their amount;
 *                      -1 when the amount is in the state's own units
 * @param location      where the dose was declared
 */
public record DoseStep(double time, int state, int parameter, boolean add, ValueSource amount, int sizeParameter,
                       SourceLocation location) {

    /** Validates the indices. */
    public DoseStep {
        if ((state < 0) == (parameter < 0) || !(time >= 0) || Double.isInfinite(time)) {
            throw new IllegalArgumentException("a dose needs exactly one of state / parameter and a finite time >= 0;"
                    + " got state " + state + ", parameter " + parameter + ", time " + time);
        }
    }
}
