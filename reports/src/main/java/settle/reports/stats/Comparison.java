package settle.reports.stats;

/**
 * One arm against the baseline on one per-replicate metric, paired by seed.
 *
 * <p>Effects are on the comparison's {@link Scale}: the log-ratio d_k = log(arm_k / baseline_k) after raising values
 * below the floor to it, shown as a % change 100·(exp(d) − 1); or the difference of a fraction, shown in percentage
 * points. The intervals are at level 1 − (1 − c)/m, adjusted across the m arms like the p.
 *
 * @param metric metric name as shown ("tail radius")
 * @param arm the arm's name
 * @param baseline the baseline arm's name
 * @param direction which way the metric improves
 * @param scale how paired values were compared
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
 * @param pAdjusted Bonferroni-adjusted p over the {@code arms} comparisons of this metric, min(1, m·p)
 * @param arms m, the number of arms compared with the baseline
 * @param effectPairs finite pairs behind the effect and its intervals
 * @param estimate Hodges–Lehmann estimate of d (NaN without finite pairs)
 * @param exact exact signed-rank interval of d at the adjusted level, with the level it achieves
 * @param bootstrap percentile bootstrap interval of d at the adjusted level
 * @param probabilityBetter fraction of the pairs (both-diverged dropped) where the arm beats the
 *     baseline, ties counting ½
 * @param smallestAdjustedP m · 2/2ⁿ for n = testPairs: the best this study could show
 * @param pairsNeeded the number of pairs for which m · 2/2ⁿ ≤ significance
 * @param significance level α for "a difference is detected"
 * @param level the intervals' requested level, 1 − (1 − c)/m
 */
public record Comparison(String metric, String arm, String baseline, Direction direction, Scale scale, int pairs,
        int bothDiverged, int armDiverged, int baselineDiverged, int clamped, double floor, int zeroDifferences,
        int testPairs, double statistic, double p, double pAdjusted, int arms, int effectPairs, double estimate,
        Interval exact, Interval bootstrap, double probabilityBetter, double smallestAdjustedP, int pairsNeeded,
        double significance, double level) {

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

    /** @return the estimated change as shown: % (log ratio) or percentage points (NaN without finite pairs) */
    public double change() {
        return scale.shown(estimate);
    }

    /** @return true when the exact interval lies entirely on one side of "no change" */
    public boolean intervalExcludesZero() {
        return exact.isDefined() && (exact.low() > 0 || exact.high() < 0);
    }

    /** @return true when the adjusted p is at most the significance level */
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
