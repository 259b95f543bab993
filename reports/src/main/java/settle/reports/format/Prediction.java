package settle.reports.format;

/**
 * A replicate's predicted noise ball, as its file records it ({@code prediction}). A number that does not apply (JSON
 * null) is NaN; the counts of a skipped prediction are −1.
 *
 * @param predicted false when the prediction was skipped
 * @param skipped why it was skipped ("" when predicted)
 * @param kind "exact" or "first-order" ("" when skipped)
 * @param label what the prediction is, in words ("" when skipped)
 * @param sampling "shuffle" or "replacement" ("" when skipped or not recorded)
 * @param momentum β of heavy-ball momentum (0 when not recorded)
 * @param stabilityBound 2(1 + β)/λmax(H), in rate units
 * @param largestRateTimesCurvature max_t α_t·λmax over the run
 * @param stable false when some update's α_t·λmax reaches 2(1 + β): the predicted mean grows without bound from
 *     there
 * @param unstableFromUpdate the first such update (from 1), or 0 when stable
 * @param unstableRateTimesCurvature α_t·λmax at that update (NaN when stable)
 * @param epochDistanceSq predicted E‖θ − θ*‖² at the end of each epoch (NaN from the unstable epoch on), or null
 *     when skipped
 * @param epochExcessLoss predicted excess loss at the end of each epoch (NaN from the unstable epoch on), or null
 *     when skipped
 * @param tailUpdates L, the updates of the tail
 * @param tailDistanceSq predicted E‖θ_t − θ*‖² averaged over every tail update
 * @param tailEpochEnds the epoch ends in the tail
 * @param tailDistanceSqEpochEnds predicted E‖θ_t − θ*‖² averaged over the tail's epoch ends
 * @param tailExcessLoss predicted excess loss averaged over the tail's updates
 * @param finalDistanceSq predicted E‖θ_T − θ*‖² = finalBiasSq + finalBall
 * @param finalExcessLoss predicted excess loss at the last update
 * @param finalBiasSq ‖m_T‖², the predicted squared mean offset left at the last update
 * @param finalBall tr S_T, the predicted spread at the last update
 * @param tailBiasSq the mean of ‖m_t‖² over the tail's updates
 * @param tailBall the mean of tr S_t over the tail's updates
 * @param fixedPoint the stationary ball at the last update's rate, or null when skipped or not recorded
 */
public record Prediction(boolean predicted, String skipped, String kind, String label, String sampling,
        double momentum, double stabilityBound, double largestRateTimesCurvature, boolean stable,
        long unstableFromUpdate, double unstableRateTimesCurvature, double[] epochDistanceSq, double[] epochExcessLoss,
        int tailUpdates, double tailDistanceSq, int tailEpochEnds, double tailDistanceSqEpochEnds, double tailExcessLoss,
        double finalDistanceSq, double finalExcessLoss, double finalBiasSq, double finalBall, double tailBiasSq,
        double tailBall, FixedPoint fixedPoint) {

    /**
     * The stationary noise ball at a constant rate, as recorded in {@code fixed_point}.
     *
     * @param rate the rate (the last update's)
     * @param batch the batch size
     * @param exists false when the rate is beyond the stability bound
     * @param distanceSq the stationary E‖θ − θ*‖² averaged over an epoch's updates (NaN when it does not exist)
     * @param distanceSqEpochEnd the stationary E‖θ − θ*‖² at an epoch's end
     * @param excessLoss the stationary excess loss
     * @param note what the fixed point is, or why it does not exist
     */
    public record FixedPoint(double rate, int batch, boolean exists, double distanceSq, double distanceSqEpochEnd,
            double excessLoss, String note) {
    }

    /**
     * @param reason why there is no prediction
     * @return a skipped prediction
     */
    public static Prediction skipped(String reason) {
        return new Prediction(false, reason, "", "", "", 0, Double.NaN, Double.NaN, true, 0, Double.NaN, null, null, -1,
                Double.NaN, -1, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN, Double.NaN,
                Double.NaN, null);
    }

    /** @return 2(1 + β), the bound on α·λmax below which the predicted mean is stable */
    public double stabilityLimit() {
        return 2 * (1 + momentum);
    }

    /**
     * @param updatesPerEpoch updates in one epoch
     * @return the epoch (from 1) holding the first unstable update, or 0 when stable
     */
    public int unstableEpoch(int updatesPerEpoch) {
        if (stable || unstableFromUpdate < 1) {
            return 0;
        }
        return (int) ((unstableFromUpdate - 1) / Math.max(1, updatesPerEpoch) + 1);
    }
}
