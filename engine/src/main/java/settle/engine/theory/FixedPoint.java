package settle.engine.theory;

/**
 * The stationary noise ball of a constant rate α and batch B: S_ij = α C̃_ij / (λ_i + λ_j − α λ_i λ_j)
 * in H's eigenbasis (C̃ = Qᵀ C_B Q), the mean having decayed to 0 along every curved direction.
 *
 * @param rate α
 * @param batch B
 * @param exists false when some direction has no stationary spread (α λ_i ≥ 2, or a flat direction
 *     that still receives noise): then {@code distanceSq} is +∞
 * @param distanceSq stationary E‖θ − θ*‖² = Σ S_ii
 * @param excessLoss stationary ½ Σ λ_i S_ii (flat directions contribute 0; unstable ones +∞)
 * @param note why there is no fixed point, or an empty string
 */
public record FixedPoint(double rate, int batch, boolean exists, double distanceSq, double excessLoss, String note) {

    public FixedPoint {
        if (note == null) {
            throw new IllegalArgumentException("note must not be null (use an empty string)");
        }
    }
}
