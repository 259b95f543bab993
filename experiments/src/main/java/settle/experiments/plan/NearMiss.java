package settle.experiments.plan;

import java.util.Collection;
import java.util.Locale;

/** Suggestions for misspelt names: the closest accepted name by Levenshtein distance, when it is close. */
final class NearMiss {

    private NearMiss() {
    }

    /**
     * @return the accepted name closest to {@code given} (case-insensitively), or null when none is within
     *         max(1, ⌊len/3⌋) edits (ties: the first in {@code accepted}'s order)
     */
    static String closest(String given, Collection<String> accepted) {
        String g = given.toLowerCase(Locale.ROOT);
        int limit = Math.max(1, Math.max(g.length(), 1) / 3);
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
    static String suggestion(String given, Collection<String> accepted) {
        String c = closest(given, accepted);
        return c == null ? "" : "; did you mean '" + c + "'?";
    }

    /** @return the Levenshtein distance (insertions, deletions, substitutions of one character each) */
    static int distance(String a, String b) {
        int[] previous = new int[b.length() + 1];
        int[] current = new int[b.length() + 1];
        for (int j = 0; j <= b.length(); j++) {
            previous[j] = j;
        }
        for (int i = 1; i <= a.length(); i++) {
            current[0] = i;
            for (int j = 1; j <= b.length(); j++) {
                int cost = a.charAt(i - 1) == b.charAt(j - 1) ? 0 : 1;
                current[j] = Math.min(Math.min(current[j - 1] + 1, previous[j] + 1), previous[j - 1] + cost);
            }
            int[] t = previous;
            previous = current;
            current = t;
        }
        return previous[b.length()];
    }
}
