package settle.reports.format;

import java.util.List;

/**
 * One {@code grid} entry of the study's plan as the manifest records it: the template arm it expanded, the schedule
 * keys it swept with their values as written in the plan, and the arms it produced with their values. The report
 * learns a study's grid structure from here only, never from arm names.
 *
 * @param arm the template arm's name
 * @param keys the swept keys, in the order the plan lists them (at least one)
 * @param values per key (same order as {@code keys}), its values as written in the plan
 * @param members the arms the entry produced (at least one), in arm order
 */
public record Grid(String arm, List<String> keys, List<List<String>> values, List<Member> members) {

    /**
     * One arm a grid entry produced.
     *
     * @param arm the arm (0-based index into the manifest's arms; the manifest writes it from 1)
     * @param values its value of each swept key, as written in the plan, in the order of {@link Grid#keys()}
     */
    public record Member(int arm, List<String> values) {

        /** @param values copied */
        public Member {
            if (arm < 0) {
                throw new IllegalArgumentException("an arm index is ≥ 0: " + arm);
            }
            values = List.copyOf(values);
        }
    }

    /**
     * @param arm the template arm's name
     * @param keys copied
     * @param values copied
     * @param members copied
     */
    public Grid {
        keys = List.copyOf(keys);
        values = values.stream().map(List::copyOf).toList();
        members = List.copyOf(members);
        if (keys.isEmpty() || values.size() != keys.size() || members.isEmpty()) {
            throw new IllegalArgumentException("a grid sweeps at least one key with its values and expands into at "
                    + "least one arm: " + keys.size() + " keys, " + values.size() + " value lists, " + members.size()
                    + " arms");
        }
        for (Member m : members) {
            if (m.values().size() != keys.size()) {
                throw new IllegalArgumentException("arm " + m.arm() + " has " + m.values().size() + " grid values for "
                        + keys.size() + " keys");
            }
        }
    }
}
