package org.switchfit.cli;

import java.nio.file.Path;
import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Locale;
import java.util.Map;
import java.util.Set;
import org.switchfit.continuation.ActiveNetwork;
import org.switchfit.continuation.ConservationLaws;
import org.switchfit.continuation.ContinuationException;
import org.switchfit.continuation.ReducedSystem;
import org.switchfit.continuation.SteadyStateSolver;
import org.switchfit.model.Compartment;
import org.switchfit.model.Model;
import org.switchfit.model.OdeForm;
import org.switchfit.model.Reaction;
import org.switchfit.model.Rule;
import org.switchfit.model.Species;
import org.switchfit.model.SpeciesRef;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.IntegrationException;
import org.switchfit.ode.Integrators;
import org.switchfit.ode.ModelCompiler;
import org.switchfit.ode.ModelOutputs;
import org.switchfit.ode.Simulator;
import org.switchfit.ode.SolverSettings;
import org.switchfit.ode.Trajectory;
import org.switchfit.sbml.SbmlReader;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * Any SBML model made ready for the switch-analysis commands ({@code branches}, {@code region}, {@code sweep}):
 * compiled, its conservation laws found from the stoichiometry (reaction columns, species rows scaled to the
 * state's units; states not driven by constant-stoichiometry reactions alone get a column of their own so they
 * enter no law), and the reduced system. Parameter vectors here are the reduced ones {@code q = (p, totals)}.
 * Immutable and thread-safe.
 */
final class SwitchModel {
    /** Integration horizons tried when Newton / pseudo-transient continuation fails to find a steady state. */
    private static final double[] SETTLE_TIMES = {1e2, 1e3, 1e4, 1e5};

    final Path file;
    final Model model;
    final CompiledModel compiled;
    final ConservationLaws laws;
    final ReducedSystem reduced;
    final List<String> states;
    /** The active part of the network the laws were computed on, or null for the whole stoichiometry. */
    final ActiveNetwork network;
    /**
     * The states as {@code simulate} reports them (species: concentration unless hasOnlySubstanceUnits), while the
     * state vector holds species amounts: the two differ by the compartment size, which may depend on the control.
     */
    private final ModelOutputs reportedStates;
    /** Outputs reading the state vector itself ({@link #stateOutputs}). */
    private final ModelOutputs stateOutputs;

    private SwitchModel(Path file, Model model, CompiledModel compiled, ConservationLaws laws,
                        ActiveNetwork network) {
        this.file = file;
        this.model = model;
        this.compiled = compiled;
        this.laws = laws;
        this.network = network;
        this.reduced = laws.reduce(compiled);
        this.states = compiled.form().stateIds();
        this.reportedStates = ModelOutputs.of(compiled, states);
        this.stateOutputs = buildStateOutputs();
    }

    /**
     * The full state y (amounts, as the ODE holds them) converted to the quantities {@code simulate} reports for
     * the same ids: concentrations for species with hasOnlySubstanceUnits=false, whatever the compartment size.
     *
     * @param y    full state
     * @param pEff effective parameters with the control (and any --set) applied; compartment sizes are read here
     */
    double[] reported(double[] y, double[] pEff) {
        double[] out = new double[states.size()];
        reportedStates.evaluate(0, y, pEff, out);
        return out;
    }

    /**
     * {@link #reported} at reduced parameters q: the original parameters of q are copied over {@code pEff}, so a
     * varied compartment size is the one of the point.
     */
    double[] reportedAt(double[] y, double[] q, double[] pEff) {
        double[] p = pEff.clone();
        System.arraycopy(q, 0, p, 0, Math.min(p.length, reduced.originalParameterCount()));
        return reported(y, p);
    }

    /** Reads, compiles and reduces. Timings of the two phases go to {@code timing} (seconds) when non-null. */
    static SwitchModel load(Path sbml, double[] timing) {
        long t0 = System.nanoTime();
        Model m = SbmlReader.read(sbml);
        long t1 = System.nanoTime();
        CompiledModel cm = ModelCompiler.compile(m);
        long t2 = System.nanoTime();
        ConservationLaws laws = lawsOf(sbml, m, cm, null, null);
        long t3 = System.nanoTime();
        if (timing != null) {
            timing[0] = (t1 - t0) * 1e-9;
            timing[1] = (t2 - t1) * 1e-9;
            timing[2] = (t3 - t2) * 1e-9;
        }
        return new SwitchModel(sbml, m, cm, laws, null);
    }

    /**
     * The same model with conservation laws of its active network ({@link ActiveNetwork}: inactive reactions
     * dropped, states on the zero face and passive states held), so the reduced Jacobian has no direction that
     * is singular at every point. Each law eliminates its most abundant species in {@code abundance} (the start
     * state), see {@link ConservationLaws#of(double[][], double[])}.
     */
    SwitchModel withNetwork(ActiveNetwork net, double[] abundance) {
        return new SwitchModel(file, model, compiled, lawsOf(file, model, compiled, net, abundance), net);
    }

