package settle.reports.format;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertNotEquals;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.nio.ByteBuffer;
import java.nio.ByteOrder;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;
import settle.input.BadInputException;
import settle.reports.format.ReplicateBlocks.Block;
import settle.reports.format.ReplicateBlocks.Coding;
import settle.reports.metrics.ClassBalance;
import settle.reports.metrics.Spread;

/**
 * The codings of format 4's binary file (README, "Study directory"): the lossless ones give back every bit, the
 * float32 one stays within its stated bound, and the report's figures from a written file match those from the run's
 * float64 arrays within that bound (recall and disagreement exactly, through the stored predicted classes).
 */
class CompactBlocksTest {

    private static final int P = 6;
    private static final int CLASSES = 4;
    private static final int TEST_ROWS = 40;
    private static final int PER_EPOCH = 5;
    private static final int EPOCHS = 4;

    @Test
    void xorCodingIsLosslessAndAConstantRateTakesHalfAByte() {
        double[] constant = new double[1000];
        Arrays.fill(constant, 0.1);
        double[] cosine = new double[1000];
        for (int t = 0; t < cosine.length; t++) {
            cosine[t] = 0.05 * (1 + Math.cos(Math.PI * t / cosine.length));
        }
        double[] odd = {0.0, -0.0, Double.MIN_VALUE, 1e308, 3.0, 3.0, Double.NaN, 7.5};
        for (double[] v : List.of(constant, cosine, odd)) {
            byte[] file = ReplicateBlocks.write(List.of(new Block("rates", 1, v.length, Coding.FLOAT64_XOR, v)));
            double[] back = ReplicateBlocks.read(file, "r.bin").get("rates").values();
            for (int i = 0; i < v.length; i++) {
                assertEquals(Double.doubleToLongBits(v[i]), Double.doubleToLongBits(back[i]), "value " + i);
            }
        }
        byte[] file = ReplicateBlocks.write(List.of(new Block("rates", 1, 1000, Coding.FLOAT64_XOR, constant)));
        // header 16, one table entry 48, the counts 500 bytes, 0.1's 8 bytes once, the checksum 4
        assertEquals(16 + 48 + 500 + 8 + 4, file.length);
    }

    @Test
    void xorCodingBytesAsTheReadmeSpellsThem() {
        // 1.0 = 0x3FF0000000000000 (XOR 0: 8 bytes kept), 1.0 again (XOR 0: none), 1.5 = 0x3FF8000000000000
        // (XOR with 1.0 is 0x0008000000000000: 7 bytes kept): counts 8 | 0 << 4 = 0x08, then 7 (padded 0x07).
        byte[] file = ReplicateBlocks.write(List.of(new Block("rates", 1, 3, Coding.FLOAT64_XOR,
                new double[] {1.0, 1.0, 1.5})));
        byte[] values = Arrays.copyOfRange(file, 16 + 48, file.length - 4);
        assertArrayEquals(new byte[] {0x08, 0x07, 0, 0, 0, 0, 0, 0, (byte) 0xF0, 0x3F, 0, 0, 0, 0, 0, 0, 0x08},
                values);
        ByteBuffer table = ByteBuffer.wrap(file).order(ByteOrder.LITTLE_ENDIAN);
        assertEquals(2, table.getInt(16 + 40), "coding 2, float64-xor");
        assertEquals(values.length, table.getInt(16 + 44), "the block's length");
    }

    @Test
    void float32StaysWithinItsBoundAndFallsBackBeyondItsRange() {
        java.util.Random random = new java.util.Random(5);
        double[] v = new double[2000];
        for (int i = 0; i < v.length; i++) {
            v[i] = Math.exp(-60 * random.nextDouble()) * (random.nextBoolean() ? 1 : -1);
        }
        v[0] = 1e-45;
        v[1] = 1e-40;
        double[] back = ReplicateBlocks.read(ReplicateBlocks.write(List.of(new Block("snapshots.values", 1, v.length,
                Coding.FLOAT32, v))), "s.bin").get("snapshots.values").values();
        // The bound: binary32 has a 24-bit significand, so rounding to nearest errs by at most the unit roundoff
        // 2⁻²⁴ relative in the normal range, and by half the subnormal spacing 2⁻¹⁴⁹ below it (IEEE 754-2019 §3.4,
        // §4.3.1; Higham, "Accuracy and Stability of Numerical Algorithms", 2nd ed. 2002, Theorem 2.2).
        for (int i = 0; i < v.length; i++) {
            assertTrue(Math.abs(back[i] - v[i]) <= Math.max(0x1p-24 * Math.abs(v[i]), 0x1p-150), "value " + i);
        }
        assertEquals(Coding.FLOAT32, ReplicateBlocks.float32Unless(v));
        assertEquals(Coding.FLOAT64, ReplicateBlocks.float32Unless(new double[] {1, 1e39}));
        assertEquals(Coding.FLOAT32, ReplicateBlocks.float32Unless(new double[] {1, Double.NaN}));
    }

