package settle.engine.theory;

/**
 * The predicted noise ball of one replicate, or the reason it was skipped.
 *
 * @param predicted false when skipped (momentum, or too many parameters)
 * @param skipReason why it was skipped; empty when predicted
 * @param kind how far to trust it (null when skipped)
 * @param label a plain sentence saying what the prediction is (empty when skipped)
 * @param epochDistanceSq predicted E‖θ_t − θ*‖² at the end of epoch 1, 2, …. Copied.
 * @param epochExcessLoss predicted E F(θ_t) − F(θ*) = ½ Σ λ_i S_ii + ½ m_tᵀ H m_t at each epoch end. Copied.
 * @param tailUpdates L, the updates averaged over in the tail
 * @param tailDistanceSq the mean of the predicted E‖θ_t − θ*‖² over the last L updates
 * @param tailExcessLoss the mean of the predicted excess loss over the last L updates
 * @param finalDistanceSq predicted E‖θ_T − θ*‖²
 * @param finalExcessLoss predicted excess loss after the last update
 * @param fixedPoint the stationary ball at the last update's rate and the full batch size (null when skipped)
 * @param stabilityBound 2/λ_max(H): the mean diverges along the top direction for larger rates
 * @param largestRateTimesCurvature max_t α_t λ_max over the run
 */
public record NoiseBallPrediction(boolean predicted, String skipReason, PredictionKind kind, String label,
        double[] epochDistanceSq, double[] epochExcessLoss, int tailUpdates, double tailDistanceSq,
        double tailExcessLoss, double finalDistanceSq, double finalExcessLoss, FixedPoint fixedPoint,
        double stabilityBound, double largestRateTimesCurvature) {

    public NoiseBallPrediction {
        if (skipReason == null || label == null) {
            throw new IllegalArgumentException("reason and label must not be null (use empty strings)");
        }
        if (predicted == !skipReason.isEmpty()) {
            throw new IllegalArgumentException("a prediction has no skip reason, a skipped one must have one");
        }
        if (epochDistanceSq.length != epochExcessLoss.length) {
            throw new IllegalArgumentException("per-epoch curves differ in length");
        }
        epochDistanceSq = epochDistanceSq.clone();
        epochExcessLoss = epochExcessLoss.clone();
    }

    /**
     * @param reason why there is no prediction, as a sentence
     * @return a skipped prediction
     */
    public static NoiseBallPrediction skipped(String reason) {
        if (reason == null || reason.isEmpty()) {
            throw new IllegalArgumentException("a skipped prediction needs a reason");
        }
        return new NoiseBallPrediction(false, reason, null, "", new double[0], new double[0], 0, Double.NaN,
                Double.NaN, Double.NaN, Double.NaN, null, Double.NaN, Double.NaN);
    }

    /** @return a copy of the per-epoch predicted E‖θ − θ*‖² */
    @Override
    public double[] epochDistanceSq() {
        return epochDistanceSq.clone();
    }

    /** @return a copy of the per-epoch predicted excess loss */
    @Override
    public double[] epochExcessLoss() {
        return epochExcessLoss.clone();
    }
}