    private static ConservationLaws lawsOf(Path f, Model m, CompiledModel cm, ActiveNetwork net,
                                           double[] abundance) {
        OdeForm form = cm.form();
        List<String> ids = form.stateIds();
        int n = ids.size();
        Set<String> ruled = new HashSet<>();
        for (Rule r : m.rules()) {
            if (r.kind() == Rule.Kind.RATE) {
                ruled.add(r.variable());
            }
        }
        boolean[] own = new boolean[n];
        double[] vol = new double[n];
        for (int i = 0; i < n; i++) {
            OdeForm.StateKind k = form.stateKind(i);
            Species s = k == OdeForm.StateKind.SPECIES_AMOUNT || k == OdeForm.StateKind.SPECIES_CONCENTRATION
                    ? m.species(ids.get(i)) : null;
            own[i] = s == null || ruled.contains(s.id()) || s.conversionFactor() != null
                    || m.conversionFactor() != null;
            vol[i] = 1;
            if (s != null && k == OdeForm.StateKind.SPECIES_CONCENTRATION) {
                Compartment c = m.compartment(s.compartment());
                vol[i] = c == null ? Double.NaN : c.size();
                if (!(vol[i] > 0) || !Double.isFinite(vol[i]) || ruled.contains(c.id()) || !c.constant()) {
                    own[i] = true;
                }
            }
        }
        double vref = Double.NaN;
        for (int i = 0; i < n; i++) {
            if (!own[i] && form.stateKind(i) == OdeForm.StateKind.SPECIES_CONCENTRATION) {
                vref = Double.isNaN(vref) ? vol[i] : Math.max(vref, vol[i]);
            }
        }
        List<Reaction> rx = m.reactions();
        int extra = 0;
        for (boolean b : own) {
            extra += b ? 1 : 0;
        }
        double[][] stoich = new double[n][rx.size() + extra];
        for (int r = 0; r < rx.size(); r++) {
            addRefs(stoich, form, rx.get(r).reactants(), r, -1, own);
            addRefs(stoich, form, rx.get(r).products(), r, +1, own);
        }
        int col = rx.size();
        for (int i = 0; i < n; i++) {
            if (own[i]) {
                java.util.Arrays.fill(stoich[i], 0);
                stoich[i][col++] = 1;
            } else if (form.stateKind(i) == OdeForm.StateKind.SPECIES_CONCENTRATION) {
                double ratio = vref / vol[i];
                for (int r = 0; r < rx.size(); r++) {
                    stoich[i][r] *= ratio;
                }
            }
        }
        if (net != null) {
            stoich = net.mask(stoich);
        }
        try {
            return abundance == null ? ConservationLaws.of(stoich) : ConservationLaws.of(stoich, abundance);
        } catch (IllegalArgumentException e) {
            throw new UserInputException(SourceLocation.ofFile(f.toString()), "conservation laws could not be found "
                    + "(" + e.getMessage() + "); compartment sizes must have simple ratios (e.g. 1 and 0.25) for "
                    + "the switch-analysis commands");
        }
    }

    private static void addRefs(double[][] stoich, OdeForm form, List<SpeciesRef> refs, int r, int sign,
                                boolean[] own) {
        for (SpeciesRef s : refs) {
            int i = form.stateIndex(s.species());
            if (i < 0) {
                continue;
            }
            double st = Double.isNaN(s.stoichiometry()) ? 1 : s.stoichiometry();
            if (s.stoichiometryMath() != null || (s.id() != null && form.stateIndex(s.id()) >= 0)) {
                own[i] = true;
                continue;
            }
            stoich[i][r] += sign * st;
        }
    }

    /** Declared parameter vector with the {@code --set} overrides applied (values parsed). */
    double[] declared(Map<String, String> sets) {
        double[] p = compiled.parameterValues();
        for (Map.Entry<String, String> e : sets.entrySet()) {
            int k = compiled.parameterIndex(e.getKey().strip());
            if (k < 0) {
                throw new UserInputException(SourceLocation.ofFile(file.toString()), String.format(Locale.ROOT,
                        "--set %s=%s: the model has no parameter, compartment or species '%s'%s; valid ids "
                                + "include: %s", e.getKey(), e.getValue(), e.getKey(),
                        didYouMean(e.getKey(), compiled.parameterIds()),
                        SimulateCommand.abbreviate(compiled.parameterIds())));
            }
            p[k] = SimulateCommand.parseDouble(e.getValue(), "--set " + e.getKey());
        }
        return p;
    }

    /** Initial full state and effective parameters from declared values: {@code {y0, pEff}}. */
    double[][] initial(double[] declared) {
        double[] y = new double[states.size()];
        double[] pe = new double[declared.length];
        compiled.initialValues(0, declared, y, pe);
        return new double[][] {y, pe};
    }

    /**
     * A steady state for reduced parameters q, starting from the reduced state x0: damped Newton /
     * pseudo-transient continuation first, then, if that fails, integration of the model for growing horizons
     * followed by Newton. Returns the reduced state.
     *
     * @throws ContinuationException when none is found
     */
    double[] steadyState(double[] x0, double[] q, double[] pEff) {
        try {
            return SteadyStateSolver.defaults().solve(reduced, x0, q).state();
        } catch (ContinuationException first) {
            double[] y = reduced.fullState(x0, q);
            double[] pp = pEff.clone();
            System.arraycopy(q, 0, pp, 0, pp.length);
            for (double t : SETTLE_TIMES) {
                try {
                    double[] yt = integrate(pp, y, t);
                    double[] x = reduced.reducedState(yt);
                    return SteadyStateSolver.defaults().solve(reduced, x, q).state();
                } catch (ContinuationException | IntegrationException e) {
                    // try a longer horizon
                }
            }
            throw first;
        }
    }

