package settle.engine.train;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Objects;
import java.util.function.Consumer;
import settle.datasets.Dataset;
import settle.engine.model.Initialisation;
import settle.engine.model.FullBatch;
import settle.engine.model.Model;
import settle.engine.schedule.RateDriver;
import settle.engine.schedule.RunShape;
import settle.engine.schedule.Schedule;
import settle.input.BadInputException;

/**
 * Mini-batch SGD for one arm: {@link #run} trains one replicate, from its seeds, and measures its wander.
 *
 * <p>Semantics (DESIGN.md "Training semantics"): an epoch is ⌈N/B⌉ updates. With {@code shuffle} the rows are
 * visited in a fresh permutation of epoch e (Fisher–Yates driven by {@link ReplicateSeeds#epochStream}), cut into
 * consecutive batches of B, the last one short; with {@code replacement} epoch e draws ⌈N/B⌉·B indices
 * uniformly with replacement from the same per-epoch stream, B per batch. The gradient of a batch is the mean
 * per-example gradient + λ·weights ({@link Model#batchObjective}). Update t (1-based over the run) uses
 * α_t = driver.rate(epoch, t): θ ← θ − α_t g_t; with momentum β: v ← βv + g_t, θ ← θ − α_t v, v₀ = 0.
 * After each epoch the full-batch objective and, where given, the holdout loss, test loss and accuracy and the
 * distance to θ* are recorded, and the objective and holdout loss are passed to {@link RateDriver#epochEnded}.
 * Each of the last L updates (the tail) feeds the online tail statistics, O(P) per update; the K snapshots fall
 * where {@link TailPlan} places them.
 *
 * <p>Divergence: when a batch objective (taken before its update) or an epoch-end objective is NaN, infinite or
 * above 1e6·F(θ₀) the replicate stops and is recorded as diverged at that update (a bad batch's update is not
 * applied). With F(θ₀) = 0 only non-finite values count.
 *
 * <p>A trainer is immutable and {@link #run} keeps all state local, so one trainer serves many threads. Every
 * buffer is created once per replicate; the update loop allocates nothing. Results are a function of the
 * inputs and seeds alone.
 */
public final class Trainer {

    /** Full tail snapshots are kept while K·P is at most this many values. */
    public static final long SNAPSHOT_LIMIT = 2_000_000L;

    /** The most updates one replicate may plan (its rates are one array). */
    public static final long MAX_UPDATES = Integer.MAX_VALUE - 8L;

    /** Divergence threshold as a multiple of F(θ₀). */
    public static final double DIVERGENCE_FACTOR = 1e6;

    private final Model model;
    private final Dataset train;
    private final Schedule schedule;
    private final TrainingSettings settings;
    private final Dataset test;
    private final Dataset holdout;
    private final ReferencePoint reference;
    private final Initialisation initialisation;
    private final double[] start;
    private final int[][] orders;
    private final int updatesPerEpoch;
    private final TailPlan tailPlan;

    private Trainer(Builder b) {
        this.model = b.model;
        this.train = b.train;
        this.schedule = b.schedule;
        this.settings = b.settings;
        this.test = b.test;
        this.holdout = b.holdout;
        this.reference = b.reference;
        this.initialisation = b.initialisation != null ? b.initialisation : Initialisation.standard(model.convex());
        this.updatesPerEpoch = settings.updatesPerEpoch(train.rows());
        long planned = settings.totalUpdates(train.rows());
        if (planned > MAX_UPDATES) {
            throw BadInputException.of("training.epochs", "training.epochs × ⌈N/B⌉ = " + planned + " updates; at most "
                    + MAX_UPDATES + " are supported");
        }
        this.tailPlan = TailPlan.of(planned, settings.tail(), settings.snapshots(), updatesPerEpoch);
        checkShape("training split", train);
        if (test != null) {
            checkShape("test split", test);
        }
        if (holdout != null) {
            checkShape("holdout split", holdout);
        }
        int p = model.parameterCount();
        if (reference != null && reference.theta().length != p) {
            throw new IllegalArgumentException("reference minimiser has " + reference.theta().length
                    + " parameters, the model has " + p);
        }
        double[] first = b.start;
        if (first == null && initialisation == Initialisation.REFERENCE) {
            if (reference == null) {
                throw new IllegalArgumentException("model.init: reference needs the reference minimiser (convex models only)");
            }
            first = reference.theta();
        }
        if (first != null) {
            if (first.length != p) {
                throw BadInputException.of("--init", "starting parameters: " + first.length + " values, the model has " + p);
            }
            for (int i = 0; i < first.length; i++) {
                if (!Double.isFinite(first[i])) {
                    throw BadInputException.of("--init", "starting parameters: value " + (i + 1) + " is not finite: " + first[i]);
                }
            }
            first = first.clone();
        }
        this.start = first;
        this.orders = b.orders == null ? null : checkOrders(b.orders);
    }

