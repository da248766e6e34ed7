/**
 * Message templates, user-input exceptions, source locations, atomic file writes.
 *
 * <p>Layering: may import project packages {} only.
 */
package org.switchfit.util;
