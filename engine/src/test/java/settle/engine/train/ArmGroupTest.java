package settle.engine.train;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.function.Consumer;
import org.junit.jupiter.api.Test;
import settle.datasets.Dataset;
import settle.engine.model.Activation;
import settle.engine.model.BinaryLogistic;
import settle.engine.model.Mlp;
import settle.engine.model.Model;
import settle.engine.model.SoftmaxRegression;
import settle.engine.schedule.Schedule;

/**
 * The arms of one replicate trained together give every arm exactly (tolerance 0, bit for bit) what it gets trained
 * alone: every schedule kind, momentum, tail averaging, plateau on the holdout, an arm that diverges while the others
 * go on, on the binary and multinomial logistic models and an MLP.
 */
class ArmGroupTest {

    private static final List<Map<String, Object>> SCHEDULES = List.of(
            Map.of("kind", "constant", "rate", 0.2),
            Map.of("kind", "anneal", "rate", 0.5, "floor", 0.0, "power", 1),
            Map.of("kind", "cosine", "rate", 0.2, "floor", 0.0, "warmup", Map.of("epochs", 2)),
            Map.of("kind", "exponential", "rate", 0.5, "base", 0.95, "per", "epoch"),
            Map.of("kind", "plateau", "rate", 0.5, "cut", 0.5, "window", 2, "gain", "1%", "floor", 0.01,
                    "judge", "holdout"),
            Map.of("kind", "power-law", "rate", 0.5, "power", 0.5, "per", "epoch"),
            Map.of("kind", "reciprocal", "rate", 0.5, "decay", 0.25, "per", "epoch"),
            Map.of("kind", "stepped", "rate", 0.5, "cut", 0.5, "every", 3),
            Map.of("kind", "warmup-stable-decay", "rate", 0.5, "decay-from", 0.7, "floor", 0.0, "shape", "root",
                    "warmup", Map.of("epochs", 2)),
            // far too large a rate: this arm diverges while the others go on
            Map.of("kind", "constant", "rate", 1e6));

    private final Dataset binary = TrainSupport.gaussianClasses(90, 5, 2, 21);
    private final Dataset threeClasses = TrainSupport.gaussianClasses(120, 4, 3, 22);
    private final Dataset holdoutBinary = TrainSupport.gaussianClasses(30, 5, 2, 23);
    private final Dataset holdoutThree = TrainSupport.gaussianClasses(30, 4, 3, 24);

    @Test
    void binaryLogisticArmsTogetherAreTheArmsAlone() {
        Model model = new BinaryLogistic(5, 0.01);
        TrainingSettings plain = TrainSupport.settings(12, 8);
        assertSame(model, binary, holdoutBinary, plain);
        assertSame(model, binary, holdoutBinary, plain.withMomentum(0.9).withAverageTail(true));
        assertSame(model, binary, holdoutBinary, plain.withSampling(Sampling.REPLACEMENT).withTail(0.5, 7));
    }

    @Test
    void softmaxArmsTogetherAreTheArmsAlone() {
        Model model = new SoftmaxRegression(4, 3, 0.01);
        TrainingSettings plain = TrainSupport.settings(10, 16);
        assertSame(model, threeClasses, holdoutThree, plain);
        assertSame(model, threeClasses, holdoutThree, plain.withAverageTail(true).withMomentum(0.5));
    }

    /**
     * Ten classes and 20 inputs: the arms' stacked products take the vector path's register blocks in both the
     * forward and the gradient product, where one arm alone takes the narrow forward product (and the scalar one on
     * the short last batch of 8 rows).
     */
    @Test
    void softmaxArmsTogetherOnTheWideProductsAreTheArmsAlone() {
        Model model = new SoftmaxRegression(20, 10, 0.001);
        Dataset train = TrainSupport.gaussianClasses(200, 20, 10, 25);
        Dataset holdout = TrainSupport.gaussianClasses(40, 20, 10, 26);
        assertSame(model, train, holdout, TrainSupport.settings(6, 32));
        assertSame(model, train, holdout, TrainSupport.settings(4, 24).withAverageTail(true).withMomentum(0.5));
    }

    @Test
    void mlpArmsTogetherAreTheArmsAlone() {
        Model model = new Mlp(4, new int[] {16}, Activation.RELU, 3, 0.001);
        assertSame(model, threeClasses, holdoutThree, TrainSupport.settings(8, 10));
        assertSame(model, threeClasses, holdoutThree, TrainSupport.settings(8, 10).withAverageTail(true));
    }