    /** @return a builder for an arm's trainer; every argument is required */
    public static Builder builder(Model model, Dataset train, Schedule schedule, TrainingSettings settings) {
        return new Builder(model, train, schedule, settings);
    }

    /** @return the run's shape: epochs × ⌈N/B⌉ updates */
    public RunShape shape() {
        return new RunShape(settings.epochs(), updatesPerEpoch);
    }

    /** @return where the tail and its snapshots lie */
    public TailPlan tailPlan() {
        return tailPlan;
    }

    /** @return the length of every explicit epoch order: N for shuffle, ⌈N/B⌉·B for replacement */
    public int orderLength() {
        return orderLength(settings, train.rows());
    }

    /** @return the length of every explicit epoch order: N for shuffle, ⌈N/B⌉·B for replacement */
    public static int orderLength(TrainingSettings settings, int rows) {
        return SampleOrders.length(settings.sampling(), rows, settings.batch());
    }

    /** Trains one replicate. */
    public ReplicateResult run(ReplicateSeeds seeds) {
        return run(seeds, record -> { });
    }

    /**
     * Trains one replicate: a group of this one arm ({@link ArmGroup}), so an arm trained alone and an arm trained
     * beside others run the same code.
     *
     * @param listener called after each epoch with its record (on the calling thread)
     */
    public ReplicateResult run(ReplicateSeeds seeds, Consumer<EpochRecord> listener) {
        Objects.requireNonNull(seeds, "seeds");
        Objects.requireNonNull(listener, "listener");
        return ArmGroup.of(List.of(this)).run(seeds, List.of(listener), (arm, result) -> { }).get(0);
    }

    Model model() {
        return model;
    }

    Dataset train() {
        return train;
    }

    TrainingSettings settings() {
        return settings;
    }

    int updatesPerEpoch() {
        return updatesPerEpoch;
    }

    /** @return the explicit epoch orders (replay), or null when they are sampled from the seeds */
    int[][] orders() {
        return orders;
    }

    /**
     * The state of one arm's replicate: every buffer, created once. {@link ArmGroup} drives it through the run,
     * sharing the mini-batch and the full-batch passes with the other arms of the group; every step this object
     * takes on its own (rate, update, tail, epoch record, divergence) is the same whatever the group's size.
     */
    final class ArmRun {
        private final ReplicateSeeds seeds;
        private final Consumer<EpochRecord> listener;
        private final int p = model.parameterCount();
        private final FullBatch onTrain;
        private final FullBatch onTest = test == null ? null : new FullBatch(model, test);
        private final FullBatch onHoldout = holdout == null ? null : new FullBatch(model, holdout);
        final double[] theta = new double[p];
        final double[] gradient = new double[p];
        private final double[] velocity = settings.momentum() != 0 ? new double[p] : null;
        private final double[] scratch = new double[p];
        private final TailRecorder tail = new TailRecorder(tailPlan, p, reference == null ? null : reference.theta(),
                model.hasGauge() ? model::removeGauge : null, SNAPSHOT_LIMIT);
        /**
         * While K·P is within {@link #SNAPSHOT_LIMIT}, the snapshots' raw iterates wait here and F is evaluated at
         * all of them in one pass over the data after training (the same values; a training table larger than the
         * cache is then read once rather than K times). Beyond it, F is evaluated at each snapshot as it is taken.
         */
        private final double[][] pending = (long) tailPlan.snapshots() * p <= SNAPSHOT_LIMIT
                ? new double[tailPlan.snapshots()][p] : null;
        private final long[] pendingUpdate = pending == null ? null : new long[pending.length];
        private int pendingCount;
        private final long total = tailPlan.totalUpdates();
        private final double[] rates = new double[(int) total];
        private final List<EpochRecord> epochs = new ArrayList<>(settings.epochs());
        private long evaluatedAt = -1;
        private double evaluatedObjective;
        private double[] initial;
        private double f0;
        private double limit;
        private RateDriver driver;
        private long t;
        private long divergedAt;
        private double rate = Double.NaN;

