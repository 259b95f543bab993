package settle.engine.train;

/**
 * The per-replicate wander metrics of DESIGN.md "Wander metrics", for a replicate that finished. Every iterate is
 * projected onto the gauge-free subspace before a distance or a spread is taken. "Final" means θ_T, or the tail
 * mean θ̄ for an arm with {@code average: tail}. Values that need θ* are NaN without a reference; test values are
 * NaN (probabilities null) without a test split. Arrays are not copied: do not modify them.
 *
 * <p>The tail metrics are taken over every one of the L tail iterates θ_t (and over the E epoch ends among them),
 * online, so they do not depend on the number or the placement of the snapshots; the snapshots serve the tail
 * cloud and the tail loss spread.
 *
 * @param tail where the tail and its snapshots lie
 * @param tailIterates the number of tail iterates averaged into θ̄ (= L)
 * @param snapshotUpdates the update after which each snapshot was taken ({@link TailPlan#snapshotUpdates})
 * @param snapshotObjectives F at each snapshot (full batch)
 * @param snapshots the K gauge-free snapshots, row-major K × P, while K·P ≤ {@link Trainer#SNAPSHOT_LIMIT};
 *     null beyond
 * @param tailRadius sqrt((1/L) Σ_tail ‖θ_t − θ̄‖²) over every tail iterate, θ̄ their mean
 * @param tailDistance sqrt((1/L) Σ_tail ‖θ_t − θ*‖²) over every tail iterate (= sqrt(tailRadius² + ‖θ̄ − θ*‖²))
 * @param tailRadiusEpochEnds sqrt((1/E) Σ_e ‖θ_e − θ̄_E‖²) over the E epoch ends in the tail, θ̄_E their own mean
 *     (0 when E = 1)
 * @param tailDistanceEpochEnds sqrt((1/E) Σ_e ‖θ_e − θ*‖²) over the E epoch ends in the tail
 * @param tailEpochEnds E, the number of epoch ends in the tail (≥ 1: the last update T is one)
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
        double[] snapshots, double tailRadius, double tailDistance, double tailRadiusEpochEnds,
        double tailDistanceEpochEnds, long tailEpochEnds, double tailLossSpread, double finalObjective,
        double finalGap, double finalDistance, double averagedObjective, double averagedGap, double testLoss,
        double testAccuracy, double[] testProbabilities) {
}
