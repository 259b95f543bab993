package settle.benchmarks;

import java.util.SplittableRandom;
import java.util.concurrent.TimeUnit;
import org.openjdk.jmh.annotations.Benchmark;
import org.openjdk.jmh.annotations.BenchmarkMode;
import org.openjdk.jmh.annotations.Fork;
import org.openjdk.jmh.annotations.Level;
import org.openjdk.jmh.annotations.Measurement;
import org.openjdk.jmh.annotations.Mode;
import org.openjdk.jmh.annotations.OutputTimeUnit;
import org.openjdk.jmh.annotations.Param;
import org.openjdk.jmh.annotations.Scope;
import org.openjdk.jmh.annotations.Setup;
import org.openjdk.jmh.annotations.State;
import org.openjdk.jmh.annotations.Warmup;
import settle.datasets.Dataset;
import settle.engine.model.FullBatch;
import settle.engine.model.Initialisation;
import settle.engine.model.Model;
import settle.engine.train.ReplicateSeeds;
import settle.engine.train.Trainer;

/**
 * JMH benchmarks of the engine's kernels on the four comparison workloads: a batch's forward pass
 * ({@link Model#lossSum}), forward and backward ({@link Model#batchObjective}), one update (gather the batch, batch
 * gradient, θ ← θ − αg: the trainer's hot path), the full-batch objective, and one whole epoch through the
 * {@link Trainer} (with its two full-batch evaluations). Run with the GC profiler to see the allocation per
 * operation: {@code java -jar benchmarks/target/benchmarks.jar KernelBenchmarks -prof gc}.
 */
@State(Scope.Thread)
@BenchmarkMode(Mode.AverageTime)
@OutputTimeUnit(TimeUnit.MICROSECONDS)
@Warmup(iterations = 5, time = 2)
@Measurement(iterations = 5, time = 2)
@Fork(value = 1, jvmArgsAppend = {"--add-modules", "jdk.incubator.vector", "-Xmx2g"})
public class KernelBenchmarks {

    /** The workload's key ({@link Workload#ALL}). */
    @Param({"logistic-b64", "logistic-b1024", "mlp-64-128-10-b64", "mlp-784-256-10-b256"})
    public String workload;

    private Model model;
    private Dataset data;
    private FullBatch full;
    private Model.Workspace workspace;
    private double[] theta;
    private double[] gradient;
    private double[] x;
    private int[] y;
    private int[] order;
    private int batch;
    private int cursor;
    private Trainer oneEpoch;
    private int replicate;

    /** Builds the model, data, a starting point and the buffers, once per trial. */
    @Setup(Level.Trial)
    public void setUp() {
        Workload w = Workload.of(workload);
        model = w.model();
        data = w.data(20260101L);
        full = new FullBatch(model, data);
        batch = w.batch();
        workspace = model.workspace(batch);
        theta = new double[model.parameterCount()];
        model.initialise(theta, Initialisation.GLOROT, new SplittableRandom(3));
        gradient = new double[model.parameterCount()];
        x = new double[batch * model.inputs()];
        y = new int[batch];
        order = new int[data.rows()];
        SplittableRandom random = new SplittableRandom(5);
        for (int i = 0; i < order.length; i++) {
            order[i] = i;
        }
        for (int i = order.length - 1; i > 0; i--) {
            int j = random.nextInt(i + 1);
            int t = order[i];
            order[i] = order[j];
            order[j] = t;
        }
        data.copyRows(order, 0, batch, x, 0, y);
        oneEpoch = w.withEpochs(1).trainer(data);
    }

    /** One batch's forward pass: the summed cross-entropy. */
    @Benchmark
    public double forward() {
        return model.lossSum(theta, x, y, batch, workspace);
    }

    /** One batch's forward and backward pass: the batch objective and its gradient. */
    @Benchmark
    public double forwardBackward() {
        return model.batchObjective(theta, x, y, batch, gradient, workspace);
    }

    /** One update as the trainer makes it: gather the next batch, its gradient, θ ← θ − αg (α tiny, θ stays put). */
    @Benchmark
    public double update() {
        if (cursor + batch > order.length) {
            cursor = 0;
        }
        data.copyRows(order, cursor, batch, x, 0, y);
        cursor += batch;
        double loss = model.batchObjective(theta, x, y, batch, gradient, workspace);
        double rate = 1e-12;
        for (int i = 0; i < theta.length; i++) {
            theta[i] -= rate * gradient[i];
        }
        return loss;
    }

    /** F(θ) over the whole training split, as the trainer evaluates it after every epoch and at each snapshot. */
    @Benchmark
    @OutputTimeUnit(TimeUnit.MILLISECONDS)
    public double fullBatchObjective() {
        return full.objective(theta);
    }

    /** One replicate of one epoch through the trainer: F(θ₀), ⌈N/B⌉ updates, the epoch-end evaluation. */
    @Benchmark
    @OutputTimeUnit(TimeUnit.MILLISECONDS)
    public Object epoch() {
        return oneEpoch.run(ReplicateSeeds.derive(20260101L, ++replicate));
    }
}