        /** @param onTrain the full-batch evaluator of the training split (the group's, on the calling thread) */
        ArmRun(ReplicateSeeds seeds, Consumer<EpochRecord> listener, FullBatch onTrain) {
            this.seeds = seeds;
            this.listener = listener;
            this.onTrain = onTrain;
        }

        /** Sets θ₀ from the explicit start or the replicate's initialisation stream. */
        void initialise() {
            if (start != null) {
                System.arraycopy(start, 0, theta, 0, p);
            } else {
                model.initialise(theta, initialisation, seeds.initialisationStream());
            }
            initial = theta.clone();
        }

        /** Takes F(θ₀) (evaluated by the group) and starts the schedule. */
        void started(double objective) {
            evaluatedAt = 0;
            evaluatedObjective = objective;
            f0 = objective;
            if (!Double.isFinite(f0)) {
                throw new IllegalArgumentException("the objective at the starting parameters is not finite: " + f0);
            }
            limit = f0 > 0 ? DIVERGENCE_FACTOR * f0 : Double.MAX_VALUE;
            driver = schedule.start(shape());
        }

        /** Takes the rate of update {@code update} in epoch {@code epoch} from the schedule. */
        void takeRate(int epoch, long update) {
            rate = driver.rate(epoch, update);
            if (!(rate >= 0) || rate == Double.POSITIVE_INFINITY) {
                throw new IllegalStateException("schedule " + schedule.kind() + " gave rate " + rate
                        + " for update " + update);
            }
        }

        /**
         * Applies update {@code update} with {@link #gradient} (the batch's, filled by the group) unless the batch
         * objective says the arm diverged.
         *
         * @param loss the batch objective at θ before the update
         * @return false when the arm diverged at this update (the update is not applied)
         */
        boolean update(long update, double loss) {
            if (!(loss <= limit)) {
                divergedAt = update;
                return false;
            }
            MiniBatchStep.update(theta, gradient, velocity, settings.momentum(), rate);
            t = update;
            rates[(int) (t - 1)] = rate;
            if (tail.inTail(t)) {
                tail.addIterate(t, theta);
                if (tail.snapshotDue(t)) {
                    double objective = Double.NaN;
                    if (pending == null) {
                        objective = objectiveAt(t);
                    } else {
                        System.arraycopy(theta, 0, pending[pendingCount], 0, p);
                        pendingUpdate[pendingCount++] = t;
                    }
                    tail.addSnapshot(theta, objective);
                }
            }
            return true;
        }

        /** @return true when F at the current iterate still has to be evaluated (not known for this update) */
        boolean needsObjective() {
            return evaluatedAt != t;
        }

        /**
         * Ends epoch {@code epoch}: records it with F at the current iterate (evaluated by the group when
         * {@link #needsObjective}, otherwise the known value is used), tells the listener and the schedule.
         *
         * @param objective F(θ) when {@link #needsObjective} was true; ignored otherwise
         * @return false when the arm diverged at this epoch end
         */
        boolean endEpoch(int epoch, double objective) {
            if (evaluatedAt != t) {
                evaluatedObjective = objective;
                evaluatedAt = t;
            }
            double value = evaluatedObjective;
            double holdoutLoss = onHoldout == null ? Double.NaN : onHoldout.meanLoss(theta);
            double testLoss = Double.NaN;
            double testAccuracy = Double.NaN;
            if (onTest != null) {
                testLoss = onTest.meanLoss(theta);
                testAccuracy = onTest.accuracy(theta);
            }
            double distance = reference == null ? Double.NaN : distanceToReference(theta);
            EpochRecord record = new EpochRecord(epoch, t, rate, value, holdoutLoss, testLoss, testAccuracy, distance);
            epochs.add(record);
            listener.accept(record);
            if (!(value <= limit)) {
                divergedAt = t;
                return false;
            }
            driver.epochEnded(epoch, value, holdoutLoss);
            return true;
        }