    @Test
    void theReportsFiguresFromTheFileMatchTheRunsWithinTheBound() {
        java.util.Random random = new java.util.Random(11);
        int reps = 5;
        int[] labels = new int[TEST_ROWS];
        for (int i = 0; i < TEST_ROWS; i++) {
            labels[i] = random.nextInt(CLASSES);
        }
        double[][] run = new double[reps][];
        double[][] read = new double[reps][];
        int[][] readClasses = new int[reps][];
        for (int k = 0; k < reps; k++) {
            run[k] = probabilities(random, k);
            Replicate original = replicate(k + 1, run[k], random);
            ReplicateJson.Written w = ReplicateJson.write(original);
            assertArrayEquals(w.binary(), ReplicateJson.write(original).binary(), "the same arrays, the same bytes");
            Replicate back = ReplicateJson.read(w.json(), w.binary(), "1.json", "1.bin", expected(k + 1));
            read[k] = back.testProbabilities();
            readClasses[k] = back.testPredicted();
            assertArrayEquals(Replicate.predictedClasses(run[k], CLASSES), readClasses[k], "the run's argmax, exactly");
            assertArrayEquals(original.rates(), back.rates(), "rates lossless");
            assertArrayEquals(original.start(), back.start(), "θ₀ lossless");
            assertArrayEquals(original.last(), back.last(), "θ_T lossless");
            assertArrayEquals(original.tailMean(), back.tailMean(), "θ̄ lossless");
            for (int i = 0; i < original.snapshots().length; i++) {
                assertTrue(Math.abs(back.snapshots()[i] - original.snapshots()[i])
                        <= 0x1p-24 * Math.abs(original.snapshots()[i]), "snapshot value " + i);
            }
            // a file written again from what was read is the same file (float32 of a float32 is itself)
            assertArrayEquals(w.binary(), ReplicateJson.write(back).binary(), "rewriting what was read");
            assertArrayEquals(ClassBalance.recall(run[k], CLASSES, labels), ClassBalance.recall(readClasses[k],
                    CLASSES, labels), "recall");
        }
        // The prediction spread (half the mean squared difference of two replicates' probabilities per row) moves
        // by at most 2⁻²³: each difference moves by at most 2⁻²⁴ times the two values, which sum to 2 over a row.
        Spread.PairMeans exact = Spread.pairMeans(Spread.halfSquaredDistances(run, TEST_ROWS), reps);
        Spread.PairMeans stored = Spread.pairMeans(Spread.halfSquaredDistances(read, TEST_ROWS), reps);
        assertEquals(exact.value(), stored.value(), 0x1p-23);
        assertNotEquals(exact.value(), stored.value(), "the stored values are rounded");
        for (int i = 0; i < reps; i++) {
            assertEquals(exact.leaveOneOut()[i], stored.leaveOneOut()[i], 0x1p-23);
        }
        int[][] runClasses = new int[reps][];
        for (int k = 0; k < reps; k++) {
            runClasses[k] = Replicate.predictedClasses(run[k], CLASSES);
        }
        assertArrayEquals(Spread.disagreement(run, CLASSES), Spread.disagreement(readClasses), "disagreement");
        assertArrayEquals(Spread.disagreement(runClasses), Spread.disagreement(readClasses));
    }

    @Test
    void aTieMadeByRoundingKeepsTheRunsClass() {
        double[] p = new double[TEST_ROWS * CLASSES];
        java.util.Random random = new java.util.Random(3);
        for (int r = 0; r < TEST_ROWS; r++) {
            // classes 0 and 1 differ in float64 by less than float32 resolves: class 1 is the run's choice
            double a = 0.3;
            double b = Math.nextUp(0.3);
            p[r * CLASSES] = a;
            p[r * CLASSES + 1] = b;
            p[r * CLASSES + 2] = 0.2;
            p[r * CLASSES + 3] = 1 - a - b - 0.2;
        }
        assertEquals((float) p[0], (float) p[1], "a tie in float32");
        Replicate original = replicate(1, p, random);
        ReplicateJson.Written w = ReplicateJson.write(original);
        Replicate back = ReplicateJson.read(w.json(), w.binary(), "1.json", "1.bin", expected(1));
        assertEquals(back.testProbabilities()[0], back.testProbabilities()[1]);
        for (int r = 0; r < TEST_ROWS; r++) {
            assertEquals(1, back.testPredicted()[r], "row " + r + ": the run's class, not the float32 tie's lower");
        }
    }

