package settle.engine.train;

import java.util.Objects;

/**
 * The training budget shared by every arm of a plan, plus the arm's averaging choice: the one record of the plan's
 * {@code training} keys and their bounds (a plan holds it with {@code averageTail} false; each arm's trainer gets
 * {@link #withAverageTail}). Key names in messages are the plan's ({@code training.epochs}, …).
 *
 * @param epochs passes over the training split, 1..{@value #MAX_EPOCHS}
 * @param batch rows per mini-batch B, ≥ 1
 * @param sampling shuffle or replacement
 * @param momentum heavy-ball β in [0, 1); 0 is plain SGD
 * @param tail τ in (0, 1]: the tail is the last ⌈τT⌉ updates
 * @param snapshots K ≥ 1 tail snapshots, placed by {@link TailPlan} (reduced to the tail length when the tail is
 *     shorter); a plan asks for at least 2 ({@code training.snapshots}, checked where the plan is read)
 * @param averageTail true for an arm with {@code average: tail}: its "final" iterate is the tail mean θ̄
 */
public record TrainingSettings(int epochs, int batch, Sampling sampling, double momentum, double tail, int snapshots,
        boolean averageTail) {

    /** Largest number of epochs a run may ask for. */
    public static final int MAX_EPOCHS = 1_000_000;

    /** Validates every field, naming its plan key and the accepted range. */
    public TrainingSettings {
        Objects.requireNonNull(sampling, "training.sampling");
        if (epochs < 1 || epochs > MAX_EPOCHS) {
            throw new IllegalArgumentException("training.epochs must be an integer in 1.." + MAX_EPOCHS + ": " + epochs);
        }
        if (batch < 1) {
            throw new IllegalArgumentException("training.batch must be an integer ≥ 1: " + batch);
        }
        if (!(momentum >= 0 && momentum < 1)) {
            throw new IllegalArgumentException("training.momentum must be in [0, 1): " + momentum);
        }
        if (!(tail > 0 && tail <= 1)) {
            throw new IllegalArgumentException("training.tail must be in (0, 1]: " + tail);
        }
        if (snapshots < 1) {
            throw new IllegalArgumentException("training.snapshots must be an integer ≥ 1: " + snapshots);
        }
    }

    /** @return a copy with another sampling mode */
    public TrainingSettings withSampling(Sampling value) {
        return new TrainingSettings(epochs, batch, value, momentum, tail, snapshots, averageTail);
    }

    /** @return a copy with another momentum β */
    public TrainingSettings withMomentum(double value) {
        return new TrainingSettings(epochs, batch, sampling, value, tail, snapshots, averageTail);
    }

    /** @return a copy with another tail fraction and snapshot count */
    public TrainingSettings withTail(double fraction, int count) {
        return new TrainingSettings(epochs, batch, sampling, momentum, fraction, count, averageTail);
    }

    /** @return a copy with tail averaging on or off */
    public TrainingSettings withAverageTail(boolean value) {
        return new TrainingSettings(epochs, batch, sampling, momentum, tail, snapshots, value);
    }

    /** @return updates per epoch for N training rows: ⌈N/B⌉ in both sampling modes */
    public int updatesPerEpoch(int rows) {
        if (rows < 1) {
            throw new IllegalArgumentException("the training split has no rows");
        }
        return (int) ((rows + (long) batch - 1) / batch);
    }

    /** @return T, the planned number of updates for N training rows */
    public long totalUpdates(int rows) {
        return (long) epochs * updatesPerEpoch(rows);
    }

    /**
     * The tail length L = ⌈τT⌉, clamped to [1, T]. τT is first rounded to the nearest integer when it lies within
     * 1e-9 relative of one, so that τ = 0.7, T = 10 gives 7 and not the 8 that 0.7·10 = 7.000000000000001 would.
     *
     * @return L for a run of {@code totalUpdates} updates
     */
    public long tailLength(long totalUpdates) {
        return tailLength(tail, totalUpdates);
    }

    static long tailLength(double tau, long totalUpdates) {
        double x = tau * totalUpdates;
        double nearest = Math.rint(x);
        long length = Math.abs(x - nearest) <= 1e-9 * Math.max(1.0, x) ? (long) nearest : (long) Math.ceil(x);
        return Math.max(1, Math.min(totalUpdates, length));
    }
}
