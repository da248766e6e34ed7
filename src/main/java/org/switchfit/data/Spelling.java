package org.switchfit.data;

import java.util.Collection;
import java.util.Locale;

/** "Did you mean" suggestions by edit distance (Levenshtein 1966; common practice for such hints). */
public final class Spelling {

    private Spelling() {
    }

    /**
     * Returns {@code " (did you mean 'x'?)"} for the closest candidate within an edit distance of about a third of
     * the word's length (at least 2), or an empty string when nothing is close.
     */
    public static String didYouMean(String word, Collection<String> candidates) {
        String best = null;
        int bestDistance = Integer.MAX_VALUE;
        String w = word.toLowerCase(Locale.ROOT);
        for (String c : candidates) {
            int d = distance(w, c.toLowerCase(Locale.ROOT));
            if (d < bestDistance) {
                bestDistance = d;
                best = c;
            }
        }
        int limit = Math.max(2, word.length() / 3);
        return best != null && bestDistance <= limit ? " (did you mean '" + best + "'?)" : "";
    }

    /** Levenshtein edit distance: insertions, deletions and substitutions each cost 1. */
    static int distance(String a, String b) {
        int[] prev = new int[b.length() + 1];
        int[] cur = new int[b.length() + 1];
        for (int j = 0; j <= b.length(); j++) {
            prev[j] = j;
        }
        for (int i = 1; i <= a.length(); i++) {
            cur[0] = i;
            for (int j = 1; j <= b.length(); j++) {
                int sub = prev[j - 1] + (a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1);
                cur[j] = Math.min(sub, Math.min(prev[j] + 1, cur[j - 1] + 1));
            }
            int[] t = prev;
            prev = cur;
            cur = t;
        }
        return prev[b.length()];
    }
}
