package settle.engine.schedule;

import java.util.Collection;
import java.util.Locale;

/** Near-miss suggestions for misspelt names (edit distance). */
final class Suggest {

    private Suggest() {
    }

    /**
     * @return the candidate closest to {@code word} by edit distance (case-insensitive), or null when none is
     *     within max(2, length / 3) edits
     */
    static String nearest(String word, Collection<String> candidates) {
        String w = word.toLowerCase(Locale.ROOT);
        int limit = Math.max(2, w.length() / 3);
        String best = null;
        int bestDistance = Integer.MAX_VALUE;
        for (String c : candidates) {
            int d = distance(w, c.toLowerCase(Locale.ROOT));
            if (d < bestDistance) {
                bestDistance = d;
                best = c;
            }
        }
        return bestDistance <= limit ? best : null;
    }

    /** Levenshtein distance with adjacent transpositions counted as one edit. */
    static int distance(String a, String b) {
        int n = a.length();
        int m = b.length();
        int[][] d = new int[n + 1][m + 1];
        for (int i = 0; i <= n; i++) {
            d[i][0] = i;
        }
        for (int j = 0; j <= m; j++) {
            d[0][j] = j;
        }
        for (int i = 1; i <= n; i++) {
            for (int j = 1; j <= m; j++) {
                int cost = a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1;
                int v = Math.min(Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1), d[i - 1][j - 1] + cost);
                if (i > 1 && j > 1 && a.charAt(i - 1) == b.charAt(j - 2) && a.charAt(i - 2) == b.charAt(j - 1)) {
                    v = Math.min(v, d[i - 2][j - 2] + 1);
                }
                d[i][j] = v;
            }
        }
        return d[n][m];
    }
}
