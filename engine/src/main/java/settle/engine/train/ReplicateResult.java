package settle.engine.train;

import java.util.List;

/**
 * Everything one replicate recorded. Arrays are not copied: do not modify them.
 *
 * @param seeds the replicate's derived seeds
 * @param status finished, or diverged
 * @param divergedAt the update whose batch loss, or whose epoch-end objective, was non-finite or above
 *     1e6·F(θ₀); 0 when finished
 * @param totalUpdates T, the planned number of updates
 * @param averageTail true for an arm with {@code average: tail} (its "final" iterate is θ̄)
 * @param rates the rate of every update applied, in order (length T when finished)
 * @param epochs the record of every completed epoch, in order
 * @param initialObjective F(θ₀)
 * @param start θ₀ (P values)
 * @param last θ_T, the iterate after the last update applied (raw, not projected)
 * @param tailMean θ̄, the mean of every tail iterate (raw, not projected); null when diverged
 * @param wander the wander metrics; null when diverged
 */
public record ReplicateResult(ReplicateSeeds seeds, Status status, long divergedAt, long totalUpdates, boolean averageTail,
        double[] rates,
        List<EpochRecord> epochs, double initialObjective, double[] start, double[] last, double[] tailMean,
        Wander wander) {

    /** How a replicate ended. */
    public enum Status {
        /** every planned update ran */
        FINISHED,
        /** stopped early: a loss became non-finite or exceeded 1e6·F(θ₀) */
        DIVERGED;

        /** @return {@code finished} or {@code diverged}, as written in replicate files */
        public String key() {
            return name().toLowerCase(java.util.Locale.ROOT);
        }
    }

    /** Freezes the epoch list. */
    public ReplicateResult {
        epochs = List.copyOf(epochs);
    }

    /** @return true when the replicate diverged */
    public boolean diverged() {
        return status == Status.DIVERGED;
    }

    /** @return the iterate the metrics call "final": θ̄ for a tail-averaged arm that finished, θ_T otherwise */
    public double[] finalParameters() {
        return averageTail && tailMean != null ? tailMean : last;
    }
}
