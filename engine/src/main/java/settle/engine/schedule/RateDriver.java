package settle.engine.schedule;

/**
 * The learning rate of one replicate as training proceeds. A driver is created per replicate by
 * {@link Schedule#start}; for every kind but plateau it is a pure function of the counters.
 *
 * <p>Call order, fixed: for each epoch e = 1, 2, …: {@link #rate} for each of its updates, in order; then
 * {@link #epochEnded} once with the epoch's losses.
 */
public interface RateDriver {

    /**
     * @param epoch 1 for the first pass over the training split
     * @param update 1 for the first update of the run
     * @return α for this update; finite and ≥ 0
     */
    double rate(int epoch, long update);

    /**
     * Reports the losses recorded at the end of an epoch (plateau reads them; others ignore them).
     *
     * @param trainObjective full-batch training objective F(θ) at the end of the epoch
     * @param holdoutLoss mean cross-entropy on the holdout split, or NaN when there is none
     */
    default void epochEnded(int epoch, double trainObjective, double holdoutLoss) {
    }
}
