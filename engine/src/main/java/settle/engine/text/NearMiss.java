package settle.engine.text;

import java.util.Collection;
import java.util.Locale;

/**
 * Suggestions for misspelt names (schedule kinds and keys, plan keys, arm names): the closest accepted name by
 * edit distance, when it is close.
 */
public final class NearMiss {

    private NearMiss() {
    }

    /**
     * @return the accepted name closest to {@code given} (case-insensitively), or null when none is within
     *         max(2, ⌊len/3⌋) edits (ties: the first in {@code accepted}'s order)
     */
    public static String closest(String given, Collection<String> accepted) {
        String g = given.toLowerCase(Locale.ROOT);
        int limit = Math.max(2, g.length() / 3);
        String best = null;
        int bestDistance = Integer.MAX_VALUE;
        for (String a : accepted) {
            int d = distance(g, a.toLowerCase(Locale.ROOT));
            if (d < bestDistance) {
                bestDistance = d;
                best = a;
            }
        }
        return bestDistance <= limit ? best : null;
    }

    /** @return "; did you mean 'x'?" or "" */
    public static String suggestion(String given, Collection<String> accepted) {
        String c = closest(given, accepted);
        return c == null ? "" : "; did you mean '" + c + "'?";
    }

    /**
     * @return the optimal-string-alignment distance: insertions, deletions, substitutions and transpositions
     *         of adjacent characters, one edit each (Levenshtein's distance with Damerau's transposition, so
     *         that "lable" is one edit from "label")
     */
    public static int distance(String a, String b) {
        int[][] d = new int[a.length() + 1][b.length() + 1];
        for (int i = 0; i <= a.length(); i++) {
            d[i][0] = i;
        }
        for (int j = 0; j <= b.length(); j++) {
            d[0][j] = j;
        }
        for (int i = 1; i <= a.length(); i++) {
            for (int j = 1; j <= b.length(); j++) {
                int cost = a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1;
                int v = Math.min(Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1), d[i - 1][j - 1] + cost);
                if (i > 1 && j > 1 && a.charAt(i - 1) == b.charAt(j - 2) && a.charAt(i - 2) == b.charAt(j - 1)) {
                    v = Math.min(v, d[i - 2][j - 2] + 1);
                }
                d[i][j] = v;
            }
        }
        return d[a.length()][b.length()];
    }
}
