package org.switchfit.cli;

import java.util.ArrayList;
import java.util.List;
import java.util.Locale;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * A control quantity of the switch-analysis commands, named on the command line as a global parameter or
 * compartment id, {@code init:SPECIES} (a species' initial value, which matters through the conservation totals
 * it enters) or {@code total:SPECIES} (the total of the conservation law containing the species). Internally the
 * continuation runs in entry {@code index} of the reduced parameter vector q; the user value is
 * {@code offset + scale * q[index]}. Immutable.
 *
 * @param label  the name as given
 * @param index  index into q (the reduced parameters: model parameters, then totals)
 * @param scale  user units per q unit (non-zero)
 * @param offset user value at q = 0
 */
record ControlQuantity(String label, int index, double scale, double offset) {

    /** User value of the q entry. */
    double toUser(double qv) {
        return offset + scale * qv;
    }

    /** q entry for the user value. */
    double toQ(double v) {
        return (v - offset) / scale;
    }

    /**
     * Resolves a control name.
     *
     * @param option the option it came from (for messages)
     * @param y0     full initial state
     * @param q0     reduced parameters at the initial state
     */
    static ControlQuantity resolve(SwitchModel sm, String name, String option, double[] y0, double[] q0) {
        String id = name.strip();
        SourceLocation where = SourceLocation.ofFile(sm.file.toString());
        if (id.startsWith("init:") || id.startsWith("total:")) {
            boolean init = id.startsWith("init:");
            String sp = id.substring(id.indexOf(':') + 1);
            int i = sm.states.indexOf(sp);
            if (i < 0 || !sm.compiled.form().isSpecies(sp)) {
                throw new UserInputException(where, String.format(Locale.ROOT, "%s %s: the model has no species "
                        + "state '%s'%s; species states include: %s", option, name, sp,
                        SwitchModel.didYouMean(sp, speciesStates(sm)), SimulateCommand.abbreviate(speciesStates(sm))));
            }
            List<Integer> in = new ArrayList<>();
            int dependentLaw = -1;
            int[] dep = sm.laws.dependentSpecies();
            for (int c = 0; c < sm.laws.lawCount(); c++) {
                if (sm.laws.coefficients(c)[i] != 0) {
                    in.add(c);
                    if (dep[c] == i) {
                        dependentLaw = c;
                    }
                }
            }
            if (in.isEmpty()) {
                throw new UserInputException(where, String.format(Locale.ROOT, "%s %s: species '%s' is in no "
                        + "conservation law, so its initial value does not change the steady states; vary a "
                        + "parameter instead (control ids: %s)", option, name, sp,
                        SimulateCommand.abbreviate(sm.controlIds())));
            }
            if (!init) {
                int c = dependentLaw >= 0 ? dependentLaw : in.get(0);
                return new ControlQuantity(id, sm.reduced.totalIndex(c), 1, 0);
            }
            if (in.size() > 1) {
                throw new UserInputException(where, String.format(Locale.ROOT, "%s %s: species '%s' enters %d "
                        + "conservation laws, and varying it moves several totals at once, which this command "
                        + "does not support; vary total:%s instead", option, name, sp, in.size(), sp));
            }
            int c = in.get(0);
            double l = sm.laws.coefficients(c)[i];
            int k = sm.reduced.totalIndex(c);
            // T = T0 + l (v - v0)  <=>  v = v0 - T0 / l + T / l
            return new ControlQuantity(id, k, 1 / l, y0[i] - q0[k] / l);
        }
        int k = sm.compiled.parameterIndex(id);
        if (k >= 0 && sm.compiled.form().isSpecies(id)) {
            throw new UserInputException(where, String.format(Locale.ROOT, "%s %s: '%s' is a species; write "
                    + "init:%s to vary its initial value or total:%s to vary its conservation total", option, id, id,
                    id, id));
        }
        if (k < 0) {
            throw new UserInputException(where, String.format(Locale.ROOT, "%s %s: the model has no parameter or "
                    + "compartment '%s'%s; control ids include: %s", option, id, id,
                    SwitchModel.didYouMean(id, sm.controlIds()), SimulateCommand.abbreviate(sm.controlIds())));
        }
        return new ControlQuantity(id, k, 1, 0);
    }

    private static List<String> speciesStates(SwitchModel sm) {
        List<String> out = new ArrayList<>();
        for (String s : sm.states) {
            if (sm.compiled.form().isSpecies(s)) {
                out.add(s);
            }
        }
        return out;
    }
}
