package settle.engine.train;

/**
 * What a replicate recorded at the end of one epoch. Values that do not apply are NaN.
 *
 * @param epoch 1 for the first pass
 * @param lastUpdate the number of the epoch's last update (1-based over the run)
 * @param rate the rate α of the epoch's last update
 * @param objective the full-batch training objective F(θ) = mean cross-entropy + (λ/2)‖weights‖²
 * @param holdoutLoss mean cross-entropy on the holdout split (no penalty), NaN without one
 * @param testLoss mean cross-entropy on the test split (no penalty), NaN without one
 * @param testAccuracy fraction of test rows whose most probable class is their label, NaN without a test split
 * @param distance ‖θ − θ*‖ with θ first projected onto the gauge-free subspace, NaN without a reference
 */
public record EpochRecord(int epoch, long lastUpdate, double rate, double objective, double holdoutLoss,
        double testLoss, double testAccuracy, double distance) {
}
