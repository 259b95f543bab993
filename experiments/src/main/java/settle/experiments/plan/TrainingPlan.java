package settle.experiments.plan;

import settle.engine.train.Sampling;
import settle.engine.train.TrainingSettings;

/**
 * The training budget every arm of a plan shares: the trainer's {@link TrainingSettings} without the arm's
 * averaging choice, from which each arm's settings are derived ({@link #settings}).
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

    /**
     * Checks what a plan adds to the trainer's bounds (at most {@link #MAX_EPOCHS} epochs, K ≥ 2); every other
     * bound is {@link TrainingSettings}' own, checked there, once, by building the settings.
     */
    public TrainingPlan {
        if (epochs > MAX_EPOCHS) {
            throw new IllegalArgumentException("training.epochs must be in 1.." + MAX_EPOCHS + ": " + epochs);
        }
        if (snapshots < 2) {
            throw new IllegalArgumentException("training.snapshots must be ≥ 2: " + snapshots);
        }
        new TrainingSettings(epochs, batch, sampling, momentum, tail, snapshots, false);
    }

    /**
     * @param averageTail the arm's {@code average: tail}
     * @return the trainer's settings for one arm of this plan
     */
    public TrainingSettings settings(boolean averageTail) {
        return new TrainingSettings(epochs, batch, sampling, momentum, tail, snapshots, averageTail);
    }
}
