package settle.reports.stats;

/**
 * The outcome of an exact Wilcoxon signed-rank test.
 *
 * @param pairs number of differences given
 * @param zeros differences exactly zero, dropped before ranking (Wilcoxon's rule)
 * @param used differences ranked: pairs − zeros
 * @param statistic V, the sum of the (mid)ranks of the positive differences (R's "V")
 * @param pValue exact two-sided p-value (1 when nothing is left to rank)
 * @param tied true when some absolute differences tie and midranks were used
 */
public record SignedRankResult(int pairs, int zeros, int used, double statistic, double pValue, boolean tied) {

    public SignedRankResult {
        if (pairs < 0 || zeros < 0 || used != pairs - zeros) {
            throw new IllegalArgumentException("inconsistent counts: pairs " + pairs + ", zeros " + zeros
                    + ", used " + used);
        }
        if (!(pValue >= 0.0 && pValue <= 1.0)) {
            throw new IllegalArgumentException("p-value must be in [0, 1]: " + pValue);
        }
    }
}
