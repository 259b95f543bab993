package settle.experiments.plan;

import java.util.ArrayList;
import java.util.Collections;
import java.util.LinkedHashMap;
import java.util.List;
import java.util.Map;
import java.util.Objects;
import settle.engine.schedule.Schedule;

/**
 * An arm's schedule: the resolved YAML map (defaults filled in, keys in the schedule's canonical order) and
 * the {@link Schedule} built from it. Two specs are equal when their maps are equal.
 */
public final class ScheduleSpec {

    private final Map<String, Object> settings;
    private final Schedule schedule;

    /**
     * @param settings the resolved map; deep-copied into an unmodifiable map
     * @param schedule the schedule built from it
     */
    public ScheduleSpec(Map<String, ?> settings, Schedule schedule) {
        this.settings = freezeMap(settings);
        this.schedule = Objects.requireNonNull(schedule, "schedule");
        if (!(this.settings.get("kind") instanceof String)) {
            throw new IllegalArgumentException("a schedule map needs a kind");
        }
    }

    /** @return the schedule kind, as written in a plan */
    public String kind() {
        return (String) settings.get("kind");
    }

    /** @return the resolved map: String, Number, Boolean, List and Map values; unmodifiable */
    public Map<String, Object> settings() {
        return settings;
    }

    /** @return the schedule */
    public Schedule schedule() {
        return schedule;
    }

    @Override
    public boolean equals(Object o) {
        return o instanceof ScheduleSpec s && s.settings.equals(settings);
    }

    @Override
    public int hashCode() {
        return settings.hashCode();
    }

    @Override
    public String toString() {
        return PlanWriter.flow(settings);
    }

    private static Map<String, Object> freezeMap(Map<String, ?> m) {
        Map<String, Object> copy = new LinkedHashMap<>();
        for (Map.Entry<String, ?> e : m.entrySet()) {
            copy.put(Objects.requireNonNull(e.getKey(), "key"), freeze(e.getValue()));
        }
        return Collections.unmodifiableMap(copy);
    }

    private static Object freeze(Object v) {
        if (v instanceof Map<?, ?> m) {
            Map<String, Object> copy = new LinkedHashMap<>();
            for (Map.Entry<?, ?> e : m.entrySet()) {
                copy.put(String.valueOf(e.getKey()), freeze(e.getValue()));
            }
            return Collections.unmodifiableMap(copy);
        }
        if (v instanceof List<?> l) {
            List<Object> copy = new ArrayList<>();
            for (Object o : l) {
                copy.add(freeze(o));
            }
            return Collections.unmodifiableList(copy);
        }
        if (v == null || v instanceof String || v instanceof Number || v instanceof Boolean) {
            return v;
        }
        throw new IllegalArgumentException("a schedule value must be a string, number, boolean, list or map: " + v);
    }
}