        /** @return the replicate's result, after training stopped (diverged) or ran every epoch */
        ReplicateResult result() {
            double[] appliedRates = t == rates.length ? rates : Arrays.copyOf(rates, (int) t);
            if (divergedAt != 0) {
                return new ReplicateResult(seeds, ReplicateResult.Status.DIVERGED, divergedAt, total,
                        settings.averageTail(), appliedRates, epochs, f0, initial, theta.clone(), null, null);
            }
            evaluatePendingSnapshots();
            double[] tailMean = tail.tailMean().clone();
            return new ReplicateResult(seeds, ReplicateResult.Status.FINISHED, 0, total, settings.averageTail(),
                    appliedRates, epochs, f0, initial, theta.clone(), tailMean, wander(tailMean));
        }

        /**
         * Fills in F at the snapshots taken with F pending: the last one from the last evaluation when that was at
         * its update (TailPlan puts the last snapshot at T, which the last epoch end evaluated; evaluations are
         * keyed by update number, so the value is F at the same iterate), the others in one pass over the rows.
         */
        private void evaluatePendingSnapshots() {
            // called once, after training: pending holds every snapshot, in order
            int count = pendingCount;
            if (count > 0 && pendingUpdate[count - 1] == evaluatedAt) {
                tail.setObjective(count - 1, evaluatedObjective);
                count--;
            }
            if (count > 0) {
                double[] values = new double[count];
                onTrain.objectives(pending, count, values);
                for (int s = 0; s < count; s++) {
                    tail.setObjective(s, values[s]);
                }
            }
        }

        /** @return F(θ) for the iterate after {@code update} updates, evaluated once per update number */
        private double objectiveAt(long update) {
            if (evaluatedAt != update) {
                evaluatedObjective = onTrain.objective(theta);
                evaluatedAt = update;
            }
            return evaluatedObjective;
        }

        /** @return ‖gauge-free(v) − θ*‖; v not modified */
        private double distanceToReference(double[] v) {
            System.arraycopy(v, 0, scratch, 0, p);
            model.removeGauge(scratch);
            return Math.sqrt(squaredDistance(scratch, reference.theta()));
        }

        private Wander wander(double[] tailMean) {
            // a tail of one update (or of identical iterates) has the last iterate as its mean: F is already known
            double averagedObjective = Arrays.equals(tailMean, theta) ? objectiveAt(total) : onTrain.objective(tailMean);
            double[] finalTheta = settings.averageTail() ? tailMean : theta;
            double finalObjective = settings.averageTail() ? averagedObjective : objectiveAt(total);
            double finalGap = Double.NaN;
            double finalDistance = Double.NaN;
            double averagedGap = Double.NaN;
            if (reference != null) {
                finalGap = finalObjective - reference.objective();
                finalDistance = distanceToReference(finalTheta);
                averagedGap = averagedObjective - reference.objective();
            }
            double testLoss = Double.NaN;
            double testAccuracy = Double.NaN;
            double[] probabilities = null;
            if (onTest != null) {
                probabilities = new double[test.rows() * model.classes()];
                testLoss = onTest.meanLoss(finalTheta);
                testAccuracy = onTest.accuracy(finalTheta);
                onTest.probabilities(finalTheta, probabilities);
            }
            double[] stored = tail.stored();
            return new Wander(tailPlan, tail.tailCount(), tail.snapshotUpdates().clone(), tail.objectives().clone(),
                    stored == null ? null : stored.clone(), tail.radius(), tail.distance(), tail.epochEndRadius(),
                    tail.epochEndDistance(), tail.epochEndCount(), tail.lossSpread(), finalObjective, finalGap,
                    finalDistance, averagedObjective, averagedGap, testLoss, testAccuracy, probabilities);
        }
    }

