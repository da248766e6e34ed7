package org.switchfit.cli;

import static org.junit.jupiter.api.Assertions.assertEquals;

import java.nio.file.Path;
import java.util.Map;
import org.junit.jupiter.api.Test;

/** The model preparation behind branches, region and sweep. */
class SwitchModelTest {

    @Test
    void integrationFallbackKeepsAmountsWithCompartmentsNotOfSizeOne() throws Exception {
        // two-compartments.xml (SYNTHETIC, see its comment): A in cyt (size 1), B in nuc (size 0.5), both declared
        // by concentration; the amounts settle at A = B = T / 2 with T the total amount (k = k2 = 1, closed form)
        Path f = Path.of(SwitchModelTest.class.getResource("/sbml/two-compartments.xml").toURI());
        SwitchModel sm = SwitchModel.load(f, null);
        double[] pEff = sm.initial(sm.declared(Map.of()))[1];
        int a = sm.states.indexOf("A");
        int b = sm.states.indexOf("B");
        double[] y = new double[2];
        y[a] = 1.5;
        y[b] = 0.5; // amounts: T = 2
        double[] end = sm.integrate(pEff, y, 1e3);
        // after 1e3 time units of relaxation at rate 2 the transient is below rounding; BDF at rtol 1e-8
        assertEquals(1, end[a], 1e-6);
        assertEquals(1, end[b], 1e-6);
    }
}
