/**
 * Measurement data, thresholds, conditions and noise specifications as parsed from files; not yet tied to a model.
 *
 * <p>Layering: may import project packages {util} only.
 */
package org.switchfit.data;
