package org.switchfit.ode;

import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Set;
import org.switchfit.model.Compartment;
import org.switchfit.model.Model;
import org.switchfit.model.Species;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Checks the starting point of a simulation before integrating: a NaN or infinite initial value (a species without
 * initial value, an initial assignment 1/0, a value "NaN"), a compartment holding species with a size that is not
 * positive, or a parameter that makes the right-hand side non-finite. Without this check such a model surfaced as
 * an integrator failure at t = 0 ("step size fell to NaN"), naming no element.
 */
public final class InitialValueCheck {
    private InitialValueCheck() {
    }

    /**
     * @param cm        compiled model
     * @param pDeclared declared parameter values (read only), overrides included
     * @param setIds    ids whose values came from a command-line option (named in the message), may be empty
     * @param option    the option's name for the message, e.g. {@code "--set"}
     * @throws UserInputException naming the first offending element and its value
     */
    public static void require(CompiledModel cm, double[] pDeclared, Set<String> setIds, String option) {
        Model model = cm.form().model();
        String file = model.source();
        int n = cm.stateCount();
        int m = cm.parameterCount();
        double[] y = new double[n];
        double[] p = new double[m];
        cm.initialValues(0.0, pDeclared, y, p);
        List<String> states = cm.form().stateIds();
        List<String> params = cm.parameterIds();
        Set<String> holding = new HashSet<>();
        for (Species s : model.species()) {
            holding.add(s.compartment());
        }
        for (Compartment c : model.compartments()) {
            double v = valueOf(c.id(), states, y, params, p);
            if (holding.contains(c.id()) && !(v > 0) || Double.isInfinite(v)) {
                throw error(file, c.id(), "the size of compartment '" + c.id() + "' is " + fmt(v) + " at t = 0, "
                        + "but it holds species (their concentrations need a positive, finite size)", setIds, option);
            }
        }
        for (int i = 0; i < n; i++) {
            if (!Double.isFinite(y[i])) {
                throw error(file, states.get(i), "the initial value of '" + states.get(i) + "' is " + fmt(y[i])
                        + " (no initial value given, or its value or initial assignment is not a finite number, "
                        + "e.g. a division by 0)", setIds, option);
            }
        }
        double[] dy = new double[n];
        cm.rhs(0.0, y, p, dy);
        for (int i = 0; i < n; i++) {
            if (!Double.isFinite(dy[i])) {
                for (int k = 0; k < m; k++) {
                    if (!Double.isFinite(p[k])) {
                        throw error(file, params.get(k), "'" + params.get(k) + "' is " + fmt(p[k]) + " at t = 0"
                                + (setIds.contains(params.get(k)) ? " (set by " + option + ")" : "")
                                + ", which makes the rate of change of '" + states.get(i) + "' " + fmt(dy[i]),
                                setIds, option);
                    }
                }
                throw new UserInputException(SourceLocation.ofElement(file, states.get(i)), "the rate of change of '"
                        + states.get(i) + "' is " + fmt(dy[i]) + " at t = 0 (e.g. a division by 0); check the rate "
                        + "laws and rules that change it");
            }
        }
    }

    private static double valueOf(String id, List<String> states, double[] y, List<String> params, double[] p) {
        int i = states.indexOf(id);
        if (i >= 0) {
            return y[i];
        }
        int k = params.indexOf(id);
        return k >= 0 ? p[k] : 1.0; // a size fixed into the equations: checked when the model was compiled
    }

    private static UserInputException error(String file, String id, String what, Set<String> setIds, String option) {
        String fix = setIds.contains(id) ? "pass a finite" + (what.startsWith("the size") ? ", positive" : "")
                + " value with " + option + " " + id + "=VALUE" : "give it a finite"
                + (what.startsWith("the size") ? ", positive" : "") + " value in the model (or with " + option + " "
                + id + "=VALUE)";
        String origin = setIds.contains(id) && !what.contains("(set by") ? " (set by " + option + ")" : "";
        return new UserInputException(SourceLocation.ofElement(file, id), what + origin + "; " + fix);
    }

    private static String fmt(double v) {
        return Double.isNaN(v) ? "NaN" : String.format(Locale.ROOT, "%.6g", v);
    }
}
