package settle.engine.train;

import static org.junit.jupiter.api.Assertions.assertArrayEquals;
import static org.junit.jupiter.api.Assertions.assertEquals;
import static org.junit.jupiter.api.Assertions.assertFalse;
import static org.junit.jupiter.api.Assertions.assertNotNull;
import static org.junit.jupiter.api.Assertions.assertNull;
import static org.junit.jupiter.api.Assertions.assertThrows;
import static org.junit.jupiter.api.Assertions.assertTrue;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import org.junit.jupiter.api.Test;
import settle.datasets.Dataset;
import settle.engine.model.Activation;
import settle.engine.model.BinaryLogistic;
import settle.engine.model.FullBatch;
import settle.engine.model.Initialisation;
import settle.engine.model.Mlp;
import settle.engine.model.Model;
import settle.engine.model.SoftmaxRegression;
import settle.engine.schedule.RunShape;
import settle.engine.schedule.Schedule;
import settle.input.BadInputException;

class TrainerTest {

    /** Two or three roundings of numbers near 1. */
    private static final double HAND_TOLERANCE = 1e-15;
    /** Algebraic identities evaluated in floating point over a few dozen terms. */
    private static final double IDENTITY_TOLERANCE = 1e-12;

    private static final Schedule CONSTANT = TrainSupport.schedule("kind", "constant", "rate", 0.1);
    private static final Schedule DECAY = TrainSupport.schedule("kind", "reciprocal", "rate", 0.5, "decay", 0.1,
            "per", "update");

    private final Dataset binary = TrainSupport.gaussianClasses(45, 3, 2, 11);
    private final Dataset threeClasses = TrainSupport.gaussianClasses(60, 4, 3, 12);

    @Test
    void replicateKOfEveryArmSharesStartAndOrder() {
        TrainingSettings settings = TrainSupport.settings(4, 8);
        BatchSpy constantSpy = new BatchSpy(new BinaryLogistic(3, 0.01), binary);
        BatchSpy decaySpy = new BatchSpy(new BinaryLogistic(3, 0.01), binary);
        BatchSpy otherSpy = new BatchSpy(new BinaryLogistic(3, 0.01), binary);
        ReplicateResult a = Trainer.builder(constantSpy, binary, CONSTANT, settings)
                .initialisation(Initialisation.GLOROT).build().run(ReplicateSeeds.derive(7, 1));
        ReplicateResult b = Trainer.builder(decaySpy, binary, DECAY, settings.withMomentum(0.5).withTail(0.5, 3))
                .initialisation(Initialisation.GLOROT).build().run(ReplicateSeeds.derive(7, 1));
        ReplicateResult c = Trainer.builder(otherSpy, binary, CONSTANT, settings)
                .initialisation(Initialisation.GLOROT).build().run(ReplicateSeeds.derive(7, 2));
        assertArrayEquals(a.start(), b.start());
        assertEquals(constantSpy.batches.size(), decaySpy.batches.size());
        for (int t = 0; t < constantSpy.batches.size(); t++) {
            assertArrayEquals(constantSpy.batches.get(t), decaySpy.batches.get(t), "batch of update " + (t + 1));
        }
        assertFalse(Arrays.equals(a.start(), c.start()));
        assertFalse(Arrays.equals(constantSpy.batches.get(0), otherSpy.batches.get(0)));
        assertFalse(Arrays.equals(a.last(), b.last()), "the arms differ in their schedules");
    }

    @Test
    void rerunsAreBitIdentical() {
        TrainingSettings settings = TrainSupport.settings(5, 7).withMomentum(0.3);
        Trainer trainer = Trainer.builder(new SoftmaxRegression(4, 3, 0.01), threeClasses, DECAY, settings)
                .test(TrainSupport.gaussianClasses(30, 4, 3, 13)).build();
        ReplicateResult first = trainer.run(ReplicateSeeds.derive(5, 3));
        ReplicateResult second = trainer.run(ReplicateSeeds.derive(5, 3));
        assertArrayEquals(first.last(), second.last());
        assertArrayEquals(first.tailMean(), second.tailMean());
        assertArrayEquals(first.rates(), second.rates());
        assertEquals(first.epochs(), second.epochs());
        assertEquals(first.wander().tailRadius(), second.wander().tailRadius());
        assertEquals(first.wander().tailDistanceEpochEnds(), second.wander().tailDistanceEpochEnds());
        assertEquals(first.wander().tailRadiusEpochEnds(), second.wander().tailRadiusEpochEnds());
        assertArrayEquals(first.wander().snapshotObjectives(), second.wander().snapshotObjectives());
        assertArrayEquals(first.wander().testProbabilities(), second.wander().testProbabilities());
    }

