package settle.engine.train;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.function.Consumer;
import org.junit.jupiter.api.Test;
import org.junit.jupiter.params.ParameterizedTest;
import org.junit.jupiter.params.provider.ValueSource;
import settle.engine.model.SteadyAllocation;

/** The tail metric definitions of DESIGN.md "Wander metrics" on hand-made sequences of iterates. */
class TailRecorderTest {

    /** Hand-computed values below are exact in a few roundings. */
    private static final double TOLERANCE = 1e-14;

    /** A two-parameter "gauge": the direction (1, 1) is projected out, x ↦ x − ((x₀ + x₁)/2)·(1, 1). */
    private static final Consumer<double[]> CENTRE = x -> {
        double mean = (x[0] + x[1]) / 2;
        x[0] -= mean;
        x[1] -= mean;
    };

    private static final double[][] ITERATES = {{1, 0}, {3, 0}, {0, 1}, {1, 4}};

    /**
     * T = 4 in epochs of U = 2, τ = 1 (L = 4), K = 2: slots 1–2 and 3–4, chosen from the last: slot 2 takes T = 4
     * (phase 1, its target), slot 1 the unused phase 0, update 1 (its target is 1 − ⌊2·0.618⌋ = 0 as well).
     * Iterates (1,0), (3,0), (0,1), (1,4), θ* = (0,0), no gauge. Every iterate: θ̄ = (5/4, 5/4); squared
     * deviations 26/16, 74/16, 26/16, 122/16, sum 15.5: radius = sqrt(15.5/4); squared distances 1, 9, 1, 17:
     * distance = √7 (= sqrt(3.875 + ‖θ̄‖²) = sqrt(3.875 + 3.125)). Epoch ends (updates 2 and 4): (3,0), (1,4), mean (2,2), deviations (1,−2), (−1,2): radius √5;
     * squared distances 9, 17: distance √13. Objectives 0.5 and 0.3: mean 0.4, spread sqrt((0.1² + 0.1²)/2) = 0.1.
     */
    @ParameterizedTest(name = "store limit {0}")
    @ValueSource(longs = {0, 4, 1_000})
    void handMadeSequence(long storeLimit) {
        TailPlan plan = TailPlan.of(4, 1.0, 2, 2);
        assertArrayEquals(new long[] {1, 4}, plan.snapshotUpdates());
        TailRecorder recorder = feed(new TailRecorder(plan, 2, new double[] {0, 0}, null, storeLimit),
                new double[] {0.5, Double.NaN, Double.NaN, 0.3});
        assertEquals(2, recorder.snapshotCount());
        assertEquals(4, recorder.tailCount());
        assertEquals(2, recorder.epochEndCount());
        assertArrayEquals(new double[] {1.25, 1.25}, recorder.tailMean(), TOLERANCE);
        assertEquals(Math.sqrt(15.5 / 4), recorder.radius(), TOLERANCE);
        assertEquals(Math.sqrt(7), recorder.distance(), TOLERANCE);
        assertEquals(Math.sqrt(5), recorder.epochEndRadius(), TOLERANCE);
        assertEquals(Math.sqrt(13), recorder.epochEndDistance(), TOLERANCE);
        assertEquals(0.1, recorder.lossSpread(), TOLERANCE);
        if (storeLimit >= 4) {
            assertArrayEquals(new double[] {1, 0, 1, 4}, recorder.stored());
        } else {
            assertNull(recorder.stored());
        }
    }

    /**
     * The same iterates with the (1,1) direction as a gauge: the gauge-free iterates are a·(1,−1) with
     * a = ½, 3/2, −½, −3/2 (‖a·(1,−1)‖² = 2a²), mean 0. Every iterate: radius² = distance² = 2(¼ + 9/4 + ¼ + 9/4)/4
     * = 2.5. Epoch ends (a = 3/2, −3/2): radius² = distance² = 2·(9/4 + 9/4)/2 = 4.5. θ̄ stays the raw mean
     * (5/4, 5/4); the stored snapshots are gauge-free: updates 1 and 4, (½, −½) and (−3/2, 3/2).
     */
    @Test
    void handMadeSequenceWithAGauge() {
        TailPlan plan = TailPlan.of(4, 1.0, 2, 2);
        TailRecorder recorder = feed(new TailRecorder(plan, 2, new double[] {0, 0}, CENTRE, 1_000),
                new double[] {0.5, Double.NaN, Double.NaN, 0.3});
        assertArrayEquals(new double[] {1.25, 1.25}, recorder.tailMean(), TOLERANCE);
        assertEquals(Math.sqrt(2.5), recorder.radius(), TOLERANCE);
        assertEquals(Math.sqrt(2.5), recorder.distance(), TOLERANCE);
        assertEquals(Math.sqrt(4.5), recorder.epochEndRadius(), TOLERANCE);
        assertEquals(Math.sqrt(4.5), recorder.epochEndDistance(), TOLERANCE);
        assertArrayEquals(new double[] {0.5, -0.5, -1.5, 1.5}, recorder.stored(), TOLERANCE);
    }

