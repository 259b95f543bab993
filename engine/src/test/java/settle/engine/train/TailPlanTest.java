package settle.engine.train;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import org.junit.jupiter.api.Test;

/** Where the tail lies and where TailPlan's rule puts the snapshots (its class comment states the rule). */
class TailPlanTest {

    /**
     * φ_j = U − 1 − ⌊U·frac((K − j)·g)⌋, g = 0.6180339887…: frac(i·g) for i = 0…9 is 0, .618, .236, .854, .472,
     * .090, .708, .326, .944, .562 (by hand). U = 5: ⌊5·frac(i·g)⌋ = 0, 3, 1, 4, 2, 0, 3, 1, 4, 2 for i = 0…9, so
     * with K = 10 (i = 10 − j) φ_1…φ_10 = 4 − (2, 4, 1, 3, 0, 2, 4, 1, 3, 0) = 2, 0, 3, 1, 4, 2, 0, 3, 1, 4: each
     * phase twice, the last the epoch end 4. U = 18, K = 4: ⌊18·frac(i·g)⌋ = ⌊0⌋, ⌊11.12⌋, ⌊4.25⌋, ⌊15.37⌋ = 0, 11,
     * 4, 15 for i = 0…3, so φ_1…φ_4 = 17 − (15, 4, 11, 0) = 2, 13, 6, 17.
     */
    @Test
    void targetPhasesFollowTheGoldenRatioSequenceFromTheEnd() {
        TailPlan five = new TailPlan(10, 10, 10, 5);
        int[] phases = new int[10];
        for (int j = 1; j <= 10; j++) {
            phases[j - 1] = five.targetPhase(j);
        }
        assertArrayEquals(new int[] {2, 0, 3, 1, 4, 2, 0, 3, 1, 4}, phases);
        TailPlan eighteen = new TailPlan(180, 9, 4, 18);
        assertArrayEquals(new int[] {2, 13, 6, 17}, new int[] {eighteen.targetPhase(1), eighteen.targetPhase(2),
            eighteen.targetPhase(3), eighteen.targetPhase(4)});
        // the fixed-point phase agrees with the floating-point formula where that is far from a cell boundary
        TailPlan big = new TailPlan(997_000, 997_000, 1_000, 997);
        double g = (Math.sqrt(5) - 1) / 2;
        int compared = 0;
        for (int j = 1; j <= 1_000; j++) {
            double cell = 997 * ((1_000 - j) * g % 1.0);
            if (Math.abs(cell - Math.rint(cell)) > 1e-6) {
                assertEquals(996 - (int) Math.floor(cell), big.targetPhase(j), "j = " + j);
                compared++;
            }
        }
        assertTrue(compared > 990, compared + " compared");
    }

    /**
     * T = 24 (6 epochs of U = 4), τ = 0.5: L = 12, the tail is updates 13…24; K = 3 slots of 4: 13–16, 17–20,
     * 21–24, each covering the phases 0, 1, 2, 3 (update t has phase (t − 1) mod 4). Targets, from the last:
     * φ_3 = 3 − 0 = 3, φ_2 = 3 − ⌊4·0.618⌋ = 1, φ_1 = 3 − ⌊4·0.236⌋ = 3. Slot 3: every phase unused, 3 is the
     * target: update 24 = T. Slot 2: phases 0, 1, 2 unused, 1 is the target: update 18. Slot 1: phases 0 and 2
     * unused, both at circular distance 1 from 3: the later, phase 2 = update 15. The old even spacing,
     * T − L + ⌈jL/K⌉, gave 16, 20, 24: three epoch ends.
     */
    @Test
    void handComputedPlacement() {
        TailPlan plan = TailPlan.of(24, 0.5, 3, 4);
        assertEquals(12, plan.length());
        assertEquals(13, plan.firstUpdate());
        assertArrayEquals(new long[] {15, 18, 24}, plan.snapshotUpdates());
        assertEquals(3, plan.epochEnds()); // 16, 20, 24
    }

    /**
     * L &lt; U: T = 180 (10 epochs of U = 18), τ = 0.05: L = 9, updates 172…180 at phases 9…17 (one epoch end,
     * 180). K = 4: slots end at 171 + ⌈9j/4⌉ = 174, 176, 178, 180, so they are 172–174 (phases 9–11), 175–176
     * (12–13), 177–178 (14–15), 179–180 (16–17); no phase repeats, so only the targets 2, 13, 6, 17 decide.
     * Slot 4: 17 is the target: update 180. Slot 3: 14 is at 8 from 6, 15 at 9: update 177. Slot 2: 13 is the
     * target: update 176. Slot 1: 9, 10, 11 are at 7, 8, 9 from 2: update 172.
     */
    @Test
    void tailShorterThanAnEpoch() {
        TailPlan plan = TailPlan.of(180, 0.05, 4, 18);
        assertEquals(9, plan.length());
        assertArrayEquals(new long[] {172, 176, 177, 180}, plan.snapshotUpdates());
        assertEquals(1, plan.epochEnds());
    }