    @Test
    void explicitOrdersEqualToTheSampledOnesReproduceTheRun() {
        for (Sampling sampling : Sampling.values()) {
            TrainingSettings settings = TrainSupport.settings(3, 8).withSampling(sampling).withMomentum(0.9);
            ReplicateSeeds seeds = ReplicateSeeds.derive(42, 4);
            Model model = new BinaryLogistic(3, 0.001);
            ReplicateResult sampled = Trainer.builder(model, binary, DECAY, settings).build().run(seeds);
            int[][] orders = SampleOrders.all(seeds, sampling, binary.rows(), 8, 3);
            ReplicateResult replayed = Trainer.builder(model, binary, DECAY, settings).orders(orders).build()
                    .run(ReplicateSeeds.derive(0, 0));
            assertArrayEquals(sampled.last(), replayed.last(), sampling.key());
        }
    }

    @Test
    void shuffleVisitsEachRowOnceAndReplacementDrawsFullBatches() {
        // N = 45, B = 8: ⌈45/8⌉ = 6 updates per epoch in both modes; shuffle's last batch has 45 − 40 = 5 rows
        TrainingSettings settings = TrainSupport.settings(2, 8);
        BatchSpy shuffle = new BatchSpy(new BinaryLogistic(3, 0.01), binary);
        ReplicateResult s = Trainer.builder(shuffle, binary, CONSTANT, settings).build().run(ReplicateSeeds.derive(1, 1));
        assertEquals(12, s.rates().length);
        assertEquals(12, shuffle.batches.size());
        for (int epoch = 0; epoch < 2; epoch++) {
            int[] seen = new int[45];
            for (int u = 0; u < 6; u++) {
                int[] rows = shuffle.batches.get(epoch * 6 + u);
                assertEquals(u < 5 ? 8 : 5, rows.length);
                for (int row : rows) {
                    seen[row]++;
                }
            }
            for (int count : seen) {
                assertEquals(1, count);
            }
        }
        BatchSpy replacement = new BatchSpy(new BinaryLogistic(3, 0.01), binary);
        ReplicateResult r = Trainer.builder(replacement, binary, CONSTANT, settings.withSampling(Sampling.REPLACEMENT))
                .build().run(ReplicateSeeds.derive(1, 1));
        assertEquals(12, r.rates().length);
        assertEquals(12, replacement.batches.size());
        for (int epoch = 0; epoch < 2; epoch++) {
            boolean[] seen = new boolean[45];
            boolean repeated = false;
            for (int u = 0; u < 6; u++) {
                int[] rows = replacement.batches.get(epoch * 6 + u);
                assertEquals(8, rows.length);
                for (int row : rows) {
                    repeated |= seen[row];
                    seen[row] = true;
                }
            }
            // 48 draws from 45 rows must repeat one (pigeonhole)
            assertTrue(repeated);
        }
    }

