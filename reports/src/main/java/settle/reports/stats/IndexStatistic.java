package settle.reports.stats;

/**
 * A statistic of a resampled set of replicates: {@code indices} holds n replicate indices (0-based,
 * drawn with replacement); the statistic writes one value per output slot (for example one per arm, so
 * that every arm sees the same resampled seeds).
 */
@FunctionalInterface
public interface IndexStatistic {

    /**
     * @param indices the resampled replicate indices. Not modified.
     * @param out one value per statistic. Modified.
     */
    void evaluate(int[] indices, double[] out);
}
