package settle.engine.theory;

/**
 * The stationary noise ball of a constant rate α and batch B (see {@link NoiseBallTheory#fixedPoint}): the
 * covariance that one period of the recursion (one update with replacement, one epoch under reshuffling) maps onto
 * itself, the mean having decayed to 0 along every curved direction.
 *
 * @param rate α
 * @param batch B
 * @param exists false when some direction has no stationary spread (α·λmax ≥ 2(1 + β), or a flat direction
 *     that still receives noise): then the distances are +∞
 * @param distanceSq stationary E‖θ − θ*‖², averaged over the period's updates
 * @param distanceSqEpochEnd stationary E‖θ − θ*‖² at the period's end (an epoch end under reshuffling, where the
 *     reshuffled ball is smallest; equal to {@code distanceSq} with replacement)
 * @param excessLoss stationary ½ Σ λ_i S_ii averaged over the period's updates (+∞ when unstable, NaN when only a
 *     flat direction has no fixed point)
 * @param note why there is no fixed point, or an empty string
 */
public record FixedPoint(double rate, int batch, boolean exists, double distanceSq, double distanceSqEpochEnd,
        double excessLoss, String note) {

    public FixedPoint {
        if (note == null) {
            throw new IllegalArgumentException("note must not be null (use an empty string)");
        }
    }
}
