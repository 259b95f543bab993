package settle.engine.schedule;

/**
 * The length of a planned run, which progress-based schedules need: {@code epochs} passes of
 * {@code updatesPerEpoch} updates each (⌈N/B⌉ for both sampling modes).
 */
public record RunShape(int epochs, int updatesPerEpoch) {

    public RunShape {
        if (epochs < 1) {
            throw new IllegalArgumentException("epochs must be at least 1: " + epochs);
        }
        if (updatesPerEpoch < 1) {
            throw new IllegalArgumentException("updates per epoch must be at least 1: " + updatesPerEpoch);
        }
    }

    /** @return the number of updates in the run */
    public long totalUpdates() {
        return (long) epochs * updatesPerEpoch;
    }

    /** @return (update − 1) / total updates, in [0, 1), for the 1-based {@code update} */
    public double progress(long update) {
        return (update - 1) / (double) totalUpdates();
    }

    /** @return the 1-based epoch of the 1-based {@code update} */
    public int epochOf(long update) {
        return (int) ((update - 1) / updatesPerEpoch) + 1;
    }
}
