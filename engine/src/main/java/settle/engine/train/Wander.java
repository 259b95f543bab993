package settle.engine.train;

/**
 * The per-replicate wander metrics of DESIGN.md "Wander metrics", for a replicate that finished. Every iterate is
 * projected onto the gauge-free subspace before a distance or a spread is taken. "Final" means θ_T, or the tail
 * mean θ̄ for an arm with {@code average: tail}. Values that need θ* are NaN without a reference; test values are
 * NaN (probabilities null) without a test split. Arrays are not copied: do not modify them.
 *
 * @param tail where the tail and its snapshots lie
 * @param tailIterates the number of tail iterates averaged into θ̄ (= L)
 * @param snapshotUpdates the update after which each snapshot was taken
 * @param snapshotObjectives F at each snapshot (full batch)
 * @param snapshots the K gauge-free snapshots, row-major K × P, while K·P ≤ {@link Trainer#SNAPSHOT_LIMIT};
 *     null beyond (the radius is then computed online, Welford over snapshots)
 * @param tailRadius sqrt((1/K) Σ‖θ_(k) − θ̄_K‖²), θ̄_K the snapshot mean (the primary metric)
 * @param tailDistance sqrt((1/K) Σ‖θ_(k) − θ*‖²)
 * @param tailLossSpread the standard deviation (divisor K) of the snapshot objectives
 * @param finalObjective F(final)
 * @param finalGap F(final) − F(θ*)
 * @param finalDistance ‖final − θ*‖
 * @param averagedObjective F(θ̄)
 * @param averagedGap F(θ̄) − F(θ*)
 * @param testLoss mean cross-entropy of the final iterate on the test split (no penalty)
 * @param testAccuracy accuracy of the final iterate on the test split
 * @param testProbabilities class probabilities of the final iterate, row-major N_test × classes
 */
public record Wander(TailPlan tail, long tailIterates, long[] snapshotUpdates, double[] snapshotObjectives,
        double[] snapshots, double tailRadius, double tailDistance, double tailLossSpread, double finalObjective,
        double finalGap, double finalDistance, double averagedObjective, double averagedGap, double testLoss,
        double testAccuracy, double[] testProbabilities) {
}
