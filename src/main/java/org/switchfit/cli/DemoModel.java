package org.switchfit.cli;

import java.nio.file.Path;
import java.util.List;
import java.util.Locale;
import org.switchfit.continuation.Branch;
import org.switchfit.continuation.ContinuationSettings;
import org.switchfit.continuation.PseudoArclength;
import org.switchfit.continuation.ReducedSystem;
import org.switchfit.continuation.SteadyStateSolver;
import org.switchfit.continuation.Threshold;
import org.switchfit.continuation.Thresholds;
import org.switchfit.model.Model;
import org.switchfit.model.Reaction;
import org.switchfit.model.SpeciesRef;
import org.switchfit.ode.CompiledModel;
import org.switchfit.ode.Integrator;
import org.switchfit.ode.Integrators;
import org.switchfit.ode.ModelOutputs;
import org.switchfit.ode.Simulator;
import org.switchfit.ode.SolverSettings;
import org.switchfit.ode.Trajectory;
import org.switchfit.util.SourceLocation;
import org.switchfit.util.UserInputException;

/**
 * The demo's SBML model made ready for simulation and continuation: compiled, with its conservation laws found
 * from the stoichiometry and the reduced system built from them (continuation needs a regular Jacobian). All
 * methods take the declared parameter vector {@code p} of {@link CompiledModel} (species entries are initial
 * values); states are in {@code OdeForm} order. Immutable and thread-safe.
 *
 * <p>Only for models whose species are all concentration states in compartments of one size, as the demo model
 * (the stoichiometry then maps species amounts and concentrations alike).
 */
final class DemoModel {
    /** Integration end used to relax to a steady state before the Newton polish (minutes; ~100 relaxation times). */
    static final double SETTLE_TIME = 3000;
    /** Integration tolerances for data generation and steady states (relative, absolute in concentration). */
    static final double RTOL = 1e-10;
    static final double ATOL = 1e-12;

    final Path file;
    final Model model;
    final CompiledModel compiled;
    final ReducedSystem reduced;
    final List<String> states;
    /** The general model set-up of the switch-analysis commands, which this class specialises for the demo. */
    final SwitchModel sm;
    private final Integrator integrator;
    private final Integrator settleIntegrator;

    private DemoModel(SwitchModel sm) {
        this.sm = sm;
        this.file = sm.file;
        this.model = sm.model;
        this.compiled = sm.compiled;
        this.reduced = sm.reduced;
        this.states = sm.states;
        this.integrator = Integrators.create(SolverSettings.defaults().withMethod(SolverSettings.Method.BDF)
                .withTolerances(RTOL, ATOL));
        // Relaxing only has to land in the attractor's Newton basin; the polish then solves f = 0 to rounding.
        this.settleIntegrator = Integrators.create(SolverSettings.defaults().withMethod(SolverSettings.Method.BDF)
                .withTolerances(1e-7, 1e-10));
    }

    /**
     * Reads and compiles the SBML file, with conservation laws and reduction as for the switch-analysis commands
     * ({@link SwitchModel}); the demo needs every species to be a state with constant integer stoichiometry.
     */
    static DemoModel load(Path sbml) {
        SwitchModel sm = SwitchModel.load(sbml, null);
        for (Reaction rx : sm.model.reactions()) {
            check(rx.reactants(), sm, sbml);
            check(rx.products(), sm, sbml);
        }
        return new DemoModel(sm);
    }

    private static void check(List<SpeciesRef> refs, SwitchModel sm, Path f) {
        for (SpeciesRef s : refs) {
            double st = Double.isNaN(s.stoichiometry()) ? 1 : s.stoichiometry();
            if (!sm.states.contains(s.species()) || st != Math.rint(st) || s.stoichiometryMath() != null) {
                throw new UserInputException(SourceLocation.ofFile(f.toString()), "species '" + s.species()
                        + "' needs a constant integer stoichiometry and must be a state for the demo; use the "
                        + "demo model models/stress_switch.xml");
            }
        }
    }

