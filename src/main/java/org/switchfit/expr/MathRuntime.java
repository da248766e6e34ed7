package org.switchfit.expr;

/**
 * Numeric helpers shared by the {@link Interpreter} and generated code, so that both evaluate identically.
 * Public because generated classes call them; not part of the supported API.
 */
public final class MathRuntime {
    private static final ThreadLocal<double[][]> WORKSPACE = ThreadLocal.withInitial(() -> new double[1][0]);

    private static final ThreadLocal<DelayHistory> DELAYS = new ThreadLocal<>();

    private MathRuntime() {
    }

    /** Sets (or clears, with null) the delay history used by this thread's evaluations. */
    public static void setDelayHistory(DelayHistory h) {
        if (h == null) {
            DELAYS.remove();
        } else {
            DELAYS.set(h);
        }
    }

    /** Value of delayed expression {@code slot} at {@code time}; NaN when no history is installed. */
    public static double delayed(double slot, double time) {
        DelayHistory h = DELAYS.get();
        return h == null ? Double.NaN : h.value((int) slot, time);
    }

    /** Per-thread scratch array of at least {@code n} entries (used by split generated code; not re-entrant). */
    public static double[] workspace(int n) {
        double[][] holder = WORKSPACE.get();
        if (holder[0].length < n) {
            holder[0] = new double[n];
        }
        return holder[0];
    }

    public static double sec(double x) {
        return 1.0 / Math.cos(x);
    }

    public static double csc(double x) {
        return 1.0 / Math.sin(x);
    }

    public static double cot(double x) {
        return 1.0 / Math.tan(x);
    }

    public static double sech(double x) {
        return 1.0 / Math.cosh(x);
    }

    public static double csch(double x) {
        return 1.0 / Math.sinh(x);
    }

    public static double coth(double x) {
        return 1.0 / Math.tanh(x);
    }

    public static double asec(double x) {
        return Math.acos(1.0 / x);
    }

    public static double acsc(double x) {
        return Math.asin(1.0 / x);
    }

    public static double acot(double x) {
        return Math.atan(1.0 / x);
    }

    public static double asinh(double x) {
        double a = Math.abs(x);
        double r = Math.log(a + Math.sqrt(a * a + 1.0));
        return x < 0 ? -r : r;
    }

    public static double acosh(double x) {
        return Math.log(x + Math.sqrt(x * x - 1.0));
    }

    public static double atanh(double x) {
        return 0.5 * Math.log((1.0 + x) / (1.0 - x));
    }

    public static double asech(double x) {
        return acosh(1.0 / x);
    }

    public static double acsch(double x) {
        return asinh(1.0 / x);
    }

    public static double acoth(double x) {
        return atanh(1.0 / x);
    }

    /** n! for integral n &gt;= 0 (rounded), NaN for negative n, +inf beyond 170. */
    public static double factorial(double x) {
        if (Double.isNaN(x) || x < 0) {
            return Double.NaN;
        }
        double n = Math.rint(x);
        if (n > 170) {
            return Double.POSITIVE_INFINITY;
        }
        double r = 1.0;
        for (int i = 2; i <= (int) n; i++) {
            r *= i;
        }
        return r;
    }

    /** a / b, and 0 where b == 0 ({@link Op#DIV_OR_ZERO}). */
    public static double div_or_zero(double a, double b) {
        return b == 0.0 ? 0.0 : a / b;
    }

    /** Integer quotient truncated towards zero (MathML quotient). */
    public static double quotient(double a, double b) {
        double q = a / b;
        return q < 0 ? Math.ceil(q) : Math.floor(q);
    }

    /** Remainder with the sign of the dividend (MathML rem). */
    public static double rem(double a, double b) {
        return a % b;
    }

    /** Power; an exponent of exactly 2 is a product so that results match {@code x * x}. */
    public static double pow(double a, double b) {
        return Math.pow(a, b);
    }

    /** Square, {@code x * x}. */
    public static double sq(double x) {
        return x * x;
    }

    public static double b2d(boolean b) {
        return b ? 1.0 : 0.0;
    }
}
