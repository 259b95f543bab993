package settle.reports.stats;

import java.util.Arrays;

/**
 * Exact Wilcoxon signed-rank test for paired samples (F. Wilcoxon, "Individual comparisons by ranking
 * methods", Biometrics Bulletin 1(6), 1945), for any number of pairs.
 *
 * <ul>
 *   <li>Differences exactly zero are dropped and counted (Wilcoxon's original rule, R's default).</li>
 *   <li>The rest are ranked by absolute value; ties get midranks. Midranks are doubled to integers
 *       and the exact null distribution of the doubled statistic is computed by
 *       {@link SignedRankDistribution}, so the p-value is exact with ties too (R falls back to a normal
 *       approximation there).</li>
 *   <li>Infinite differences are allowed: they rank above every finite one (tying with each other).
 *       This is how a diverged replicate counts as worse than every finite value.</li>
 * </ul>
 */
public final class SignedRankTest {

    private SignedRankTest() {
    }

    /**
     * @param differences paired differences (x − y); ±∞ allowed, NaN not. Not modified.
     * @return counts, V and the exact two-sided p-value
     */
    public static SignedRankResult test(double[] differences) {
        int zeros = 0;
        for (int i = 0; i < differences.length; i++) {
            double d = differences[i];
            if (Double.isNaN(d)) {
                throw new IllegalArgumentException("difference " + i + " is NaN: a paired difference must be"
                        + " a number or ±infinity (a diverged replicate)");
            }
            if (d == 0.0) {
                zeros++;
            }
        }
        int used = differences.length - zeros;
        double[] sortedAbs = new double[used];
        int k = 0;
        for (double d : differences) {
            if (d != 0.0) {
                sortedAbs[k++] = Math.abs(d);
            }
        }
        Arrays.sort(sortedAbs);
        int[] scores = new int[used];
        long positive = 0;
        boolean tied = false;
        k = 0;
        for (double d : differences) {
            if (d == 0.0) {
                continue;
            }
            double a = Math.abs(d);
            int lo = firstIndex(sortedAbs, a);
            int hi = lastIndex(sortedAbs, a);
            int doubled = lo + hi + 2; // positions lo..hi (0-based) hold ranks lo+1..hi+1; midrank × 2
            if (hi > lo) {
                tied = true;
            }
            scores[k++] = doubled;
            if (d > 0) {
                positive += doubled;
            }
        }
        double p = used == 0 ? 1.0 : SignedRankDistribution.twoSidedP(scores, positive);
        return new SignedRankResult(differences.length, zeros, used, positive / 2.0, p, tied);
    }

    private static int firstIndex(double[] sorted, double value) {
        int lo = 0;
        int hi = sorted.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (sorted[mid] < value) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo;
    }

    private static int lastIndex(double[] sorted, double value) {
        int lo = 0;
        int hi = sorted.length;
        while (lo < hi) {
            int mid = (lo + hi) >>> 1;
            if (sorted[mid] <= value) {
                lo = mid + 1;
            } else {
                hi = mid;
            }
        }
        return lo - 1;
    }
}
