package settle.experiments.plan;

import java.util.List;
import java.util.Objects;

/**
 * What one {@code grid} entry of a plan expanded into: the template arm it names, the schedule keys it sweeps with
 * their values as written in the plan, and each arm it produced with its values. The resolved {@link Plan} holds the
 * expanded arms only (its {@code plan.yaml} is written with the grid expanded); this record keeps their structure,
 * which the study's manifest records for the report.
 *
 * @param arm the template arm's name, as written in {@code arms}
 * @param keys the swept schedule keys, in the order the entry lists them
 * @param values per key (same order as {@code keys}), its values as written in the plan, in the plan's order
 * @param arms the arms the entry produced, in plan order (the last key varies fastest)
 */
public record GridExpansion(String arm, List<String> keys, List<List<String>> values, List<Expanded> arms) {

    /**
     * One arm a grid entry produced.
     *
     * @param index its index in {@link Plan#arms()} (0-based; the manifest's arm index is this + 1)
     * @param values its value of each swept key, as written in the plan, in the order of {@link #keys()}
     */
    public record Expanded(int index, List<String> values) {

        /**
         * @param index ≥ 0
         * @param values copied
         * @throws IllegalArgumentException for a negative index
         */
        public Expanded {
            if (index < 0) {
                throw new IllegalArgumentException("an arm index is ≥ 0: " + index);
            }
            values = List.copyOf(values);
        }
    }

    /**
     * @param arm the template arm's name
     * @param keys at least one key
     * @param values one non-empty list of values per key
     * @param arms at least one arm, each with one value per key
     * @throws IllegalArgumentException when the sizes do not agree
     */
    public GridExpansion {
        Objects.requireNonNull(arm, "arm");
        keys = List.copyOf(keys);
        values = values.stream().map(List::copyOf).toList();
        arms = List.copyOf(arms);
        if (keys.isEmpty() || values.size() != keys.size() || arms.isEmpty()) {
            throw new IllegalArgumentException("a grid sweeps at least one key with its values and expands into at "
                    + "least one arm: " + keys.size() + " keys, " + values.size() + " value lists, " + arms.size()
                    + " arms");
        }
        for (Expanded e : arms) {
            if (e.values().size() != keys.size()) {
                throw new IllegalArgumentException("arm " + e.index() + " has " + e.values().size() + " grid values for "
                        + keys.size() + " keys");
            }
        }
    }
}
