package settle.reports.stats;

/**
 * The exact null distribution of the Wilcoxon signed-rank statistic, by dynamic programming over rank
 * sums: under the null hypothesis each rank carries a plus sign with probability ½ independently, so
 * the probability of every attainable sum is built one rank at a time, p'(s) = ½ p(s) + ½ p(s − r).
 * That costs O(n · Σr) time and O(Σr) memory for any n — no enumeration of the 2ⁿ sign patterns.
 *
 * <p>Ranks are integer <em>scores</em>. For untied data the scores are the ranks 1..n. With ties the
 * caller passes <em>doubled</em> midranks (a tie group over positions a..b gets a + b), which are
 * integers, so the distribution of the doubled statistic stays exact. Every probability is a dyadic
 * rational k/2ⁿ; in double precision the sums are therefore exact while the counts stay below 2⁵³
 * (n ≤ 53) and accurate to rounding beyond.
 */
public final class SignedRankDistribution {

    /**
     * R's fuzz in {@code qsignrank} (nmath/signrank.c): 10 · DBL_EPSILON, so that a probability that
     * equals a cumulative sum up to rounding picks the same quantile as R.
     */
    private static final double QUANTILE_FUZZ = 10 * Math.ulp(1.0);

    private SignedRankDistribution() {
    }

    /**
     * @param scores non-negative integer scores (ranks, or doubled midranks). Not modified.
     * @return p[s] = probability that the sum of the scores carrying a plus sign equals s, for
     *         s = 0 … Σ scores
     */
    public static double[] nullProbabilities(int[] scores) {
        long total = 0;
        for (int i = 0; i < scores.length; i++) {
            if (scores[i] < 0) {
                throw new IllegalArgumentException("rank score " + i + " is negative: " + scores[i]);
            }
            total += scores[i];
        }
        if (total > 50_000_000L) {
            throw new IllegalArgumentException("rank sums up to " + total
                    + " are too large for the exact distribution (at most 50 000 000, about 7 000 pairs)");
        }
        double[] p = new double[(int) total + 1];
        p[0] = 1.0;
        int reach = 0;
        for (int score : scores) {
            int top = reach + score;
            for (int s = top; s >= 0; s--) {
                double keep = s <= reach ? p[s] : 0.0;
                double add = s >= score ? p[s - score] : 0.0;
                p[s] = 0.5 * keep + 0.5 * add;
            }
            reach = top;
        }
        return p;
    }

    /**
     * Two-sided exact p-value: min(1, 2 · min(P(W ≤ w), P(W ≥ w))). The null distribution is
     * symmetric about Σ scores / 2, so this is the same p as R's {@code wilcox.test} exact branch.
     *
     * @param scores the scores of the non-zero differences. Not modified.
     * @param observed the observed sum of the scores of the positive differences
     * @return the two-sided p-value; 1 when there are no scores
     */
    public static double twoSidedP(int[] scores, long observed) {
        double[] p = nullProbabilities(scores);
        int top = p.length - 1;
        if (observed < 0 || observed > top) {
            throw new IllegalArgumentException("observed rank sum " + observed + " outside [0, " + top + "]");
        }
        int w = (int) observed;
        double lower = 0.0;
        for (int s = 0; s <= w; s++) {
            lower += p[s];
        }
        double upper = 0.0;
        for (int s = top; s >= w; s--) {
            upper += p[s];
        }
        return Math.min(1.0, 2.0 * Math.min(lower, upper));
    }

    /**
     * @param n number of untied pairs, at least 0
     * @return P(V ≤ s) for s = 0 … n(n+1)/2, V the untied signed-rank statistic (R's {@code psignrank})
     */
    public static double[] untiedCdf(int n) {
        if (n < 0) {
            throw new IllegalArgumentException("number of pairs must be non-negative: " + n);
        }
        int[] ranks = new int[n];
        for (int i = 0; i < n; i++) {
            ranks[i] = i + 1;
        }
        double[] cdf = nullProbabilities(ranks);
        for (int s = 1; s < cdf.length; s++) {
            cdf[s] += cdf[s - 1];
        }
        return cdf;
    }

    /**
     * The smallest q with P(V ≤ q) ≥ prob (R's {@code qsignrank} for prob ≤ ½, with R's fuzz).
     *
     * @param cdf the output of {@link #untiedCdf(int)}. Not modified.
     * @param prob a probability in [0, ½]
     * @return the lower quantile q
     */
    public static int lowerQuantile(double[] cdf, double prob) {
        if (!(prob >= 0.0 && prob <= 0.5)) {
            throw new IllegalArgumentException("quantile probability must be in [0, 0.5]: " + prob);
        }
        double target = prob - QUANTILE_FUZZ;
        for (int q = 0; q < cdf.length; q++) {
            if (cdf[q] >= target) {
                return q;
            }
        }
        return cdf.length - 1;
    }
}