    /**
     * One row x = 1, label 1, λ = 0, zeros start, batch 1, rate 1, two updates (one per epoch). Update 1 at θ = 0:
     * z = 0, σ = ½, g = (σ − 1)·(x, 1) = (−½, −½), θ₁ = (½, ½). Update 2: z = ½ + ½ = 1, g = (σ(1) − 1)(1, 1),
     * σ(1) = 1/(1 + e⁻¹). Plain: θ₂ = ½ + (1 − σ(1)). Heavy ball β = ½: v₂ = ½·(−½) + (σ(1) − 1),
     * θ₂ = ½ − v₂ = ½ + ¼ + (1 − σ(1)).
     */
    @Test
    void momentumMatchesTheHeavyBallFormulaByHand() {
        Dataset one = new Dataset("one row", new double[] {1.0}, new int[] {1}, List.of("x"), List.of("0", "1"));
        Schedule unit = TrainSupport.schedule("kind", "constant", "rate", 1.0);
        double sigmoidOne = 1 / (1 + Math.exp(-1));
        ReplicateResult plain = Trainer.builder(new BinaryLogistic(1, 0), one, unit, TrainSupport.settings(2, 1))
                .build().run(ReplicateSeeds.derive(1, 1));
        double expectedPlain = 0.5 + (1 - sigmoidOne);
        assertArrayEquals(new double[] {expectedPlain, expectedPlain}, plain.last(), HAND_TOLERANCE);
        ReplicateResult heavy = Trainer.builder(new BinaryLogistic(1, 0), one, unit,
                TrainSupport.settings(2, 1).withMomentum(0.5)).build().run(ReplicateSeeds.derive(1, 1));
        double expectedHeavy = 0.5 + 0.25 + (1 - sigmoidOne);
        assertArrayEquals(new double[] {expectedHeavy, expectedHeavy}, heavy.last(), HAND_TOLERANCE);
    }

    /**
     * With λ = 1 and α = 3 the weights obey w ← (1 − αλ)w − α·g_ce = −2w − 3g_ce: |w| doubles each update and the
     * penalty passes 1e6·F(θ₀) within a few epochs. At α = 1.9 (αλ < 2) the same data only oscillates.
     */
    @Test
    void divergenceStopsTheReplicate() {
        TrainingSettings settings = TrainSupport.settings(20, 8);
        Schedule large = TrainSupport.schedule("kind", "constant", "rate", 3.0);
        ReplicateResult r = Trainer.builder(new BinaryLogistic(3, 1.0), binary, large, settings).build()
                .run(ReplicateSeeds.derive(3, 1));
        assertTrue(r.diverged());
        assertEquals("diverged", r.status().key());
        assertTrue(r.divergedAt() > 1 && r.divergedAt() < r.totalUpdates(), "diverged at " + r.divergedAt());
        assertTrue(r.epochs().size() < 20);
        assertTrue(r.rates().length == r.divergedAt() - 1 || r.rates().length == r.divergedAt());
        assertNull(r.wander());
        assertNull(r.tailMean());
        for (EpochRecord e : r.epochs().subList(0, r.epochs().size() - 1)) {
            assertTrue(e.objective() <= Trainer.DIVERGENCE_FACTOR * r.initialObjective());
        }
        Schedule stable = TrainSupport.schedule("kind", "constant", "rate", 1.9);
        ReplicateResult s = Trainer.builder(new BinaryLogistic(3, 1.0), binary, stable, settings).build()
                .run(ReplicateSeeds.derive(3, 1));
        assertFalse(s.diverged());
        assertEquals(0, s.divergedAt());
        assertEquals(120, s.rates().length);
    }

    @Test
    void mlpAtALargeRateDiverges() {
        // ReLU MLP, He start: at rate 50 the first updates blow the logits up, so the cross-entropy of a batch
        // passes 1e6·F(θ₀) (≈ 0.7·1e6) or overflows; the same net at rate 0.05 trains to the end
        Model mlp = new Mlp(3, new int[] {16}, Activation.RELU, 2, 0.0);
        TrainingSettings settings = TrainSupport.settings(30, 5);
        ReplicateResult r = Trainer.builder(mlp, binary, TrainSupport.schedule("kind", "constant", "rate", 50.0),
                settings).build().run(ReplicateSeeds.derive(4, 1));
        assertTrue(r.diverged(), "status " + r.status());
        assertTrue(r.divergedAt() < r.totalUpdates());
        assertNull(r.wander());
        ReplicateResult calm = Trainer.builder(mlp, binary, TrainSupport.schedule("kind", "constant", "rate", 0.05),
                settings).build().run(ReplicateSeeds.derive(4, 1));
        assertFalse(calm.diverged());
        assertArrayEquals(r.start(), calm.start(), "same replicate, same He start");
        assertTrue(calm.wander().tailRadius() > 0);
        assertTrue(Double.isNaN(calm.wander().finalGap()), "no reference for an MLP");
    }

