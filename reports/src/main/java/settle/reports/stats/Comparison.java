package settle.reports.stats;

/**
 * One arm against the baseline on one per-replicate metric, paired by seed.
 *
 * <p>Effects are on the log-ratio scale, d_k = log(arm_k / baseline_k) after raising values below the
 * floor to it; {@link #percent(double)} turns them into a % change, 100·(exp(d) − 1).
 *
 * @param metric metric name as shown ("tail radius")
 * @param arm the arm's name
 * @param baseline the baseline arm's name
 * @param direction which way the metric improves
 * @param pairs replicate pairs given
 * @param bothDiverged pairs where both replicates diverged: dropped from everything
 * @param armDiverged pairs where only the arm's replicate diverged (counted as the arm being worse)
 * @param baselineDiverged pairs where only the baseline's replicate diverged
 * @param clamped finite values (arm or baseline) raised to the floor
 * @param floor the floor used
 * @param zeroDifferences pairs with identical values: dropped from the signed-rank test
 * @param testPairs pairs ranked in the signed-rank test
 * @param statistic V, the sum of the (mid)ranks of the pairs where the arm is larger
 * @param p exact two-sided signed-rank p-value
 * @param pAdjusted Holm-adjusted p over the {@code arms} comparisons of this metric
 * @param arms m, the number of arms compared with the baseline
 * @param effectPairs finite pairs behind the effect and its intervals
 * @param estimate Hodges–Lehmann estimate of the log-ratio (NaN without finite pairs)
 * @param exact exact signed-rank interval of the log-ratio, with its achieved level
 * @param bootstrap percentile bootstrap interval of the log-ratio
 * @param probabilityBetter fraction of the pairs (both-diverged dropped) where the arm beats the
 *     baseline, ties counting ½
 * @param smallestAdjustedP m · 2/2ⁿ for n = testPairs: the best this study could show
 * @param pairsNeeded the number of pairs for which m · 2/2ⁿ ≤ significance
 * @param significance level α for "a difference is detected"
 */
public record Comparison(String metric, String arm, String baseline, Direction direction, int pairs,
        int bothDiverged, int armDiverged, int baselineDiverged, int clamped, double floor, int zeroDifferences,
        int testPairs, double statistic, double p, double pAdjusted, int arms, int effectPairs, double estimate,
        Interval exact, Interval bootstrap, double probabilityBetter, double smallestAdjustedP, int pairsNeeded,
        double significance) {

    public Comparison {
        if (pairs != bothDiverged + armDiverged + baselineDiverged + effectPairs) {
            throw new IllegalArgumentException("pair counts do not add up: " + pairs + " ≠ " + bothDiverged + " + "
                    + armDiverged + " + " + baselineDiverged + " + " + effectPairs);
        }
        if (testPairs != pairs - bothDiverged - zeroDifferences) {
            throw new IllegalArgumentException("test pairs " + testPairs + " ≠ " + pairs + " − " + bothDiverged
                    + " − " + zeroDifferences);
        }
        if (!(p >= 0 && p <= 1) || !(pAdjusted >= p && pAdjusted <= 1)) {
            throw new IllegalArgumentException("p-values out of range: p " + p + ", adjusted " + pAdjusted);
        }
        if (exact == null || bootstrap == null) {
            throw new IllegalArgumentException("intervals must be given (use Interval.none)");
        }
    }

    /** @return 100·(exp(logRatio) − 1): the % change of the arm relative to the baseline */
    public static double percent(double logRatio) {
        return 100.0 * Math.expm1(logRatio);
    }

    /** @return the estimated % change (NaN without finite pairs) */
    public double percentChange() {
        return percent(estimate);
    }

    /** @return true when the Holm-adjusted p is at most the significance level */
    public boolean detected() {
        return pAdjusted <= significance;
    }

    /** @return true when the ranks say the arm's values are larger (V above its null mean) */
    public boolean armLarger() {
        return statistic > testPairs * (testPairs + 1) / 4.0;
    }

    /** @return pairs with exactly one diverged replicate: set aside from the effect */
    public int setAside() {
        return armDiverged + baselineDiverged;
    }
}
