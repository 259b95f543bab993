package settle.engine.train;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;

import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;

/** The tail metric definitions of DESIGN.md "Wander metrics" on a hand-made sequence of iterates. */
class TailRecorderTest {

    /** Hand-computed values below are exact in a few roundings. */
    private static final double TOLERANCE = 1e-14;

    /**
     * T = 4, τ = 1 (L = 4), K = 2: snapshot j after update 0 + ⌈4j/2⌉, i.e. after updates 2 and 4.
     * Iterates (1,0), (3,0), (0,1), (1,4): θ̄ = (5/4, 5/4). Snapshots (3,0) and (1,4), mean (2,2), deviations
     * (1,−2) and (−1,2), each of squared norm 5: radius = √5. With θ* = (0,0) the squared distances are 9 and
     * 17: tail distance = √13 = sqrt(5 + ‖(2,2)‖²) = sqrt(radius² + ‖θ̄_K − θ*‖²). Objectives 0.5 and 0.3: mean
     * 0.4, spread sqrt(((0.1)² + (0.1)²)/2) = 0.1.
     */
    @ParameterizedTest(name = "store limit {0}")
    @ValueSource(longs = {0, 4, 1_000})
    void handMadeSequence(long storeLimit) {
        TailPlan plan = TailPlan.of(4, 1.0, 2);
        assertArrayEquals(new long[] {2, 4}, plan.snapshotUpdates());
        TailRecorder recorder = new TailRecorder(plan, 2, new double[] {0, 0}, storeLimit);
        double[][] iterates = {{1, 0}, {3, 0}, {0, 1}, {1, 4}};
        double[] objectives = {Double.NaN, 0.5, Double.NaN, 0.3};
        for (int t = 1; t <= 4; t++) {
            assertEquals(true, recorder.inTail(t));
            recorder.addIterate(iterates[t - 1]);
            if (recorder.snapshotDue(t)) {
                recorder.addSnapshot(iterates[t - 1], objectives[t - 1]);
            }
        }
        assertEquals(2, recorder.snapshotCount());
        assertEquals(4, recorder.tailCount());
        assertArrayEquals(new double[] {1.25, 1.25}, recorder.tailMean(), TOLERANCE);
        assertArrayEquals(new double[] {2, 2}, recorder.snapshotMean(new double[2]), TOLERANCE);
        assertEquals(Math.sqrt(5), recorder.radius(new double[2]), TOLERANCE);
        assertEquals(Math.sqrt(13), recorder.distance(), TOLERANCE);
        assertEquals(0.1, recorder.lossSpread(), TOLERANCE);
        if (storeLimit >= 4) {
            assertArrayEquals(new double[] {3, 0, 1, 4}, recorder.stored());
        } else {
            assertNull(recorder.stored());
        }
    }

    @Test
    void onlineAndStoredRadiusAgreeOnALongSequence() {
        // 1000 iterates far from the origin (offset 1e6) with unit-scale wander: the Welford path must not lose
        // the small spread to cancellation. Stored snapshots give the two-pass value.
        TailPlan plan = TailPlan.of(1000, 1.0, 100);
        TailRecorder stored = new TailRecorder(plan, 3, null, Long.MAX_VALUE);
        TailRecorder online = new TailRecorder(plan, 3, null, 0);
        double[] theta = new double[3];
        for (int t = 1; t <= 1000; t++) {
            for (int i = 0; i < 3; i++) {
                theta[i] = 1e6 + Math.sin(0.37 * t + i);
            }
            stored.addIterate(theta);
            online.addIterate(theta);
            if (stored.snapshotDue(t)) {
                stored.addSnapshot(theta, 0);
                online.addSnapshot(theta, 0);
            }
        }
        assertNotNull(stored.stored());
        assertNull(online.stored());
        assertEquals(100, online.snapshotCount());
        double radius = stored.radius(new double[3]);
        // sin has mean square ½ over many phases: radius ≈ sqrt(3/2)
        assertEquals(Math.sqrt(1.5), radius, 0.05);
        assertEquals(radius, online.radius(new double[3]), 1e-9 * radius);
        assertEquals(Double.NaN, online.distance());
    }

    /**
     * Snapshot j at update T − L + ⌈jL/K⌉. T = 100, τ = 0.1: L = 10; K = 3: 90 + ⌈10/3⌉ = 94, 90 + ⌈20/3⌉ = 97,
     * 90 + ⌈30/3⌉ = 100. K = 50 is reduced to L = 10: updates 91..100. τ = 0.7, T = 10: 0.7·10 =
     * 7.000000000000001 in floating point, L = 7, not 8. τ = 0.05, T = 30: ⌈1.5⌉ = 2.
     */
    @Test
    void snapshotIndexFormula() {
        TailPlan three = TailPlan.of(100, 0.1, 3);
        assertEquals(10, three.length());
        assertEquals(91, three.firstUpdate());
        assertArrayEquals(new long[] {94, 97, 100}, three.snapshotUpdates());
        TailPlan reduced = TailPlan.of(100, 0.1, 50);
        assertEquals(10, reduced.snapshots());
        assertArrayEquals(new long[] {91, 92, 93, 94, 95, 96, 97, 98, 99, 100}, reduced.snapshotUpdates());
        assertEquals(7, TailPlan.of(10, 0.7, 1).length());
        assertEquals(2, TailPlan.of(30, 0.05, 5).length());
        assertArrayEquals(new long[] {29, 30}, TailPlan.of(30, 0.05, 5).snapshotUpdates());
        assertEquals(1, TailPlan.of(5, 1e-9, 5).length());
    }
}
