package settle.engine.train;

/**
 * Where the tail of a run starts and at which updates its snapshots fall (DESIGN.md "Wander metrics"). The tail is
 * the last L = ⌈τT⌉ updates of a run of T = E·U updates (E epochs of U updates), and K ← min(K, L).
 *
 * <p>The position of update t (1-based) within its epoch, its <em>phase</em>, is q(t) = (t − 1) mod U; the epoch
 * ends are the updates with q(t) = U − 1. Under shuffle sampling a run pulses within an epoch, so snapshots that
 * all share one phase (as evenly spaced ones do when their spacing is a multiple of U) see a biased part of the
 * pulse. The snapshots are therefore placed by this rule:
 * <ol>
 *   <li><b>Slots.</b> The tail is cut into K consecutive slots: slot j (1 ≤ j ≤ K) holds the updates
 *       T − L + ⌈(j−1)L/K⌉ + 1 … T − L + ⌈jL/K⌉, ⌊L/K⌋ or ⌈L/K⌉ of them; slot K ends at T. Snapshot j is one
 *       update of slot j, so the snapshots are strictly increasing, inside the tail, and spread evenly in
 *       time.</li>
 *   <li><b>Order.</b> The snapshots are chosen from the last to the first: j = K, K − 1, …, 1.</li>
 *   <li><b>Target phase.</b> φ_j = U − 1 − ⌊U·frac((K − j)·g)⌋ with g = (√5 − 1)/2: a low-discrepancy
 *       (golden-ratio Kronecker) sequence counted from the last snapshot, whose target is the epoch end U − 1.
 *       It is computed exactly in 64-bit fixed point: ⌊U·frac(i·g)⌋ = ⌊U·w_i / 2⁶⁴⌋ with w_i = i·G mod 2⁶⁴ and
 *       G = ⌊2⁶⁴·g⌋ = 0x9E3779B97F4A7C15.</li>
 *   <li><b>Choice.</b> With c_q the number of the snapshots j + 1 … K at phase q, snapshot j is the update t of
 *       slot j that minimises, in this order: c_{q(t)} (a least-used phase); the circular distance
 *       min(|q(t) − φ_j|, U − |q(t) − φ_j|) to the target; −t (the later update).</li>
 * </ol>
 * Consequences: the last snapshot is always T (every phase is unused, T is an epoch end in slot K, and the target
 * is U − 1), so F there is the last epoch's and the final iterate is part of the snapshots; K = 1 takes T alone.
 * When ⌊L/K⌋ ≥ U every slot reaches every phase, each snapshot goes to a least-used phase, and for any number of
 * snapshots counted from the last the counts per phase differ by at most 1 (K ≥ U: every phase is used; K &lt; U:
 * K distinct phases). When slots are shorter than an epoch the counts are balanced among the phases each slot can
 * reach; that cannot always be even (a slot of one update leaves no choice; K = L takes every tail update). The
 * target phase only breaks ties among least-used phases, so that the phases are visited in a well-mixed order
 * rather than U − 1, U − 2, …; with U = 1 every update is an epoch end and the snapshots are the slot ends
 * T − L + ⌈jL/K⌉.
 *
 * @param totalUpdates T, a multiple of U
 * @param length L, 1 ≤ L ≤ T
 * @param snapshots K after the reduction, 1 ≤ K ≤ L
 * @param updatesPerEpoch U ≥ 1
 */
public record TailPlan(long totalUpdates, long length, int snapshots, int updatesPerEpoch) {

    /** G = ⌊2⁶⁴·(√5 − 1)/2⌋ read as an unsigned 64-bit integer: the golden-ratio step of the target phases. */
    static final long GOLDEN = 0x9E3779B97F4A7C15L;