    private static double squaredDistance(double[] a, double[] b) {
        double sum = 0;
        for (int i = 0; i < a.length; i++) {
            double delta = a[i] - b[i];
            sum += delta * delta;
        }
        return sum;
    }

    private void checkShape(String what, Dataset data) {
        if (data.features() != model.inputs()) {
            throw new IllegalArgumentException(what + " (" + data.name() + ") has " + data.features()
                    + " features, the model takes " + model.inputs());
        }
        if (data.classes() != model.classes()) {
            throw new IllegalArgumentException(what + " (" + data.name() + ") has " + data.classes()
                    + " classes, the model has " + model.classes());
        }
    }

    private int[][] checkOrders(int[][] given) {
        int epochs = settings.epochs();
        if (given.length != epochs) {
            throw BadInputException.of("--order", "order: " + given.length + " epoch lines for " + epochs + " epochs");
        }
        int length = orderLength();
        int rows = train.rows();
        int[][] copy = new int[epochs][];
        for (int e = 0; e < epochs; e++) {
            int[] line = given[e];
            if (line.length != length) {
                throw BadInputException.of("--order", "order: epoch " + (e + 1) + " has " + line.length + " indices, expected "
                        + length + (settings.sampling() == Sampling.SHUFFLE ? " (one per training row)"
                                : " (⌈N/B⌉·B for replacement sampling)"));
            }
            for (int i = 0; i < line.length; i++) {
                if (line[i] < 0 || line[i] >= rows) {
                    throw BadInputException.of("--order", "order: epoch " + (e + 1) + ", position " + (i + 1) + ": index "
                            + line[i] + " is outside 0.." + (rows - 1));
                }
            }
            copy[e] = line.clone();
        }
        return copy;
    }

    /** Collects an arm's training inputs; the optional ones default to absent. */
    public static final class Builder {
        private final Model model;
        private final Dataset train;
        private final Schedule schedule;
        private final TrainingSettings settings;
        private Dataset test;
        private Dataset holdout;
        private ReferencePoint reference;
        private Initialisation initialisation;
        private double[] start;
        private int[][] orders;

        private Builder(Model model, Dataset train, Schedule schedule, TrainingSettings settings) {
            this.model = Objects.requireNonNull(model, "model");
            this.train = Objects.requireNonNull(train, "train");
            this.schedule = Objects.requireNonNull(schedule, "schedule");
            this.settings = Objects.requireNonNull(settings, "settings");
        }

        /** @param value the test split (test loss, accuracy and probabilities), or null */
        public Builder test(Dataset value) {
            this.test = value;
            return this;
        }

        /** @param value the holdout split (holdout loss, which plateau may judge), or null */
        public Builder holdout(Dataset value) {
            this.holdout = value;
            return this;
        }

        /** @param value θ* and F(θ*) for distances and gaps, or null */
        public Builder reference(ReferencePoint value) {
            this.reference = value;
            return this;
        }

        /**
         * @param value how to start when no explicit start is given (default zeros for convex models, he
         *     otherwise); {@code REFERENCE} starts at the reference point
         */
        public Builder initialisation(Initialisation value) {
            this.initialisation = value;
            return this;
        }

        /** @param value explicit starting parameters θ₀ for every replicate, or null; copied, not modified */
        public Builder start(double[] value) {
            this.start = value;
            return this;
        }

        /**
         * @param value one row-index order per epoch replacing the sampled ones (replay), or null; each of length
         *     {@link Trainer#orderLength(TrainingSettings, int)}, cut into consecutive batches of B; copied, not
         *     modified
         */
        public Builder orders(int[][] value) {
            this.orders = value;
            return this;
        }

        /** @return the trainer; throws IllegalArgumentException when the inputs do not fit together */
        public Trainer build() {
            return new Trainer(this);
        }
    }
}
