package settle.engine.schedule;

import java.util.Map;
import java.util.Objects;

/**
 * A base schedule whose rates are multiplied by the nudges in force ({@link NudgeLog#multiplier}): update
 * t of epoch e gets base(e, t) × multiplier(e). The multiplier is read once per epoch, at its first update,
 * so nudges appended while an epoch runs take effect from the epoch their {@code from} names (the runner
 * appends them only between epochs). With no nudge in force the rates are the base schedule's, bit for bit.
 * Everything else (kind, warmup, asymptotics, description, resolved map) is the base schedule's.
 */
public final class NudgedSchedule implements Schedule {

    private final Schedule base;
    private final NudgeLog log;

    /**
     * @param base the arm's schedule
     * @param log the arm's nudges; read, not modified
     */
    public NudgedSchedule(Schedule base, NudgeLog log) {
        this.base = Objects.requireNonNull(base, "base");
        this.log = Objects.requireNonNull(log, "log");
    }

    /** @return the schedule the nudges multiply */
    public Schedule base() {
        return base;
    }

    /** @return the nudge log read by the drivers */
    public NudgeLog log() {
        return log;
    }

    @Override
    public String kind() {
        return base.kind();
    }

    @Override
    public RateDriver start(RunShape shape) {
        return new Driver(base.start(shape), log);
    }

    @Override
    public Warmup warmup() {
        return base.warmup();
    }

    @Override
    public Asymptotics asymptotics() {
        return base.asymptotics();
    }

    @Override
    public String describe() {
        return base.describe() + ", × the nudges in force";
    }

    @Override
    public Map<String, Object> resolved() {
        return base.resolved();
    }

    /** Base driver × the multiplier of the current epoch, cached per epoch. */
    private static final class Driver implements RateDriver {
        private final RateDriver base;
        private final NudgeLog log;
        private int epoch = -1;
        private double multiplier = 1.0;

        Driver(RateDriver base, NudgeLog log) {
            this.base = base;
            this.log = log;
        }

        @Override
        public double rate(int epoch, long update) {
            if (epoch != this.epoch) {
                this.multiplier = log.multiplier(epoch);
                this.epoch = epoch;
            }
            double r = base.rate(epoch, update);
            return multiplier == 1.0 ? r : r * multiplier;
        }

        @Override
        public void epochEnded(int epoch, double trainObjective, double holdoutLoss) {
            base.epochEnded(epoch, trainObjective, holdoutLoss);
        }
    }
}
