package settle.experiments.plan;

import java.util.List;
import java.util.Locale;
import java.util.Objects;
import settle.engine.schedule.NudgeLog;

/**
 * One arm of a plan: a name, a schedule, and whether its "final" iterate is the tail average. Everything
 * else (data, model, batch, epochs, sampling) is the plan's and shared.
 *
 * @param name unique within the plan; any characters (escaped wherever shown)
 * @param schedule the learning-rate schedule with every default filled in
 * @param average {@link Averaging#TAIL} to report θ̄ (the tail average) as the final iterate
 * @param manual true for an arm whose rate is changed by hand while the study runs (recorded, reserved for
 *        the manual-decay feature; the runner decides whether it can honour it)
 * @param nudges rate multipliers fixed in the plan (a replay of a manual arm's nudges), in the order they
 *        apply; empty for most arms
 */
public record ArmPlan(String name, ScheduleSpec schedule, Averaging average, boolean manual,
        List<NudgeLog.Entry> nudges) {

    /** What an arm reports as its final iterate. */
    public enum Averaging {
        /** the last iterate θ_T */
        NONE,
        /** the mean θ̄ of every tail iterate */
        TAIL;

        /** @return the name as written in a plan */
        public String yamlName() {
            return name().toLowerCase(Locale.ROOT);
        }
    }

    public ArmPlan {
        Objects.requireNonNull(name, "name");
        Objects.requireNonNull(schedule, "schedule");
        Objects.requireNonNull(average, "average");
        if (name.isBlank()) {
            throw new IllegalArgumentException("an arm name must not be blank");
        }
        nudges = List.copyOf(nudges);
    }

    /** An arm without fixed nudges. */
    public ArmPlan(String name, ScheduleSpec schedule, Averaging average, boolean manual) {
        this(name, schedule, average, manual, List.of());
    }

    /** @return whether the arm's rates are multiplied by nudges (live ones, or fixed in the plan) */
    public boolean nudged() {
        return manual || !nudges.isEmpty();
    }
}