    @Test
    void armsThatDrawOtherBatchesAreNotGrouped() {
        Model model = new BinaryLogistic(5, 0.01);
        Schedule s = Schedules(SCHEDULES.get(0));
        Trainer a = Trainer.builder(model, binary, s, TrainSupport.settings(5, 8)).build();
        Trainer b = Trainer.builder(model, binary, s, TrainSupport.settings(5, 16)).build();
        Trainer c = Trainer.builder(model, binary, s, TrainSupport.settings(5, 8).withSampling(Sampling.REPLACEMENT)).build();
        Trainer d = Trainer.builder(model, binary, s, TrainSupport.settings(5, 8).withMomentum(0.5)).build();
        assertFalse(ArmGroup.shareBatches(a, b));
        assertFalse(ArmGroup.shareBatches(a, c));
        assertTrue(ArmGroup.shareBatches(a, d));
        assertThrows(IllegalArgumentException.class, () -> ArmGroup.of(List.of(a, b)));
    }

    private static Schedule Schedules(Map<String, Object> map) {
        return settle.engine.schedule.Schedules.parse(map);
    }

    /** Every schedule as one arm; all arms trained together, then each alone, for three replicates. */
    private void assertSame(Model model, Dataset train, Dataset holdout, TrainingSettings settings) {
        List<Trainer> arms = new ArrayList<>();
        for (Map<String, Object> map : SCHEDULES) {
            arms.add(Trainer.builder(model, train, Schedules(map), settings).holdout(holdout).test(holdout).build());
        }
        ArmGroup group = ArmGroup.of(arms);
        boolean someDiverged = false;
        for (int k = 1; k <= 3; k++) {
            ReplicateSeeds seeds = ReplicateSeeds.derive(77, k);
            List<List<EpochRecord>> heard = new ArrayList<>();
            List<Consumer<EpochRecord>> listeners = new ArrayList<>();
            for (int a = 0; a < arms.size(); a++) {
                List<EpochRecord> mine = new ArrayList<>();
                heard.add(mine);
                listeners.add(mine::add);
            }
            ReplicateResult[] early = new ReplicateResult[arms.size()];
            List<ReplicateResult> together = group.run(seeds, listeners, (a, r) -> {
                assertEquals(null, early[a], "each arm is finished once");
                early[a] = r;
            });
            for (int a = 0; a < arms.size(); a++) {
                List<EpochRecord> aloneHeard = new ArrayList<>();
                ReplicateResult alone = arms.get(a).run(seeds, aloneHeard::add);
                String what = model.describe() + ", " + SCHEDULES.get(a) + ", replicate " + k;
                assertIdentical(alone, together.get(a), what);
                assertEquals(aloneHeard, heard.get(a), what + ": epoch records told");
                assertTrue(early[a] == together.get(a), what + ": handed over as finished");
                someDiverged |= alone.diverged();
            }
        }
        assertTrue(someDiverged, "the large-rate arm diverges");
        assertFalse(ArmGroup.of(arms).run(ReplicateSeeds.derive(77, 1), listenersOf(arms.size()), (a, r) -> { })
                .get(0).diverged(), "the other arms go on");
    }

    private static List<Consumer<EpochRecord>> listenersOf(int count) {
        List<Consumer<EpochRecord>> list = new ArrayList<>();
        for (int i = 0; i < count; i++) {
            list.add(r -> { });
        }
        return list;
    }

    /**
     * Bit-for-bit equality of everything a replicate records: every component of the result and of its wander,
     * doubles and double arrays compared by their bits.
     */
    static void assertIdentical(ReplicateResult expected, ReplicateResult actual, String what) {
        assertRecordBits(expected, actual, what);
    }

    private static void assertRecordBits(Object expected, Object actual, String what) {
        if (expected == null || actual == null) {
            assertEquals(expected, actual, what);
            return;
        }
        if (!expected.getClass().isRecord()) {
            if (expected instanceof double[] e) {
                assertBits(e, (double[]) actual, what);
            } else if (expected instanceof long[] e) {
                assertArrayEquals(e, (long[]) actual, what);
            } else if (expected instanceof Double e) {
                assertEquals(Double.doubleToRawLongBits(e), Double.doubleToRawLongBits((Double) actual), what);
            } else {
                assertEquals(expected, actual, what);
            }
            return;
        }
        for (var component : expected.getClass().getRecordComponents()) {
            try {
                assertRecordBits(component.getAccessor().invoke(expected), component.getAccessor().invoke(actual),
                        what + ": " + component.getName());
            } catch (ReflectiveOperationException e) {
                throw new AssertionError(e);
            }
        }
    }

    private static void assertBits(double[] expected, double[] actual, String what) {
        long[] e = Arrays.stream(expected).mapToLong(Double::doubleToRawLongBits).toArray();
        long[] a = Arrays.stream(actual).mapToLong(Double::doubleToRawLongBits).toArray();
        assertArrayEquals(e, a, what);
    }
}