    /** Index of a declared parameter (or species initial value). */
    int index(String id) {
        int k = compiled.parameterIndex(id);
        if (k < 0) {
            throw new UserInputException(SourceLocation.ofFile(file.toString()), String.format(Locale.ROOT,
                    "has no quantity '%s' that the demo needs; use the demo model models/stress_switch.xml", id));
        }
        return k;
    }

    /** Declared values of the file (copy). */
    double[] nominal() {
        return compiled.parameterValues();
    }

    /** Copy of p with the species initial values replaced by the state y. */
    double[] withInitialState(double[] p, double[] y) {
        return sm.withInitialState(p, y);
    }

    /** Initial state from the declared values p. */
    double[] initialState(double[] p) {
        double[] y = new double[states.size()];
        compiled.initialValues(0, p, y, new double[p.length]);
        return y;
    }

    /** States at the given times, starting from y0 at t = 0; rows are times, columns states. */
    Trajectory simulate(double[] p, double[] y0, double[] times) {
        return new Simulator(compiled, integrator).simulate(times, withInitialState(p, y0),
                ModelOutputs.of(compiled, states));
    }

    /**
     * Steady state reached from y0: integration to {@link #SETTLE_TIME}, then Newton on the reduced system (so the
     * state is the attractor of the actual dynamics, polished to rounding). Returns the full state.
     */
    double[] settle(double[] p, double[] y0) {
        // the state vector itself (amounts where the state is an amount), as withInitialState expects it
        Trajectory tr = new Simulator(compiled, settleIntegrator).simulate(new double[] {SETTLE_TIME},
                withInitialState(p, y0), sm.stateOutputs());
        double[] y = new double[states.size()];
        for (int i = 0; i < y.length; i++) {
            y[i] = tr.value(0, i);
        }
        double[] q = reduced.parameters(p, y);
        double[] x = SteadyStateSolver.defaults().withTolerances(1e-14, 1e-15)
                .solve(reduced, reduced.reducedState(y), q).state();
        return reduced.fullState(x, q);
    }

    /** Reduced parameters (p, totals of y). */
    double[] reducedParameters(double[] p, double[] y) {
        return reduced.parameters(p, y);
    }

    /** Readout weights on the reduced state of the full-state readout c (chain rule through the laws). */
    double[] reducedReadout(double[] c, double[] q) {
        return sm.reducedReadout(c, q);
    }

    /** Unit readout on one species. */
    double[] speciesReadout(String id) {
        double[] c = new double[states.size()];
        c[states.indexOf(id)] = 1;
        return c;
    }

    /**
     * Switching threshold in {@code control} over [lo, hi] for the state the experiment starts from.
     *
     * @param up true for switch-on (sweep up from lo), false for switch-off (sweep down from hi)
     */
    Threshold threshold(double[] p, double[] yStart, String control, double lo, double hi, boolean up,
                        String readoutSpecies) {
        double[] q = reduced.parameters(p, yStart);
        double[] x = reduced.reducedState(yStart);
        Thresholds th = new Thresholds(ContinuationSettings.of(lo, hi));
        double[] c = reducedReadout(speciesReadout(readoutSpecies), q);
        int k = index(control);
        return up ? th.switchOn(reduced, x, q, k, c) : th.switchOff(reduced, x, q, k, c);
    }

    /** The whole branch through the steady state reached from yStart at control = lo, traced up to hi. */
    Branch branch(double[] p, double[] yStart, String control, double lo, double hi) {
        int k = index(control);
        double[] p0 = p.clone();
        p0[k] = lo;
        double[] y = settle(p0, yStart);
        double[] q = reduced.parameters(p0, y);
        return new PseudoArclength(ContinuationSettings.of(lo, hi)).trace(reduced, reduced.reducedState(y), q, k, +1);
    }
}
