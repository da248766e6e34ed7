package org.switchfit.expr;

/**
 * Past values for delay nodes ({@code DELAY(slot, lag)}): supplied per thread by whoever runs a simulation
 * (see {@link MathRuntime#setDelayHistory}).
 */
public interface DelayHistory {

    /** Value of the delayed expression {@code slot} at the past time {@code time}. */
    double value(int slot, double time);
}
