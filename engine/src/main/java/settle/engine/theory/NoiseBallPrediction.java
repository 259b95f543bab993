package settle.engine.theory;

/**
 * The predicted noise ball of one replicate, or the reason it was skipped. E‖θ_t − θ*‖² splits into the squared
 * bias ‖m_t‖² (the mean offset the run has not yet shed) and the ball tr Σ_t (the spread the noise keeps up).
 *
 * @param predicted false when skipped (not convex, too many parameters, a diverged replicate)
 * @param skipReason why it was skipped; empty when predicted
 * @param kind how far to trust it (null when skipped)
 * @param label a plain sentence saying what the prediction is (empty when skipped)
 * @param sampling the sampler the recursion modelled (null when skipped)
 * @param momentum heavy-ball β of the recursion
 * @param stabilityBound 2(1 + β)/λ_max(H): the linearised mean diverges along the top direction for larger rates
 * @param largestRateTimesCurvature max_t α_t λ_max over the run
 * @param unstableFromUpdate the first update (from 1) at which the linearised mean was unstable, α_t·λmax ≥ 2(1 + β)
 *     (or a value stopped being finite); 0 when stable. From it on the prediction has no numbers.
 * @param unstableRateTimesCurvature α_t λ_max at that update (NaN when stable)
 * @param epochDistanceSq predicted E‖θ_t − θ*‖² at the end of epoch 1, 2, … (NaN from the unstable epoch on). Copied.
 * @param epochExcessLoss predicted E F(θ_t) − F(θ*) at each epoch end (same). Copied.
 * @param tailUpdates L, the updates averaged over in the tail
 * @param tailDistanceSq the mean of the predicted E‖θ_t − θ*‖² over the last L updates
 * @param tailEpochEnds the epoch ends among the last L updates
 * @param tailDistanceSqEpochEnds the mean of the predicted E‖θ_t − θ*‖² over those epoch ends (NaN when none)
 * @param tailExcessLoss the mean of the predicted excess loss over the last L updates
 * @param tailBiasSq the mean of ‖m_t‖² over the last L updates
 * @param tailBall the mean of tr Σ_t over the last L updates
 * @param finalDistanceSq predicted E‖θ_T − θ*‖² = finalBiasSq + finalBall
 * @param finalExcessLoss predicted excess loss after the last update
 * @param finalBiasSq ‖m_T‖², the squared bias left after the last update
 * @param finalBall tr Σ_T, the ball after the last update
 * @param fixedPoint the stationary ball at the last update's rate and the full batch size (null when skipped)
 */
public record NoiseBallPrediction(boolean predicted, String skipReason, PredictionKind kind, String label,
        BatchSampling sampling, double momentum, double stabilityBound, double largestRateTimesCurvature,
        long unstableFromUpdate, double unstableRateTimesCurvature, double[] epochDistanceSq,
        double[] epochExcessLoss, int tailUpdates, double tailDistanceSq, int tailEpochEnds,
        double tailDistanceSqEpochEnds, double tailExcessLoss, double tailBiasSq, double tailBall,
        double finalDistanceSq, double finalExcessLoss, double finalBiasSq, double finalBall,
        FixedPoint fixedPoint) {

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
        return new NoiseBallPrediction(false, reason, null, "", null, 0.0, Double.NaN, Double.NaN, 0, Double.NaN,
                new double[0], new double[0], 0, Double.NaN, 0, Double.NaN, Double.NaN, Double.NaN, Double.NaN,
                Double.NaN, Double.NaN, Double.NaN, Double.NaN, null);
    }

    /**
     * @return a prediction that became unstable at update {@code from}: the per-epoch values before it, no tail or
     *     final values
     */
    static NoiseBallPrediction unstable(PredictionKind kind, String label, BatchSampling sampling, double momentum,
            double[] epochDistanceSq, double[] epochExcessLoss, int tailUpdates, int tailEpochEnds,
            FixedPoint fixedPoint, double stabilityBound, double largest, long from, double product) {
        if (from < 1) {
            throw new IllegalArgumentException("an unstable prediction names the update from which it is unstable");
        }
        return new NoiseBallPrediction(true, "", kind, label, sampling, momentum, stabilityBound, largest, from, product,
                epochDistanceSq, epochExcessLoss, tailUpdates, Double.NaN, tailEpochEnds, Double.NaN, Double.NaN,
                Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, fixedPoint);
    }

    /** @return true when predicted and the linearised mean stayed stable over the whole run */
    public boolean stable() {
        return predicted && unstableFromUpdate == 0;
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