    /**
     * N = 45, B = 4: U = ⌈45/4⌉ = 12, T = 6·12 = 72, τ = 0.5: L = 36, K = 9 slots of 4 updates. TailPlan puts the
     * last snapshot at T, whose F the trainer reuses from the last epoch's evaluation, and the others at spread
     * phases inside their epochs, whose F it evaluates in one pass after training.
     */
    @Test
    void snapshotObjectivesEvaluatedAfterTrainingAreFAtEachSnapshot() {
        // the binary model has no gauge, so the stored snapshots are the raw iterates F was evaluated at
        Model model = new BinaryLogistic(3, 0.01);
        TrainingSettings settings = TrainSupport.settings(6, 4).withTail(0.5, 9);
        ReplicateResult r = Trainer.builder(model, binary, CONSTANT, settings).build().run(ReplicateSeeds.derive(3, 1));
        Wander w = r.wander();
        int k = w.tail().snapshots();
        assertEquals(9, k);
        int p = model.parameterCount();
        FullBatch full = new FullBatch(model, binary);
        int epochEnds = 0;
        for (int s = 0; s < k; s++) {
            double[] snapshot = Arrays.copyOfRange(w.snapshots(), s * p, (s + 1) * p);
            assertEquals(full.objective(snapshot), w.snapshotObjectives()[s], 0.0, "snapshot " + s);
            epochEnds += w.snapshotUpdates()[s] % 12 == 0 ? 1 : 0;
        }
        assertEquals(1, epochEnds, "only the last snapshot, T, ends an epoch");
        assertEquals(72, w.snapshotUpdates()[k - 1]);
        assertArrayEquals(r.last(), Arrays.copyOfRange(w.snapshots(), (k - 1) * p, k * p));
        assertEquals(r.epochs().get(5).objective(), w.snapshotObjectives()[k - 1]);
    }

    /**
     * The tail metrics against their definitions, computed here from the iterates the spy saw: θ_t for the L = 30
     * tail updates (T = 10·⌈60/6⌉ = 100, τ = 0.3), projected onto the gauge-free subspace (softmax biases
     * centred), two passes (mean first). Epoch ends are every 10th update: 80, 90, 100 in the tail (71–100).
     */
    @Test
    void tailMetricsAreTheirDefinitionsOverEveryTailIterate() {
        Model model = new SoftmaxRegression(4, 3, 0.01);
        double[] point = Trainer.builder(model, threeClasses, CONSTANT, TrainSupport.settings(30, 60)).build()
                .run(ReplicateSeeds.derive(1, 9)).last();
        model.removeGauge(point);
        ReferencePoint reference = new ReferencePoint(point, new FullBatch(model, threeClasses).objective(point));
        BatchSpy spy = new BatchSpy(model, threeClasses);
        TrainingSettings settings = TrainSupport.settings(10, 6).withTail(0.3, 7);
        ReplicateResult r = Trainer.builder(spy, threeClasses, CONSTANT, settings).reference(reference).build()
                .run(ReplicateSeeds.derive(1, 2));
        Wander w = r.wander();
        assertEquals(100, r.totalUpdates());
        assertEquals(30, w.tailIterates());
        assertEquals(3, w.tailEpochEnds());
        int p = model.parameterCount();
        List<double[]> every = new ArrayList<>();
        List<double[]> ends = new ArrayList<>();
        for (int t = 71; t <= 100; t++) {
            double[] theta = (t == 100 ? r.last() : spy.iterates.get(t)).clone();
            model.removeGauge(theta);
            every.add(theta);
            if (t % 10 == 0) {
                ends.add(theta);
            }
        }
        double[] all = radiusAndDistance(every, point);
        double[] atEnds = radiusAndDistance(ends, point);
        assertEquals(all[0], w.tailRadius(), IDENTITY_TOLERANCE * all[0]);
        assertEquals(all[1], w.tailDistance(), IDENTITY_TOLERANCE * all[1]);
        assertEquals(atEnds[0], w.tailRadiusEpochEnds(), IDENTITY_TOLERANCE * atEnds[0]);
        assertEquals(atEnds[1], w.tailDistanceEpochEnds(), IDENTITY_TOLERANCE * atEnds[1]);
        // θ̄ is the raw mean (the softmax biases' common shift kept)
        double[] rawMean = new double[p];
        for (int t = 71; t <= 100; t++) {
            double[] theta = t == 100 ? r.last() : spy.iterates.get(t);
            for (int i = 0; i < p; i++) {
                rawMean[i] += theta[i] / 30;
            }
        }
        assertArrayEquals(rawMean, r.tailMean(), IDENTITY_TOLERANCE);
    }

