package settle.reports.study;

/**
 * A replicate's predicted noise ball, as its file records it.
 *
 * @param predicted false when the prediction was skipped
 * @param skipped why it was skipped ("" when predicted)
 * @param kind exact, first-order or approximate ("" when skipped)
 * @param label what the prediction is, in words ("" when skipped)
 * @param epochDistanceSq predicted E‖θ_t − θ*‖² at the end of each epoch, or null
 * @param tailDistanceSq predicted E‖θ_t − θ*‖² averaged over the tail's updates (NaN when skipped)
 * @param stabilityBound 2/λmax(H) (NaN when skipped)
 * @param largestRateTimesCurvature the largest α_t·λmax of the run (NaN when skipped)
 */
public record Prediction(boolean predicted, String skipped, String kind, String label, double[] epochDistanceSq,
        double tailDistanceSq, double stabilityBound, double largestRateTimesCurvature) {
}
