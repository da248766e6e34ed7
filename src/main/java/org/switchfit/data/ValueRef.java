package org.switchfit.data;

import java.util.Objects;
import java.util.regex.Pattern;

/**
 * A value written in a data or problem file that is either a number or the id of a parameter (for example an
 * estimated parameter, resolved later against the model and the parameter list). Immutable.
 */
public final class ValueRef {

    private static final Pattern ID = Pattern.compile("[A-Za-z_][A-Za-z0-9_]*");

    private final double number;
    private final String parameterId;

    private ValueRef(double number, String parameterId) {
        this.number = number;
        this.parameterId = parameterId;
    }

    /** A literal number (NaN and infinities allowed). */
    public static ValueRef ofNumber(double value) {
        return new ValueRef(value, null);
    }

    /** A reference to a parameter id. */
    public static ValueRef ofParameter(String id) {
        if (!isId(id)) {
            throw new IllegalArgumentException("not an identifier: '" + id + "'");
        }
        return new ValueRef(Double.NaN, id);
    }

    /**
     * Reads a field: a number in {@link DataNumbers} syntax, or an identifier (letter or underscore followed by
     * letters, digits, underscores, as SBML SIds).
     *
     * @return the value, or null when the text is neither
     */
    public static ValueRef parse(String text) {
        String t = text.strip();
        if (DataNumbers.isNumber(t)) {
            return ofNumber(DataNumbers.parse(t));
        }
        return isId(t) ? new ValueRef(Double.NaN, t) : null;
    }

    /** Whether the text is an identifier in the SBML SId syntax. */
    public static boolean isId(String text) {
        return text != null && ID.matcher(text).matches();
    }

    /** Whether this is a literal number. */
    public boolean isNumber() {
        return parameterId == null;
    }

    /** The number; only meaningful when {@link #isNumber()}. */
    public double number() {
        if (parameterId != null) {
            throw new IllegalStateException("value refers to parameter '" + parameterId + "', not a number");
        }
        return number;
    }

    /** The referenced parameter id, or null for a literal number. */
    public String parameterId() {
        return parameterId;
    }

    @Override
    public boolean equals(Object o) {
        if (!(o instanceof ValueRef)) {
            return false;
        }
        ValueRef v = (ValueRef) o;
        return Objects.equals(parameterId, v.parameterId)
                && Double.doubleToLongBits(number) == Double.doubleToLongBits(v.number);
    }

    @Override
    public int hashCode() {
        return Objects.hash(parameterId, Double.doubleToLongBits(number));
    }

    /** The file spelling: the id, or the number formatted by {@link DataNumbers#format(double)}. */
    @Override
    public String toString() {
        return parameterId != null ? parameterId : DataNumbers.format(number);
    }
}