    /** One replicate (same seeds) with K = 10 and K = 37: the tail metrics agree to the bit, the snapshots not. */
    @Test
    void tailMetricsDoNotDependOnTheSnapshotCount() {
        Model model = new SoftmaxRegression(4, 3, 0.01);
        ReferencePoint reference = new ReferencePoint(new double[model.parameterCount()], 1.0);
        ReplicateResult ten = Trainer.builder(model, threeClasses, DECAY, TrainSupport.settings(10, 6).withTail(0.4, 10))
                .reference(reference).build().run(ReplicateSeeds.derive(6, 2));
        ReplicateResult many = Trainer.builder(model, threeClasses, DECAY, TrainSupport.settings(10, 6).withTail(0.4, 37))
                .reference(reference).build().run(ReplicateSeeds.derive(6, 2));
        Wander a = ten.wander();
        Wander b = many.wander();
        assertEquals(10, a.tail().snapshots());
        assertEquals(37, b.tail().snapshots());
        assertEquals(a.tailRadius(), b.tailRadius());
        assertEquals(a.tailDistance(), b.tailDistance());
        assertEquals(a.tailRadiusEpochEnds(), b.tailRadiusEpochEnds());
        assertEquals(a.tailDistanceEpochEnds(), b.tailDistanceEpochEnds());
        assertEquals(a.tailEpochEnds(), b.tailEpochEnds());
        assertArrayEquals(ten.tailMean(), many.tailMean());
        assertEquals(a.averagedObjective(), b.averagedObjective());
        assertTrue(a.tailRadius() > 0 && a.tailRadiusEpochEnds() > 0);
    }

    @Test
    void tailDistanceSplitsIntoRadiusAndOffset() {
        // θ* here is any fixed gauge-free point: (1/L)Σ‖x_t − θ*‖² = radius² + ‖x̄ − θ*‖² over the gauge-free tail
        // iterates x_t is algebra, and x̄ is the projection of θ̄ (the projection is linear)
        Model model = new SoftmaxRegression(4, 3, 0.01);
        double[] point = Trainer.builder(model, threeClasses, CONSTANT, TrainSupport.settings(30, 60)).build()
                .run(ReplicateSeeds.derive(1, 9)).last();
        model.removeGauge(point);
        double objective = new FullBatch(model, threeClasses).objective(point);
        ReferencePoint reference = new ReferencePoint(point, objective);
        TrainingSettings settings = TrainSupport.settings(10, 6).withTail(0.3, 7);
        ReplicateResult r = Trainer.builder(model, threeClasses, CONSTANT, settings).reference(reference).build()
                .run(ReplicateSeeds.derive(1, 2));
        Wander w = r.wander();
        assertEquals(7, w.tail().snapshots());
        assertEquals(30, w.tail().length()); // τT = 0.3 · 10 · ⌈60/6⌉ = 30
        assertEquals(30, w.tailIterates());
        assertNotNull(w.snapshots());
        int p = model.parameterCount();
        double[] mean = r.tailMean().clone();
        model.removeGauge(mean);
        double offset = 0;
        for (int i = 0; i < p; i++) {
            offset += (mean[i] - point[i]) * (mean[i] - point[i]);
        }
        double lhs = w.tailDistance() * w.tailDistance();
        double rhs = w.tailRadius() * w.tailRadius() + offset;
        assertEquals(lhs, rhs, IDENTITY_TOLERANCE * lhs);
        assertTrue(w.tailRadius() > 0);
        assertEquals(w.finalObjective() - objective, w.finalGap());
        assertEquals(w.averagedObjective() - objective, w.averagedGap());
        double[] last = r.last().clone();
        model.removeGauge(last);
        double distance = 0;
        for (int i = 0; i < p; i++) {
            distance += (last[i] - point[i]) * (last[i] - point[i]);
        }
        assertEquals(Math.sqrt(distance), w.finalDistance(), IDENTITY_TOLERANCE);
        assertEquals(Math.sqrt(distance), r.epochs().get(9).distance(), IDENTITY_TOLERANCE);
    }

