package org.switchfit.linalg;

import java.util.ArrayList;
import java.util.HashSet;
import java.util.List;
import java.util.Set;

/**
 * Helpers on row-wise structural patterns ({@code pattern[i]} = increasing column indices of row i) and a
 * minimum-degree fill-reducing ordering. Setup-time code: allocates freely.
 */
public final class SparsePattern {

    private SparsePattern() {
    }

    /** Number of structural non-zeros with the diagonal included (validates indices). */
    public static long countWithDiagonal(int n, int[][] pattern) {
        if (pattern.length != n) {
            throw new IllegalArgumentException("pattern has " + pattern.length + " rows, expected " + n);
        }
        long nnz = 0;
        for (int i = 0; i < n; i++) {
            boolean diag = false;
            int prev = -1;
            for (int j : pattern[i]) {
                if (j <= prev || j >= n) {
                    throw new IllegalArgumentException("pattern row " + i + ": column " + j
                            + " out of range [0," + n + ") or not increasing");
                }
                prev = j;
                if (j == i) {
                    diag = true;
                }
            }
            nnz += pattern[i].length + (diag ? 0 : 1);
        }
        return nnz;
    }

    /**
     * Minimum-degree ordering of the symmetrised graph of A + A^T (George &amp; Liu, "The evolution of the minimum
     * degree ordering algorithm", SIAM Review 31(1), 1989, doi:10.1137/1031001): repeatedly eliminate a node of
     * least current degree (ties: lowest index, so the result is deterministic) and join its neighbours into a
     * clique. This is the plain elimination-graph form, O(sum of clique sizes squared); adequate for the few
     * thousand states of biochemical models, not for very large meshes.
     *
     * @return {@code order[k]} = original index eliminated k-th
     */
    public static int[] minimumDegreeOrder(int n, int[][] pattern) {
        List<Set<Integer>> adj = new ArrayList<>(n);
        for (int i = 0; i < n; i++) {
            adj.add(new HashSet<>());
        }
        for (int i = 0; i < n; i++) {
            for (int j : pattern[i]) {
                if (j != i) {
                    adj.get(i).add(j);
                    adj.get(j).add(i);
                }
            }
        }
        boolean[] done = new boolean[n];
        int[] order = new int[n];
        for (int k = 0; k < n; k++) {
            int best = -1;
            int bestDeg = Integer.MAX_VALUE;
            for (int i = 0; i < n; i++) {
                if (!done[i] && adj.get(i).size() < bestDeg) {
                    bestDeg = adj.get(i).size();
                    best = i;
                }
            }
            order[k] = best;
            done[best] = true;
            Integer boxedBest = best;
            List<Integer> nb = new ArrayList<>(adj.get(best));
            for (int a = 0; a < nb.size(); a++) {
                Set<Integer> sa = adj.get(nb.get(a));
                sa.remove(boxedBest);
                for (int b = 0; b < nb.size(); b++) {
                    if (a != b) {
                        sa.add(nb.get(b));
                    }
                }
            }
            adj.get(best).clear();
        }
        return order;
    }
}