    /**
     * A tail with one epoch end: T = 6 in epochs of U = 3, τ = 0.5: L = 3, updates 4–6, the one epoch end is 6.
     * Its radius is 0 and its distance is ‖θ_6 − θ*‖ = ‖(1,4) − (1,0)‖ = 4; without θ* the distances are NaN.
     */
    @Test
    void oneEpochEndHasRadiusZero() {
        TailPlan plan = TailPlan.of(6, 0.5, 2, 3);
        assertEquals(1, plan.epochEnds());
        TailRecorder withReference = new TailRecorder(plan, 2, new double[] {1, 0}, null, 0);
        TailRecorder without = new TailRecorder(plan, 2, null, null, 0);
        for (int t = 4; t <= 6; t++) {
            withReference.addIterate(t, ITERATES[t - 3]);
            without.addIterate(t, ITERATES[t - 3]);
        }
        assertEquals(1, withReference.epochEndCount());
        assertEquals(0.0, withReference.epochEndRadius());
        assertEquals(4.0, withReference.epochEndDistance(), TOLERANCE);
        assertEquals(without.radius(), withReference.radius());
        assertTrue(Double.isNaN(without.distance()));
        assertTrue(Double.isNaN(without.epochEndDistance()));
    }

    /**
     * 1 000 iterates far from the origin (offset 1e6) with unit-scale wander sin(0.37t + i): the online sums must
     * not lose the small spread to cancellation. The reference is the two-pass value computed here (the mean
     * first, then the squared deviations), against which the online radius agrees to 1e-9 relative; the epoch
     * ends (U = 7) likewise. sin has mean square ½ over many phases: radius ≈ sqrt(3/2).
     */
    @Test
    void onlineSumsKeepASmallSpreadFarFromTheOrigin() {
        int p = 3;
        int total = 1_001; // 143 epochs of 7
        TailPlan plan = TailPlan.of(total, 1.0, 100, 7);
        double[] star = {1e6, 1e6 + 0.25, 1e6 - 0.5};
        TailRecorder recorder = new TailRecorder(plan, p, star, null, 0);
        double[][] all = new double[total][p];
        for (int t = 1; t <= total; t++) {
            for (int i = 0; i < p; i++) {
                all[t - 1][i] = 1e6 + Math.sin(0.37 * t + i);
            }
            recorder.addIterate(t, all[t - 1]);
        }
        double[] twoPass = twoPass(all, 1, star);
        assertEquals(Math.sqrt(1.5), twoPass[0], 0.05);
        assertEquals(twoPass[0], recorder.radius(), 1e-9 * twoPass[0]);
        assertEquals(twoPass[1], recorder.distance(), 1e-9 * twoPass[1]);
        double[] ends = twoPass(all, 7, star);
        assertEquals(143, recorder.epochEndCount());
        assertEquals(ends[0], recorder.epochEndRadius(), 1e-9 * ends[0]);
        assertEquals(ends[1], recorder.epochEndDistance(), 1e-9 * ends[1]);
    }

    /** A gauge that leaves every vector unchanged gives the same bits as the no-gauge path (no copy). */
    @Test
    void identityGaugeMatchesTheNoGaugePathBitForBit() {
        TailPlan plan = TailPlan.of(60, 0.5, 7, 6);
        double[] star = {0.1, -0.2, 0.3};
        TailRecorder plain = new TailRecorder(plan, 3, star, null, 1_000);
        TailRecorder identity = new TailRecorder(plan, 3, star, x -> { }, 1_000);
        double[] theta = new double[3];
        for (long t = plan.firstUpdate(); t <= 60; t++) {
            for (int i = 0; i < 3; i++) {
                theta[i] = Math.cos(1.3 * t * (i + 1)) / (1 + i);
            }
            plain.addIterate(t, theta);
            identity.addIterate(t, theta);
            if (plain.snapshotDue(t)) {
                plain.addSnapshot(theta, t);
                identity.addSnapshot(theta, t);
            }
        }
        assertArrayEquals(plain.tailMean(), identity.tailMean());
        assertEquals(plain.radius(), identity.radius());
        assertEquals(plain.distance(), identity.distance());
        assertEquals(plain.epochEndRadius(), identity.epochEndRadius());
        assertEquals(plain.epochEndDistance(), identity.epochEndDistance());
        assertArrayEquals(plain.stored(), identity.stored());
    }