    @Test
    void distancesIgnoreTheSoftmaxGauge() {
        // adding 5 to every class bias changes no prediction; SGD never moves that direction
        Model model = new SoftmaxRegression(4, 3, 0.01);
        double[] start = new double[model.parameterCount()];
        double[] shifted = start.clone();
        for (int c = 0; c < 3; c++) {
            shifted[12 + c] = 5;
        }
        double[] point = new double[model.parameterCount()];
        ReferencePoint reference = new ReferencePoint(point, 1.0);
        TrainingSettings settings = TrainSupport.settings(3, 10);
        ReplicateResult a = Trainer.builder(model, threeClasses, DECAY, settings).start(start).reference(reference)
                .build().run(ReplicateSeeds.derive(2, 1));
        ReplicateResult b = Trainer.builder(model, threeClasses, DECAY, settings).start(shifted).reference(reference)
                .build().run(ReplicateSeeds.derive(2, 1));
        assertEquals(a.wander().finalDistance(), b.wander().finalDistance(), IDENTITY_TOLERANCE);
        assertEquals(a.wander().tailDistance(), b.wander().tailDistance(), IDENTITY_TOLERANCE);
        assertEquals(a.wander().tailRadius(), b.wander().tailRadius(), IDENTITY_TOLERANCE);
        assertEquals(a.wander().tailDistanceEpochEnds(), b.wander().tailDistanceEpochEnds(), IDENTITY_TOLERANCE);
        assertEquals(a.wander().tailRadiusEpochEnds(), b.wander().tailRadiusEpochEnds(), IDENTITY_TOLERANCE);
        assertEquals(5.0, b.last()[12] - a.last()[12], IDENTITY_TOLERANCE);
    }

    @Test
    void tailAveragedArmReportsTheMeanAsFinal() {
        Dataset test = TrainSupport.gaussianClasses(30, 4, 3, 14);
        Model model = new SoftmaxRegression(4, 3, 0.01);
        BatchSpy spy = new BatchSpy(model, threeClasses);
        TrainingSettings settings = TrainSupport.settings(6, 10).withTail(0.5, 5).withAverageTail(true);
        ReplicateResult r = Trainer.builder(spy, threeClasses, CONSTANT, settings).test(test).build()
                .run(ReplicateSeeds.derive(8, 1));
        FullBatch onTrain = new FullBatch(model, threeClasses);
        FullBatch onTest = new FullBatch(model, test);
        Wander w = r.wander();
        assertTrue(r.averageTail());
        assertEquals(r.tailMean(), r.finalParameters());
        assertEquals(w.averagedObjective(), w.finalObjective());
        assertEquals(onTrain.objective(r.tailMean()), w.averagedObjective());
        assertEquals(onTest.meanLoss(r.tailMean()), w.testLoss());
        assertEquals(onTest.accuracy(r.tailMean()), w.testAccuracy());
        double[] probabilities = new double[30 * 3];
        onTest.probabilities(r.tailMean(), probabilities);
        assertArrayEquals(probabilities, w.testProbabilities());
        assertFalse(Arrays.equals(r.tailMean(), r.last()));
        // T = 6 · ⌈60/10⌉ = 36, L = ⌈0.5 · 36⌉ = 18: θ̄ is the plain mean of θ_19 … θ_36
        assertEquals(18, w.tailIterates());
        List<double[]> iterates = new ArrayList<>(spy.iterates.subList(19, 36));
        iterates.add(r.last());
        double[] mean = new double[model.parameterCount()];
        for (double[] theta : iterates) {
            for (int i = 0; i < mean.length; i++) {
                mean[i] += theta[i] / 18;
            }
        }
        assertArrayEquals(mean, r.tailMean(), IDENTITY_TOLERANCE);
    }

