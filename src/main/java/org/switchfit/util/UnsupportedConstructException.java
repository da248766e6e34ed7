package org.switchfit.util;

/**
 * A model uses a construct switchfit cannot turn into an ODE system (for example an algebraic rule it cannot
 * solve). A user error: the CLI prints the message and exits with code 2; the conformance runner reports the
 * case as {@code unsupported}.
 */
public class UnsupportedConstructException extends UserInputException {
    private static final long serialVersionUID = 1L;

    /**
     * @param location  the element (id) and file where the construct is used
     * @param construct short name of the construct, e.g. {@code "algebraic rule"}
     * @param hint      what the user can do instead
     */
    public UnsupportedConstructException(SourceLocation location, String construct, String hint) {
        super(location, "uses " + construct + ", which switchfit does not support; " + hint);
        this.construct = construct;
    }

    private final String construct;

    /** Short name of the unsupported construct. */
    public String construct() {
        return construct;
    }
}