    /**
     * U = 18, 1 000 epochs, τ = 0.1, K = 50: L = 1 800 and the old spacing L/K = 36 = 2U put all 50 snapshots on
     * epoch ends. Slots of 36 ≥ U reach every phase, so each snapshot takes a least-used phase: counted from the
     * last, the counts differ by at most 1 at every step, and 50 = 2·18 + 14 leaves 14 phases with 3 snapshots and
     * 4 with 2.
     */
    @Test
    void snapshotsThatEvenSpacingPutOnEpochEndsSpreadOverTheEpoch() {
        TailPlan plan = TailPlan.of(18_000, 0.1, 50, 18);
        assertEquals(1_800, plan.length());
        int[] counts = assertPlacement(plan);
        assertCounts(counts, 4, 2, 14, 3);
        assertTrue(counts[17] <= 3, "epoch ends: " + counts[17]);
    }

    /**
     * K ≥ U with spacing U: 2 000 epochs of U = 15, τ = 0.1: L = 3 000, K = 200, old spacing 15. Slots of exactly
     * U reach every phase: 200 = 13·15 + 5, so 10 phases hold 13 snapshots and 5 hold 14.
     */
    @Test
    void snapshotsSpacedOneEpochApartSpreadOverTheEpoch() {
        TailPlan plan = TailPlan.of(30_000, 0.1, 200, 15);
        int[] counts = assertPlacement(plan);
        assertCounts(counts, 10, 13, 5, 14);
    }

    /**
     * K &lt; U: U = 18, L = 1 800, K = 10: slots of 180 reach every phase, so the 10 snapshots take 10 distinct
     * phases (a least-used phase is an unused one while fewer than 18 are taken).
     */
    @Test
    void fewerSnapshotsThanPhasesTakeDistinctPhases() {
        TailPlan plan = TailPlan.of(18_000, 0.1, 10, 18);
        int[] counts = assertPlacement(plan);
        assertCounts(counts, 8, 0, 10, 1);
    }

    /**
     * Slots shorter than an epoch: 2 000 epochs of U = 15, L = 3 000, K = 1 000: slots of 3 updates. T − L is a
     * multiple of 15, so slot j covers phases 3((j−1) mod 5) … +2: five disjoint arcs, each visited by 200 slots.
     * Within an arc every phase is reachable and each visit takes a least-used one, so each arc's three counts
     * differ by at most 1 and sum to 200: 67, 67 and 66, so 10 phases hold 67 snapshots and 5 hold 66.
     */
    @Test
    void slotsShorterThanAnEpochBalanceTheirReachablePhases() {
        TailPlan plan = TailPlan.of(30_000, 0.1, 1_000, 15);
        int[] counts = new int[15];
        long[] updates = plan.snapshotUpdates();
        assertSlots(plan, updates);
        for (long t : updates) {
            counts[plan.phase(t)]++;
        }
        assertCounts(counts, 5, 66, 10, 67);
    }

    /** K = L takes every tail update; U = 1 (every update an epoch end) takes the slot ends, as even spacing did. */
    @Test
    void everyTailUpdateAndOneUpdatePerEpoch() {
        TailPlan all = TailPlan.of(60, 0.2, 50, 6);
        assertEquals(12, all.snapshots(), "K is reduced to L = 12");
        assertArrayEquals(new long[] {49, 50, 51, 52, 53, 54, 55, 56, 57, 58, 59, 60}, all.snapshotUpdates());
        // U = 1, T = 10, τ = 1, K = 3: slots 1–4, 5–7, 8–10 (ends ⌈10j/3⌉ = 4, 7, 10); every update is phase 0, so
        // the count and the distance tie everywhere and the later update wins
        TailPlan single = TailPlan.of(10, 1.0, 3, 1);
        assertArrayEquals(new long[] {4, 7, 10}, single.snapshotUpdates());
        assertArrayEquals(new long[] {18_000}, TailPlan.of(18_000, 0.1, 1, 18).snapshotUpdates(), "K = 1: T");
        assertEquals(10, single.epochEnds());
    }