    @Test
    void epochRecordsFeedTheDriverAndKeepEveryRate() {
        TrainSupport.Recording recording = new TrainSupport.Recording(
                TrainSupport.schedule("kind", "formula", "expr", "0.1 * epoch + 0.001 * update"));
        Dataset holdout = TrainSupport.gaussianClasses(20, 3, 2, 15);
        List<EpochRecord> streamed = new ArrayList<>();
        ReplicateResult r = Trainer.builder(new BinaryLogistic(3, 0.01), binary, recording, TrainSupport.settings(4, 8))
                .holdout(holdout).build().run(ReplicateSeeds.derive(1, 1), streamed::add);
        assertEquals(r.epochs(), streamed);
        assertEquals(List.of(new RunShape(4, 6)), recording.shapes);
        List<double[]> reported = recording.reported;
        assertEquals(4, reported.size());
        for (int e = 0; e < 4; e++) {
            EpochRecord record = r.epochs().get(e);
            assertEquals(e + 1, record.epoch());
            assertEquals(6L * (e + 1), record.lastUpdate());
            assertEquals(r.rates()[(int) record.lastUpdate() - 1], record.rate());
            assertArrayEquals(new double[] {e + 1, record.objective(), record.holdoutLoss()}, reported.get(e));
            assertTrue(Double.isFinite(record.holdoutLoss()));
            assertTrue(Double.isNaN(record.testLoss()));
            assertTrue(Double.isNaN(record.distance()));
        }
        for (int t = 1; t <= 24; t++) {
            int epoch = (t - 1) / 6 + 1;
            assertEquals(0.1 * epoch + 0.001 * t, r.rates()[t - 1], HAND_TOLERANCE);
        }
    }

    @Test
    void inputsThatDoNotFitAreRefused() {
        Model model = new BinaryLogistic(3, 0.01);
        TrainingSettings settings = TrainSupport.settings(2, 8);
        assertMessage("starting parameters: 3 values", () -> Trainer.builder(model, binary, CONSTANT, settings)
                .start(new double[3]).build());
        assertMessage("order: 1 epoch lines for 2 epochs", () -> Trainer.builder(model, binary, CONSTANT, settings)
                .orders(new int[1][45]).build());
        int[][] bad = new int[2][45];
        bad[1][3] = 45;
        assertMessage("order: epoch 2, position 4: index 45 is outside 0..44",
                () -> Trainer.builder(model, binary, CONSTANT, settings).orders(bad).build());
        assertFault("has 4 features, the model takes 3",
                () -> Trainer.builder(model, threeClasses, CONSTANT, settings).build());
        assertFault("model.init: reference", () -> Trainer.builder(model, binary, CONSTANT, settings)
                .initialisation(Initialisation.REFERENCE).build());
    }

    /** @return {sqrt(mean ‖x − x̄‖²), sqrt(mean ‖x − θ*‖²)} over the vectors, two passes (x̄ first) */
    private static double[] radiusAndDistance(List<double[]> vectors, double[] star) {
        int p = star.length;
        double[] mean = new double[p];
        for (double[] x : vectors) {
            for (int i = 0; i < p; i++) {
                mean[i] += x[i] / vectors.size();
            }
        }
        double deviations = 0;
        double distances = 0;
        for (double[] x : vectors) {
            for (int i = 0; i < p; i++) {
                deviations += (x[i] - mean[i]) * (x[i] - mean[i]);
                distances += (x[i] - star[i]) * (x[i] - star[i]);
            }
        }
        return new double[] {Math.sqrt(deviations / vectors.size()), Math.sqrt(distances / vectors.size())};
    }

    /** A precondition the caller (the plan parser, the command line) guarantees: a fault if broken, not bad input. */
    private static void assertFault(String expected, org.junit.jupiter.api.function.Executable call) {
        IllegalArgumentException e = assertThrows(IllegalArgumentException.class, call);
        assertTrue(e.getMessage().contains(expected), e.getMessage());
    }

    private static void assertMessage(String expected, org.junit.jupiter.api.function.Executable call) {
        // starting parameters and orders come from the files given to settle trace: bad input
        BadInputException e = assertThrows(BadInputException.class, call);
        assertTrue(e.getMessage().contains(expected), e.getMessage());
    }
}
