/**
 * JSON, CSV and HTML/SVG output from result values; atomic writes.
 *
 * <p>Layering: may import project packages {all packages above except cli} only.
 */
package org.switchfit.report;
