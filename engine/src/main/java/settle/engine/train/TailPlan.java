package settle.engine.train;

/**
 * Where the tail of a run starts and at which updates its snapshots fall (DESIGN.md "Wander metrics"): the tail
 * is the last L = ⌈τT⌉ updates, K ← min(K, L), and snapshot j (1 ≤ j ≤ K) is taken after update
 * T − L + ⌈jL/K⌉, so the last is at T and the snapshots are as evenly spaced as whole updates allow.
 *
 * @param totalUpdates T
 * @param length L, 1 ≤ L ≤ T
 * @param snapshots K after the reduction, 1 ≤ K ≤ L
 */
public record TailPlan(long totalUpdates, long length, int snapshots) {

    /** Validates 1 ≤ K ≤ L ≤ T. */
    public TailPlan {
        if (totalUpdates < 1 || length < 1 || length > totalUpdates || snapshots < 1 || snapshots > length) {
            throw new IllegalArgumentException("tail plan needs 1 ≤ snapshots ≤ length ≤ total updates: " + snapshots
                    + ", " + length + ", " + totalUpdates);
        }
    }

    /** @return the plan for T updates, tail fraction τ and K requested snapshots */
    public static TailPlan of(long totalUpdates, double tail, int requestedSnapshots) {
        long length = TrainingSettings.tailLength(tail, totalUpdates);
        return new TailPlan(totalUpdates, length, (int) Math.min(requestedSnapshots, length));
    }

    /** @return the first update of the tail, T − L + 1 */
    public long firstUpdate() {
        return totalUpdates - length + 1;
    }

    /** @return the update after which snapshot {@code j} (1-based) is taken: T − L + ⌈jL/K⌉ */
    public long snapshotUpdate(int j) {
        if (j < 1 || j > snapshots) {
            throw new IllegalArgumentException("snapshot " + j + " outside 1.." + snapshots);
        }
        return totalUpdates - length + ((long) j * length + snapshots - 1) / snapshots;
    }

    /** @return every snapshot's update, in order */
    public long[] snapshotUpdates() {
        long[] updates = new long[snapshots];
        for (int j = 1; j <= snapshots; j++) {
            updates[j - 1] = snapshotUpdate(j);
        }
        return updates;
    }
}