    /** Validates 1 ≤ K ≤ L ≤ T, U ≥ 1 and that U divides T. */
    public TailPlan {
        if (totalUpdates < 1 || length < 1 || length > totalUpdates || snapshots < 1 || snapshots > length) {
            throw new IllegalArgumentException("tail plan needs 1 ≤ snapshots ≤ length ≤ total updates: " + snapshots
                    + ", " + length + ", " + totalUpdates);
        }
        if (updatesPerEpoch < 1 || totalUpdates % updatesPerEpoch != 0) {
            throw new IllegalArgumentException("tail plan needs updates per epoch ≥ 1 dividing the total updates: "
                    + updatesPerEpoch + ", " + totalUpdates);
        }
    }

    /** @return the plan for T updates of U per epoch, tail fraction τ and K requested snapshots */
    public static TailPlan of(long totalUpdates, double tail, int requestedSnapshots, int updatesPerEpoch) {
        long length = TrainingSettings.tailLength(tail, totalUpdates);
        return new TailPlan(totalUpdates, length, (int) Math.min(requestedSnapshots, length), updatesPerEpoch);
    }

    /** @return the first update of the tail, T − L + 1 */
    public long firstUpdate() {
        return totalUpdates - length + 1;
    }

    /** @return q(t) = (t − 1) mod U, the position of update {@code t} within its epoch */
    public int phase(long update) {
        return (int) ((update - 1) % updatesPerEpoch);
    }

    /** @return true when update {@code t} ends an epoch: t mod U = 0 */
    public boolean epochEnd(long update) {
        return update % updatesPerEpoch == 0;
    }

    /** @return the number of epoch ends in the tail, T/U − ⌊(T − L)/U⌋ (≥ 1: T is one) */
    public long epochEnds() {
        return totalUpdates / updatesPerEpoch - (totalUpdates - length) / updatesPerEpoch;
    }

    /** @return φ_j = U − 1 − ⌊U·w/2⁶⁴⌋, w = (K − j)·G mod 2⁶⁴: the target phase of snapshot {@code j} (1-based) */
    public int targetPhase(int j) {
        long w = (long) (snapshots - j) * GOLDEN; // mod 2⁶⁴ by overflow; read as unsigned
        // ⌊U·w/2⁶⁴⌋ is the high word of the unsigned product w·U: the signed one, plus U when w's top bit is set
        long cell = Math.multiplyHigh(w, updatesPerEpoch) + (w < 0 ? updatesPerEpoch : 0);
        return (int) (updatesPerEpoch - 1 - cell);
    }

    /**
     * Every snapshot's update, in order, by the rule of the class comment. Computed on each call in
     * O(min(L, K·U)) time with a U-long count array: call it once per run.
     *
     * @return K strictly increasing updates in the tail, snapshot j in slot j, the last at T
     */
    public long[] snapshotUpdates() {
        long[] updates = new long[snapshots];
        int[] used = new int[updatesPerEpoch];
        long before = totalUpdates - length;
        for (int j = snapshots; j >= 1; j--) {
            long slotStart = before + ceilDiv((j - 1L) * length, snapshots) + 1;
            long slotEnd = before + ceilDiv((long) j * length, snapshots);
            // phases repeat every U updates and ties go to the later update: the last U of the slot suffice
            long first = Math.max(slotStart, slotEnd - updatesPerEpoch + 1);
            int target = targetPhase(j);
            long best = slotEnd;
            int bestUsed = Integer.MAX_VALUE;
            int bestDistance = Integer.MAX_VALUE;
            for (long t = slotEnd; t >= first; t--) {
                int q = phase(t);
                int gap = Math.abs(q - target);
                int distance = Math.min(gap, updatesPerEpoch - gap);
                if (used[q] < bestUsed || (used[q] == bestUsed && distance < bestDistance)) {
                    best = t;
                    bestUsed = used[q];
                    bestDistance = distance;
                }
            }
            updates[j - 1] = best;
            used[phase(best)]++;
        }
        return updates;
    }

    /** @return ⌈a/b⌉ for a ≥ 0, b ≥ 1 (j·L stays far below 2⁶³: j ≤ K ≤ 2³¹, L ≤ T ≤ 2³¹) */
    private static long ceilDiv(long a, long b) {
        return (a + b - 1) / b;
    }
}