    @Test
    void anUnknownCodingOrALengthThatDoesNotFitIsRefusedNamingTheFileAndBlock() {
        byte[] file = ReplicateBlocks.write(List.of(new Block("start", 1, 3, Coding.FLOAT64, new double[] {1, 2, 3})));
        byte[] bad = file.clone();
        ByteBuffer.wrap(bad).order(ByteOrder.LITTLE_ENDIAN).putInt(16 + 40, 9);
        reseal(bad);
        assertEquals("x.bin: start: its coding is 9; expected 1 (float64), 2 (float64-xor), 3 (float32) or 4 (index)",
                assertThrows(BadInputException.class, () -> ReplicateBlocks.read(bad, "x.bin")).getMessage());
        byte[] shorter = file.clone();
        ByteBuffer.wrap(shorter).order(ByteOrder.LITTLE_ENDIAN).putInt(16 + 40, 3);
        reseal(shorter);
        assertEquals("x.bin: start: records 24 bytes for 1 × 3 values in float32",
                assertThrows(BadInputException.class, () -> ReplicateBlocks.read(shorter, "x.bin")).getMessage());
        byte[] xor = ReplicateBlocks.write(List.of(new Block("rates", 1, 2, Coding.FLOAT64_XOR, new double[] {1, 1})));
        xor[16 + 48] = 0x0f;
        reseal(xor);
        assertEquals("x.bin: rates: value 1 records 15 bytes; the block's counts are 0 to 8 and its bytes hold them",
                assertThrows(BadInputException.class, () -> ReplicateBlocks.read(xor, "x.bin")).getMessage());
        byte[] padded = ReplicateBlocks.write(List.of(new Block("rates", 1, 1, Coding.FLOAT64_XOR,
                new double[] {1})));
        padded[16 + 48] |= 0x10;
        reseal(padded);
        assertEquals("x.bin: rates: the count after the last value is not 0",
                assertThrows(BadInputException.class, () -> ReplicateBlocks.read(padded, "x.bin")).getMessage());
        // One value said in more bytes than it needs (high zero bytes kept) is refused: each value has one coding
        byte[] wide = ReplicateBlocks.write(List.of(new Block("rates", 1, 1, Coding.FLOAT64_XOR,
                new double[] {Double.MIN_VALUE})));
        // Double.MIN_VALUE's bits are 1: one byte kept; widen it to 8 bytes (seven of them zero)
        byte[] body = new byte[wide.length + 7];
        System.arraycopy(wide, 0, body, 0, 16 + 48);
        body[16 + 48] = 8;
        body[16 + 48 + 1] = 1;
        System.arraycopy(wide, wide.length - 4, body, body.length - 4, 4);
        ByteBuffer.wrap(body).order(ByteOrder.LITTLE_ENDIAN).putInt(16 + 44, 9);
        reseal(body);
        assertEquals("x.bin: rates: value 1 keeps a high zero byte; the coding leaves every high zero byte out",
                assertThrows(BadInputException.class, () -> ReplicateBlocks.read(body, "x.bin")).getMessage());
    }

    @Test
    void rowsTimesColumnsBeyondALongAreRefusedNotWrapped() {
        // rows × columns of two u32 can pass 2⁶³: (2³¹ + 2¹⁵)(2³² − 2¹⁶ + 1) = 2⁶³ + 2¹⁵, which a signed long holds as a
        // negative number whose double, 2 × values, wraps to 2¹⁶: the length of 2¹⁵ two-byte indices, as written below
        double[] classes = new double[1 << 15];
        for (int i = 0; i < classes.length; i++) {
            classes[i] = i % 300;
        }
        byte[] file = ReplicateBlocks.write(List.of(new Block("test_probabilities.classes", classes.length, 1,
                Coding.INDEX, classes)));
        ByteBuffer table = ByteBuffer.wrap(file).order(ByteOrder.LITTLE_ENDIAN);
        assertEquals(2 * classes.length, table.getInt(16 + 44), "two bytes an index");
        table.putInt(16 + 32, (int) ((1L << 31) + (1L << 15)));
        table.putInt(16 + 36, (int) ((1L << 32) - (1L << 16) + 1));
        reseal(file);
        assertEquals("x.bin: test_probabilities.classes: records 2147516416 × 4294901761 values; a block holds at most"
                + " 2147483647", assertThrows(BadInputException.class, () -> ReplicateBlocks.read(file, "x.bin"))
                .getMessage());
    }

