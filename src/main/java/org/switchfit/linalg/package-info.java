/**
 * Dense and sparse LU on flat arrays with reusable workspaces.
 *
 * <p>Layering: may import project packages {util} only.
 */
package org.switchfit.linalg;
