package settle.experiments.plan;

import java.util.Objects;
import settle.engine.train.Sampling;
import settle.engine.train.TrainingSettings;

/**
 * The training budget every arm of a plan shares.
 *
 * @param epochs passes over the training split, ≥ 1
 * @param batch examples per update B, ≥ 1
 * @param sampling how batches are drawn
 * @param momentum heavy-ball β in [0, 1)
 * @param tail the fraction τ of the updates that forms the tail, in (0, 1]
 * @param snapshots evenly spaced tail snapshots K, ≥ 2 (capped at the tail length when training)
 */
public record TrainingPlan(int epochs, int batch, Sampling sampling, double momentum, double tail, int snapshots) {

    /** Largest number of epochs a plan may ask for. */
    public static final int MAX_EPOCHS = 1_000_000;

    public TrainingPlan {
        Objects.requireNonNull(sampling, "sampling");
        if (epochs < 1 || epochs > MAX_EPOCHS) {
            throw new IllegalArgumentException("epochs must be in 1.." + MAX_EPOCHS + ": " + epochs);
        }
        if (batch < 1) {
            throw new IllegalArgumentException("batch must be ≥ 1: " + batch);
        }
        if (!(momentum >= 0 && momentum < 1)) {
            throw new IllegalArgumentException("momentum must be in [0, 1): " + momentum);
        }
        if (!(tail > 0 && tail <= 1)) {
            throw new IllegalArgumentException("tail must be in (0, 1]: " + tail);
        }
        if (snapshots < 2) {
            throw new IllegalArgumentException("snapshots must be ≥ 2: " + snapshots);
        }
    }

    /**
     * @param averageTail the arm's {@code average: tail}
     * @return the trainer's settings for one arm of this plan
     */
    public TrainingSettings settings(boolean averageTail) {
        return new TrainingSettings(epochs, batch, sampling, momentum, tail, snapshots, averageTail);
    }
}
