package org.switchfit.data;

import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.List;
import org.junit.jupiter.api.Test;

/** Edit distance, value references, scales and priors. */
class SmallValuesTest {

    @Test
    void levenshteinDistance() {
        // Levenshtein (1966) with unit costs; derived by hand: kitten -> sitting = k->s, e->i, insert g = 3, and
        // no fewer since the lengths differ by 1 and two aligned letters differ.
        assertEquals(3, Spelling.distance("kitten", "sitting"));
        assertEquals(0, Spelling.distance("", ""));
        assertEquals(4, Spelling.distance("", "abcd"));
        assertEquals(" (did you mean 'upper'?)", Spelling.didYouMean("uper", List.of("lower", "upper", "start")));
        assertEquals("", Spelling.didYouMean("zzzzzz", List.of("lower", "upper")));
    }

    @Test
    void valueRefs() {
        assertEquals(ValueRef.ofNumber(1e-3), ValueRef.parse(" 1e-3 "));
        assertEquals(ValueRef.ofParameter("k_1"), ValueRef.parse("k_1"));
        assertTrue(ValueRef.parse("inf").isNumber());
        assertNull(ValueRef.parse("2 mM"));
        assertNull(ValueRef.parse("1abc"));
        assertThrows(IllegalStateException.class, () -> ValueRef.ofParameter("k").number());
        assertThrows(IllegalArgumentException.class, () -> ValueRef.ofParameter("a-b"));
        assertEquals("nan", ValueRef.ofNumber(Double.NaN).toString());
        assertEquals(ValueRef.ofNumber(Double.NaN), ValueRef.parse("NaN"));
    }

    @Test
    void scales() {
        assertEquals(ParameterScale.LOG10, ParameterScale.fromToken("LOG10"));
        assertNull(ParameterScale.fromToken("ln"));
        // log10(1000) = 3 exactly in IEEE arithmetic (Math.log10 spec: exact for 10^n).
        assertEquals(3.0, ParameterScale.LOG10.toScale(1000), 0.0);
        double x = 0.37;
        for (ParameterScale s : ParameterScale.values()) {
            // round trip through exp/log: a few ulp of 0.37, about 1e-16 absolute
            assertEquals(x, s.toLinear(s.toScale(x)), 4 * Math.ulp(x), s.token());
        }
    }

    @Test
    void priorsCheckTheirArity() {
        assertThrows(IllegalArgumentException.class, () -> new Prior(Prior.Type.NORMAL, List.of(1.0)));
        assertEquals(0, new Prior(Prior.Type.UNIFORM, List.of()).parameters().size());
        assertEquals(Prior.Type.LOG_NORMAL, Prior.Type.fromPetabName("lognormal"));
        assertNull(Prior.Type.fromPetabName("cauchy"));
    }

    @Test
    void numberFormatRoundTripsSpecialValues() {
        for (double v : new double[] {0.0, -0.0, 1.0, -7.0, 0.1, 1e300, 4.9e-324, Double.MAX_VALUE,
            Double.POSITIVE_INFINITY, Double.NEGATIVE_INFINITY}) {
            assertEquals(Double.doubleToLongBits(v), Double.doubleToLongBits(DataNumbers.parse(DataNumbers.format(v))),
                    Double.toString(v));
        }
        assertTrue(Double.isNaN(DataNumbers.parse(DataNumbers.format(Double.NaN))));
    }
}