    /** Strictly increasing, one per slot, inside the tail, and even phases whenever every slot reaches them all. */
    @Test
    void placementPropertiesOverManyShapes() {
        int checked = 0;
        for (int u : new int[] {1, 2, 3, 7, 15, 18, 32}) {
            for (int epochs : new int[] {1, 3, 40}) {
                for (double tau : new double[] {0.01, 0.1, 0.37, 1.0}) {
                    for (int k : new int[] {1, 2, 5, 17, 50, 200, Integer.MAX_VALUE}) {
                        TailPlan plan = TailPlan.of((long) epochs * u, tau, k, u);
                        long[] updates = plan.snapshotUpdates();
                        assertSlots(plan, updates);
                        if (plan.length() / plan.snapshots() >= u) {
                            assertPlacement(plan);
                        }
                        checked++;
                    }
                }
            }
        }
        assertEquals(7 * 3 * 4 * 7, checked);
    }

    /**
     * L = ⌈τT⌉. T = 100, τ = 0.1: L = 10; K = 50 is reduced to 10. τ = 0.7, T = 10: 0.7·10 = 7.000000000000001 in
     * floating point, L = 7, not 8. τ = 0.05, T = 30: ⌈1.5⌉ = 2. Epoch ends in the tail: T/U − ⌊(T − L)/U⌋, e.g.
     * T = 30, U = 6, L = 8 (updates 23…30): 5 − ⌊22/6⌋ = 2 (24 and 30).
     */
    @Test
    void tailLengthAndEpochEnds() {
        TailPlan reduced = TailPlan.of(100, 0.1, 50, 10);
        assertEquals(10, reduced.length());
        assertEquals(91, reduced.firstUpdate());
        assertEquals(10, reduced.snapshots());
        assertEquals(7, TailPlan.of(10, 0.7, 1, 1).length());
        assertEquals(2, TailPlan.of(30, 0.05, 5, 3).length());
        assertEquals(1, TailPlan.of(5, 1e-9, 5, 5).length());
        TailPlan eight = new TailPlan(30, 8, 2, 6);
        assertEquals(2, eight.epochEnds());
        assertTrue(eight.epochEnd(24) && eight.epochEnd(30) && !eight.epochEnd(29));
        assertEquals(5, eight.phase(30));
        assertEquals(0, eight.phase(25));
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, () -> new TailPlan(30, 8, 2, 7));
        assertTrue(e.getMessage().contains("updates per epoch"), e.getMessage());
        assertThrows(IllegalArgumentException.class, () -> new TailPlan(30, 8, 9, 6));
    }

    /** Asserts one snapshot per slot, strictly increasing, inside the tail. */
    private static void assertSlots(TailPlan plan, long[] updates) {
        int k = plan.snapshots();
        assertEquals(k, updates.length);
        long before = plan.totalUpdates() - plan.length();
        for (int j = 1; j <= k; j++) {
            long first = before + ((j - 1L) * plan.length() + k - 1) / k + 1;
            long last = before + ((long) j * plan.length() + k - 1) / k;
            long t = updates[j - 1];
            assertTrue(t >= first && t <= last, "snapshot " + j + " at " + t + ", slot " + first + "–" + last + " of "
                    + plan);
            assertTrue(j == 1 || t > updates[j - 2], "strictly increasing");
        }
        assertTrue(updates[0] >= plan.firstUpdate());
        assertEquals(plan.totalUpdates(), updates[k - 1], "the last snapshot is T");
    }

    /**
     * Asserts the slots and that, counting the snapshots from the last, the counts per phase differ by at most 1 at
     * every step (the guarantee when every slot reaches every phase).
     *
     * @return the counts per phase
     */
    private static int[] assertPlacement(TailPlan plan) {
        long[] updates = plan.snapshotUpdates();
        assertSlots(plan, updates);
        int u = plan.updatesPerEpoch();
        int[] counts = new int[u];
        for (int j = updates.length - 1; j >= 0; j--) {
            counts[plan.phase(updates[j])]++;
            int min = Integer.MAX_VALUE;
            int max = 0;
            for (int c : counts) {
                min = Math.min(min, c);
                max = Math.max(max, c);
            }
            assertTrue(max - min <= 1, "snapshots " + (j + 1) + "…" + updates.length + " of " + plan + ": counts from "
                    + min + " to " + max);
        }
        return counts;
    }

    /** Asserts that {@code lowPhases} phases hold {@code low} snapshots and {@code highPhases} hold {@code high}. */
    private static void assertCounts(int[] counts, int lowPhases, int low, int highPhases, int high) {
        int lows = 0;
        int highs = 0;
        for (int c : counts) {
            lows += c == low ? 1 : 0;
            highs += c == high ? 1 : 0;
        }
        assertEquals(lowPhases, lows, "phases with " + low + " snapshots");
        assertEquals(highPhases, highs, "phases with " + high + " snapshots");
        assertEquals(counts.length, lows + highs);
    }
}
