package settle.reports.format;

import java.util.List;

/**
 * The a-priori convex last-iterate bound the runner records in {@code reference.json} ({@code last_iterate_bound}):
 * each arm's value for its planned rates, a worst-case bound on E[F(θ_T)] − F(θ*), not a prediction.
 *
 * @param source the theorem it comes from
 * @param rates which rates it was computed for, in words
 * @param d D = ‖θ₀ − θ*‖, or NaN when skipped
 * @param g G, the root-mean-square batch-gradient norm at θ₀, or NaN when skipped
 * @param names the arms' names in arm-index order (empty when skipped)
 * @param values one value per arm in arm-index order (empty when skipped). Not copied: treat as read-only.
 * @param skipped why it was not computed, or "" when it was
 */
public record Bound(String source, String rates, double d, double g, List<String> names, double[] values,
        String skipped) {

    public Bound {
        names = List.copyOf(names);
        if (names.size() != values.length) {
            throw new IllegalArgumentException(names.size() + " names for " + values.length + " values");
        }
    }

    /** @return true when the values were computed */
    public boolean computed() {
        return skipped.isEmpty();
    }
}
