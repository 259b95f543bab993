package settle.engine.schedule;

/** The driver of a {@link CounterSchedule}: stateless apart from the run shape; allocates nothing per update. */
final class CounterDriver implements RateDriver {

    private final CounterSchedule schedule;
    private final RunShape shape;
    private final long warmupUpdates;

    CounterDriver(CounterSchedule schedule, RunShape shape, long warmupUpdates) {
        this.schedule = schedule;
        this.shape = shape;
        this.warmupUpdates = warmupUpdates;
    }

    @Override
    public double rate(int epoch, long update) {
        return schedule.baseRate(epoch, update, shape) * Warmup.factor(update, warmupUpdates);
    }
}