    private static void reseal(byte[] bin) {
        ByteBuffer.wrap(bin).order(ByteOrder.LITTLE_ENDIAN).putInt(bin.length - 4,
                (int) ReplicateBlocks.crc(bin, bin.length - 4));
    }

    /** @return rows of a soft-max of random logits; replicate k's logits are a shared part plus its own */
    private static double[] probabilities(java.util.Random random, int k) {
        double[] p = new double[TEST_ROWS * CLASSES];
        java.util.Random shared = new java.util.Random(99);
        for (int r = 0; r < TEST_ROWS; r++) {
            double sum = 0;
            for (int c = 0; c < CLASSES; c++) {
                double z = 4 * shared.nextGaussian() + 0.5 * random.nextGaussian();
                p[r * CLASSES + c] = Math.exp(z);
                sum += p[r * CLASSES + c];
            }
            for (int c = 0; c < CLASSES; c++) {
                p[r * CLASSES + c] /= sum;
            }
        }
        return p;
    }

    /** The arm's id, as a study names its directory. */
    private static final String ARM_ID = StudyFormat.armId("cosine", "0".repeat(64));

    private static ReplicateJson.Expected expected(int replicate) {
        return new ReplicateJson.Expected(ARM_ID, "cosine", replicate, 7, null, P, CLASSES, TEST_ROWS, PER_EPOCH,
                PER_EPOCH * EPOCHS, false);
    }

    /** @return a finished replicate of a model without θ*, its arrays random, its probabilities {@code p} */
    private static Replicate replicate(int k, double[] p, java.util.Random random) {
        int total = PER_EPOCH * EPOCHS;
        double[] rates = new double[total];
        for (int t = 0; t < total; t++) {
            rates[t] = 0.5 * (1 + Math.cos(Math.PI * t / total));
        }
        double[] start = gaussian(random, P);
        double[] last = gaussian(random, P);
        double[] mean = gaussian(random, P);
        int snapshots = 3;
        double[] snap = gaussian(random, snapshots * P);
        double[] metrics = new double[Metric.values().length];
        Arrays.fill(metrics, Double.NaN);
        metrics[Metric.FINAL_OBJECTIVE.ordinal()] = 0.4;
        metrics[Metric.TAIL_RADIUS.ordinal()] = 0.01;
        metrics[Metric.TEST_ACCURACY.ordinal()] = 0.75;
        double[] epoch = new double[EPOCHS];
        double[] lastUpdate = new double[EPOCHS];
        double[] rate = new double[EPOCHS];
        double[] objective = new double[EPOCHS];
        double[] nan = new double[EPOCHS];
        Arrays.fill(nan, Double.NaN);
        for (int e = 0; e < EPOCHS; e++) {
            epoch[e] = e + 1;
            lastUpdate[e] = (e + 1) * PER_EPOCH;
            rate[e] = rates[(e + 1) * PER_EPOCH - 1];
            objective[e] = 1.0 / (e + 1);
        }
        Replicate.Tail tail = new Replicate.Tail(total - 4, 5, 1, snapshots, new long[] {total - 4, total - 2, total},
                new double[] {0.5, 0.45, 0.4});
        return new Replicate(ARM_ID, "cosine", k, new Replicate.Seeds("L64X128MixRandom", 7, 100 + k, 200 + k),
                Replicate.FINISHED, 0, total, total, false, 1.2, metrics, Double.NaN, tail,
                new Replicate.Epochs(epoch, lastUpdate, rate, objective, nan, nan.clone(), nan.clone(), nan.clone()),
                List.of(), List.of(), rates, start, last, mean, snapshots, snap, CLASSES, p,
                Prediction.skipped("no θ* for this model"));
    }

    private static double[] gaussian(java.util.Random random, int n) {
        double[] v = new double[n];
        for (int i = 0; i < n; i++) {
            v[i] = random.nextGaussian();
        }
        return v;
    }
}