    /**
     * The full state after integrating for time t from y with (effective) parameters p. The outputs are the state
     * vector itself (amounts of species whose state is the amount), not what {@code simulate} reports.
     */
    double[] integrate(double[] p, double[] y, double t) {
        Trajectory tr = new Simulator(compiled, Integrators.create(SolverSettings.defaults()
                .withMethod(SolverSettings.Method.BDF).withTolerances(1e-8, 1e-12)))
                .simulate(new double[] {0, t}, withInitialState(p, y), stateOutputs());
        double[] out = new double[states.size()];
        for (int i = 0; i < out.length; i++) {
            out[i] = tr.value(1, i);
        }
        return out;
    }

    /**
     * Outputs that read the state vector itself: {@code amount(S)} for a species whose state is its amount but
     * whose reported value is its concentration, the plain id otherwise (what {@code simulate} reports differs
     * from the state whenever a compartment size is not 1).
     */
    ModelOutputs stateOutputs() {
        return stateOutputs;
    }

    private ModelOutputs buildStateOutputs() {
        List<String> names = new ArrayList<>();
        OdeForm form = compiled.form();
        for (int i = 0; i < states.size(); i++) {
            String id = states.get(i);
            Species sp = form.stateKind(i) == OdeForm.StateKind.SPECIES_AMOUNT ? model.species(id) : null;
            names.add(sp != null && !sp.hasOnlySubstanceUnits() ? "amount(" + id + ")" : id);
        }
        return ModelOutputs.of(compiled, names);
    }

    /**
     * Copy of the (effective) parameters p with the species initial values replaced by the full state y: an
     * amount state of a species declared by its initial concentration is divided by its compartment size (from p),
     * as the initial values multiply it back.
     */
    double[] withInitialState(double[] p, double[] y) {
        double[] q = p.clone();
        OdeForm form = compiled.form();
        for (int i = 0; i < states.size(); i++) {
            String id = states.get(i);
            int k = compiled.parameterIndex(id);
            if (k >= 0) {
                q[k] = y[i];
                if (form.stateKind(i) == OdeForm.StateKind.SPECIES_AMOUNT && form.speciesDeclaredAsConcentration(id)) {
                    int c = compiled.parameterIndex(model.species(id).compartment());
                    if (c >= 0) {
                        q[k] = y[i] / p[c];
                    }
                }
            }
        }
        return q;
    }

    /** Readout weights on the reduced state of the full-state readout c (chain rule through the laws). */
    double[] reducedReadout(double[] c, double[] q) {
        int nr = reduced.stateCount();
        double[] zero = q.clone();
        for (int k = reduced.originalParameterCount(); k < zero.length; k++) {
            zero[k] = 0;
        }
        double[] out = new double[nr];
        double[] e = new double[nr];
        for (int a = 0; a < nr; a++) {
            e[a] = 1;
            double[] y = reduced.fullState(e, zero);
            e[a] = 0;
            for (int i = 0; i < y.length; i++) {
                out[a] += c[i] * y[i];
            }
        }
        return out;
    }

    /** " (did you mean 'x'?)" for the closest id within edit distance 2, or "". */
    static String didYouMean(String id, List<String> candidates) {
        String best = null;
        int bestD = 3;
        for (String c : candidates) {
            int d = editDistance(id, c);
            if (d < bestD) {
                bestD = d;
                best = c;
            }
        }
        return best == null ? "" : " (did you mean '" + best + "'?)";
    }

    private static int editDistance(String a, String b) {
        int[] prev = new int[b.length() + 1];
        int[] cur = new int[b.length() + 1];
        for (int j = 0; j <= b.length(); j++) {
            prev[j] = j;
        }
        for (int i = 1; i <= a.length(); i++) {
            cur[0] = i;
            for (int j = 1; j <= b.length(); j++) {
                int c = a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1;
                cur[j] = Math.min(Math.min(cur[j - 1] + 1, prev[j] + 1), prev[j - 1] + c);
            }
            int[] t = prev;
            prev = cur;
            cur = t;
        }
        return prev[b.length()];
    }

    /** Ids accepted as a control: global parameters and compartments, plus init:/total: forms for species. */
    List<String> controlIds() {
        List<String> out = new ArrayList<>();
        for (String id : compiled.parameterIds()) {
            if (!compiled.form().isSpecies(id)) {
                out.add(id);
            }
        }
        for (int c = 0; c < laws.lawCount(); c++) {
            long[] l = laws.coefficients(c);
            for (int i = 0; i < l.length; i++) {
                if (l[i] != 0) {
                    out.add("total:" + states.get(i));
                    break;
                }
            }
        }
        return out;
    }
}
