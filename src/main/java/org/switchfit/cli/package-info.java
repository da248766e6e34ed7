/**
 * Command-line interface: arguments, wiring, exit codes.
 *
 * <p>Layering: may import project packages {all} only.
 */
package org.switchfit.cli;
