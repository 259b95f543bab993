package settle.reports.stats;

import java.util.Arrays;
import settle.datasets.Randomness;

/**
 * Percentile bootstrap intervals (B. Efron, "Bootstrap methods: another look at the jackknife",
 * Ann. Statist. 7(1), 1979): resample the replicates with replacement, recompute the statistic, and
 * take the type-7 quantiles (1 − level)/2 and (1 + level)/2 of the resampled values.
 *
 * <p>Resampling is driven by {@link Randomness.SplitMix64} from a given seed, so the same seed and inputs give
 * bit-identical intervals on any JVM: for resample b, n indices in order, each uniform on [0, n).
 */
public final class Bootstrap {

    /** The least number of resamples accepted. */
    public static final int MIN_RESAMPLES = 10_000;

    private Bootstrap() {
    }

    /**
     * Bootstrap values of the Hodges–Lehmann estimate of x.
     *
     * @param x finite values (paired log-ratios), at least one. Not modified.
     * @param seed generator seed
     * @param resamples number of resamples, at least {@link #MIN_RESAMPLES}
     * @return the resampled estimates, sorted ascending
     */
    public static double[] hodgesLehmannReplicates(double[] x, long seed, int resamples) {
        checkResamples(resamples);
        int n = x.length;
        if (n == 0) {
            throw new IllegalArgumentException("the bootstrap needs at least one value");
        }
        for (int i = 0; i < n; i++) {
            if (!Double.isFinite(x[i])) {
                throw new IllegalArgumentException("value " + i + " is not finite: " + x[i]);
            }
        }
        // A resample is the multiset of the original values with counts c_k. Its Walsh averages are
        // (x_k + x_l)/2 with multiplicity c_k·c_l for k < l and c_k(c_k + 1)/2 for k = l, so its median is a
        // weighted median over the original n(n+1)/2 pairs sorted once: O(n²) per resample, no selection,
        // and the same value as the median of the resample's own Walsh averages.
        int pairs = HodgesLehmann.walshCount(n);
        double[] value = new double[pairs];
        int[] first = new int[pairs];
        int[] second = new int[pairs];
        sortPairsByValue(x, value, first, second);
        Randomness.SplitMix64 random = new Randomness.SplitMix64(seed);
        int[] counts = new int[n];
        double[] out = new double[resamples];
        long half = pairs / 2;
        boolean even = (pairs & 1) == 0;
        for (int b = 0; b < resamples; b++) {
            Arrays.fill(counts, 0);
            for (int i = 0; i < n; i++) {
                counts[random.nextIndex(n)]++;
            }
            // ranks are 0-based; the median is element `half`, averaged with element `half − 1` when even
            long seen = 0;
            double lower = Double.NaN;
            double upper = Double.NaN;
            for (int r = 0; r < pairs; r++) {
                int ci = counts[first[r]];
                if (ci == 0) {
                    continue;
                }
                int cj = counts[second[r]];
                long w = first[r] == second[r] ? (long) ci * (ci + 1) / 2 : (long) ci * cj;
                if (w == 0) {
                    continue;
                }
                if (even && Double.isNaN(lower) && seen + w > half - 1) {
                    lower = value[r];
                }
                seen += w;
                if (seen > half) {
                    upper = value[r];
                    break;
                }
            }
            out[b] = even ? (lower + upper) / 2.0 : upper;
        }
        Arrays.sort(out);
        return out;
    }

    /**
     * The Walsh averages (x_i + x_j)/2, i ≤ j, sorted: the r-th smallest goes to {@code value[r]} and its pair
     * to {@code first[r]}, {@code second[r]}.
     */
    private static void sortPairsByValue(double[] x, double[] value, int[] first, int[] second) {
        int n = x.length;
        Integer[] rank = new Integer[value.length];
        int[] pi = new int[value.length];
        int[] pj = new int[value.length];
        double[] v = new double[value.length];
        int q = 0;
        for (int i = 0; i < n; i++) {
            for (int j = i; j < n; j++) {
                pi[q] = i;
                pj[q] = j;
                v[q] = (x[i] + x[j]) / 2.0;
                rank[q] = q;
                q++;
            }
        }
        Arrays.sort(rank, (a, b) -> Double.compare(v[a], v[b]));
        for (int r = 0; r < rank.length; r++) {
            value[r] = v[rank[r]];
            first[r] = pi[rank[r]];
            second[r] = pj[rank[r]];
        }
    }

    /**
     * @param x finite values, at least one. Not modified.
     * @param seed generator seed
     * @param resamples at least {@link #MIN_RESAMPLES}
     * @param level nominal confidence level in (0, 1)
     * @return the percentile interval of the Hodges–Lehmann estimate
     */
    public static Interval hodgesLehmannInterval(double[] x, long seed, int resamples, double level) {
        return percentile(hodgesLehmannReplicates(x, seed, resamples), level);
    }

    /**
     * @param sorted resampled values, ascending. Not modified.
     * @param level nominal confidence level in (0, 1)
     * @return [Q((1 − level)/2), Q((1 + level)/2)], type-7 quantiles
     */
    public static Interval percentile(double[] sorted, double level) {
        checkLevel(level);
        return new Interval(Quantiles.type7(sorted, (1.0 - level) / 2.0),
                Quantiles.type7(sorted, (1.0 + level) / 2.0), level);
    }

    private static void checkResamples(int resamples) {
        if (resamples < MIN_RESAMPLES) {
            throw new IllegalArgumentException("bootstrap resamples must be at least " + MIN_RESAMPLES + ": "
                    + resamples);
        }
    }

    private static void checkLevel(double level) {
        if (!(level > 0.0 && level < 1.0)) {
            throw new IllegalArgumentException("confidence level must be in (0, 1): " + level);
        }
    }
}
