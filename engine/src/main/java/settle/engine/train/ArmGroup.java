package settle.engine.train;

import java.util.ArrayList;
import java.util.List;
import java.util.Objects;
import java.util.function.Consumer;
import settle.datasets.Dataset;
import settle.engine.model.FullBatch;
import settle.engine.model.Model;

/**
 * The arms of one replicate trained together. Seed pairing gives replicate k of every arm the same epoch orders
 * ({@link SampleOrders#fill} depends on the seeds, the sampling, N and the epoch alone), so arms with the same
 * model, training split, batch size, sampling and epochs see the same mini-batches: each batch is gathered once and
 * {@link Model#batchObjectives} computes every live arm's objective and gradient on it, and each epoch end
 * evaluates every live arm's F in one pass over the training split ({@link FullBatch#objectives}).
 *
 * <p>Everything else is each arm's own ({@link Trainer.ArmRun}): its rate (plateau and nudges included), its
 * momentum, tail statistics, averaging and epoch records. An arm that diverges drops out and the others go on.
 * Every arm's result is bit for bit the one it gets trained alone ({@link Trainer#run} is a group of one), since
 * every value of an arm is computed by the same chain of operations whatever the group's size.
 *
 * <p>A group is immutable and {@link #run} keeps its state local, so one group serves many threads.
 */
public final class ArmGroup {

    private final List<Trainer> arms;
    private final Model model;
    private final Dataset train;
    private final TrainingSettings first;

    private ArmGroup(List<Trainer> arms) {
        this.arms = List.copyOf(arms);
        Trainer lead = this.arms.get(0);
        this.model = lead.model();
        this.train = lead.train();
        this.first = lead.settings();
    }

    /**
     * @param arms at least one trainer; all must share their mini-batches ({@link #shareBatches})
     * @throws IllegalArgumentException when they do not
     */
    public static ArmGroup of(List<Trainer> arms) {
        if (arms.isEmpty()) {
            throw new IllegalArgumentException("a group needs at least one arm");
        }
        for (Trainer t : arms) {
            if (!shareBatches(arms.get(0), t)) {
                throw new IllegalArgumentException("arms in one group must share the model, the training split, the"
                        + " batch size, the sampling and the epochs, and sample their orders from the seeds");
            }
        }
        return new ArmGroup(arms);
    }

    /**
     * @return true when replicate k of {@code a} and of {@code b} see the same mini-batches and can be computed
     *     together: the same model and training split (the same objects), the same batch size, sampling and
     *     epochs, and orders sampled from the seeds (explicit orders only in a group of one)
     */
    public static boolean shareBatches(Trainer a, Trainer b) {
        if (a == b) {
            return true;
        }
        TrainingSettings sa = a.settings();
        TrainingSettings sb = b.settings();
        return a.model() == b.model() && a.train() == b.train() && sa.batch() == sb.batch()
                && sa.sampling() == sb.sampling() && sa.epochs() == sb.epochs()
                && a.orders() == null && b.orders() == null;
    }

    /** @return how many arms the group trains */
    public int size() {
        return arms.size();
    }

    /** Receives an arm's result as soon as that arm is done (a diverged arm before the others finish). */
    @FunctionalInterface
    public interface Finished {
        /** @param arm the arm's index in the group, from 0 */
        void accept(int arm, ReplicateResult result);
    }

    /**
     * Trains replicate {@code seeds} of every arm.
     *
     * @param listeners one per arm, called after each of its epochs with its record (on the calling thread)
     * @param finished called on the calling thread with each arm's result as soon as that arm is done
     * @return every arm's result, in the group's order
     */
    public List<ReplicateResult> run(ReplicateSeeds seeds, List<Consumer<EpochRecord>> listeners, Finished finished) {
        Objects.requireNonNull(seeds, "seeds");
        Objects.requireNonNull(finished, "finished");
        if (listeners.size() != arms.size()) {
            throw new IllegalArgumentException(listeners.size() + " listeners for " + arms.size() + " arms");
        }
        int count = arms.size();
        int n = train.rows();
        int batch = first.batch();
        int capacity = first.sampling() == Sampling.SHUFFLE ? Math.min(batch, n) : batch;
        FullBatch onTrain = new FullBatch(model, train);
        Trainer.ArmRun[] runs = new Trainer.ArmRun[count];
        for (int a = 0; a < count; a++) {
            runs[a] = arms.get(a).new ArmRun(seeds, Objects.requireNonNull(listeners.get(a), "listener"), onTrain);
        }
        // the live arms, compacted in group order; their θ and gradient buffers side by side for the shared passes
        int[] live = new int[count];
        double[][] thetas = new double[count][];
        double[][] gradients = new double[count][];
        double[] values = new double[count];
        for (int a = 0; a < count; a++) {
            live[a] = a;
            runs[a].initialise();
            thetas[a] = runs[a].theta;
        }
        onTrain.objectives(thetas, count, values);
        for (int a = 0; a < count; a++) {
            runs[a].started(values[a]);
            gradients[a] = runs[a].gradient;
        }
        ReplicateResult[] results = new ReplicateResult[count];
        int alive = count;
        int[][] given = arms.get(0).orders();
        int[] order = new int[arms.get(0).orderLength()];
        int updatesPerEpoch = arms.get(0).updatesPerEpoch();
        // an arm alone takes the model's own batch pass, so the fused pass is checked against it
        Model.Workspace workspace = count == 1 ? model.workspace(capacity) : model.workspace(capacity, count);
        double[] x = new double[capacity * model.inputs()];
        int[] y = new int[capacity];
        long t = 0;
        for (int epoch = 1; epoch <= first.epochs() && alive > 0; epoch++) {
            if (given != null) {
                System.arraycopy(given[epoch - 1], 0, order, 0, order.length);
            } else {
                SampleOrders.fill(seeds, first.sampling(), n, epoch, order);
            }
            for (int u = 0; u < updatesPerEpoch && alive > 0; u++) {
                long update = t + 1;
                int from = u * batch;
                int rows = Math.min(batch, order.length - from);
                for (int i = 0; i < alive; i++) {
                    runs[live[i]].takeRate(epoch, update);
                }
                train.copyRows(order, from, rows, x, 0, y);
                model.batchObjectives(thetas, alive, x, y, rows, gradients, values, workspace);
                int kept = 0;
                for (int i = 0; i < alive; i++) {
                    int a = live[i];
                    if (runs[a].update(update, values[i])) {
                        live[kept] = a;
                        thetas[kept] = thetas[i];
                        gradients[kept] = gradients[i];
                        kept++;
                    } else {
                        results[a] = runs[a].result();
                        finished.accept(a, results[a]);
                    }
                }
                alive = kept;
                t = update;
            }
            if (alive == 0) {
                break;
            }
            // F at the epoch's last iterate of every live arm, in one pass over the training split
            onTrain.objectives(thetas, alive, values);
            int kept = 0;
            for (int i = 0; i < alive; i++) {
                int a = live[i];
                if (runs[a].endEpoch(epoch, values[i])) {
                    live[kept] = a;
                    thetas[kept] = thetas[i];
                    gradients[kept] = gradients[i];
                    kept++;
                } else {
                    results[a] = runs[a].result();
                    finished.accept(a, results[a]);
                }
            }
            alive = kept;
        }
        for (int i = 0; i < alive; i++) {
            int a = live[i];
            results[a] = runs[a].result();
            finished.accept(a, results[a]);
        }
        return List.of(results);
    }
}