    /** The tail statistics depend on the iterates alone: K = 1, 10 and 37 give the same bits. */
    @Test
    void tailStatisticsDoNotDependOnTheSnapshotCount() {
        double[] first = null;
        for (int k : new int[] {1, 10, 37}) {
            TailPlan plan = TailPlan.of(300, 0.4, k, 12);
            TailRecorder recorder = new TailRecorder(plan, 2, new double[] {0.5, 0.5}, CENTRE, 1_000);
            double[] theta = new double[2];
            for (long t = plan.firstUpdate(); t <= 300; t++) {
                theta[0] = Math.sin(0.1 * t);
                theta[1] = Math.cos(0.7 * t) + 3;
                recorder.addIterate(t, theta);
                if (recorder.snapshotDue(t)) {
                    recorder.addSnapshot(theta, 0);
                }
            }
            assertEquals(k, recorder.snapshotCount());
            double[] values = {recorder.radius(), recorder.distance(), recorder.epochEndRadius(),
                recorder.epochEndDistance(), recorder.tailMean()[0], recorder.tailMean()[1]};
            if (first == null) {
                first = values;
            } else {
                assertArrayEquals(first, values, "K = " + k);
            }
        }
    }

    @Test
    void iteratesAndSnapshotsMustComeInOrder() {
        TailPlan plan = TailPlan.of(4, 1.0, 2, 2);
        TailRecorder recorder = new TailRecorder(plan, 2, null, null, 0);
        assertFalse(recorder.inTail(0));
        assertThrows(IllegalStateException.class, () -> recorder.addIterate(2, ITERATES[1]));
        recorder.addIterate(1, ITERATES[0]);
        recorder.addSnapshot(ITERATES[0], 1);
        recorder.addIterate(2, ITERATES[1]);
        assertThrows(IllegalStateException.class, () -> recorder.addSnapshot(ITERATES[1], 1), "none due at 2");
        assertThrows(IllegalStateException.class, () -> recorder.addIterate(2, ITERATES[1]), "2 again");
    }

    /** Once compiled, adding a tail iterate allocates nothing, with and without a gauge (DEVELOPERS.md: hot loops). */
    @Test
    void addingAnIterateAllocatesNothing() {
        for (Consumer<double[]> gauge : java.util.Arrays.asList(null, CENTRE)) {
            TailPlan plan = TailPlan.of(1_000_000, 1.0, 2, 10);
            TailRecorder recorder = new TailRecorder(plan, 2, new double[] {0, 0}, gauge, 0);
            double[] theta = {1, 2};
            long[] t = {0};
            long bytes = SteadyAllocation.bytes(() -> {
                t[0]++;
                theta[0] = 1.0 / t[0];
                recorder.addIterate(t[0], theta);
            }, 1_000);
            assertTrue(bytes < SteadyAllocation.NOISE, (gauge == null ? "no gauge: " : "gauge: ") + bytes + " bytes");
        }
    }

    /** Feeds {@link #ITERATES} as updates 1…4, taking each due snapshot with the given objective. */
    private static TailRecorder feed(TailRecorder recorder, double[] objectives) {
        for (int t = 1; t <= 4; t++) {
            assertTrue(recorder.inTail(t));
            recorder.addIterate(t, ITERATES[t - 1]);
            if (recorder.snapshotDue(t)) {
                recorder.addSnapshot(ITERATES[t - 1], objectives[t - 1]);
            }
        }
        return recorder;
    }

    /**
     * @param every take rows every−1, 2·every−1, … (every = U: the epoch ends)
     * @return {sqrt(mean ‖x − x̄‖²), sqrt(mean ‖x − θ*‖²)} over the taken rows, two passes
     */
    private static double[] twoPass(double[][] rows, int every, double[] star) {
        int p = star.length;
        double[] mean = new double[p];
        int n = 0;
        for (int r = every - 1; r < rows.length; r += every) {
            n++;
            for (int i = 0; i < p; i++) {
                mean[i] += rows[r][i];
            }
        }
        for (int i = 0; i < p; i++) {
            mean[i] /= n;
        }
        double deviations = 0;
        double distances = 0;
        for (int r = every - 1; r < rows.length; r += every) {
            for (int i = 0; i < p; i++) {
                deviations += (rows[r][i] - mean[i]) * (rows[r][i] - mean[i]);
                distances += (rows[r][i] - star[i]) * (rows[r][i] - star[i]);
            }
        }
        return new double[] {Math.sqrt(deviations / n), Math.sqrt(distances / n)};
    }
}
