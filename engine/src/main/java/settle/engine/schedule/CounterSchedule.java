package settle.engine.schedule;

/** A schedule that is a pure function of the counters: its rate before warmup, then the warmup factor. */
interface CounterSchedule extends Schedule {

    /** @return the rate before warmup for this update (finite, ≥ 0) */
    double baseRate(int epoch, long update, RunShape shape);

    @Override
    default RateDriver start(RunShape shape) {
        return new CounterDriver(this, shape, warmup().updatesFor(shape, kind()));
    }
}
