package settle.benchmarks;

import java.io.IOException;
import java.nio.file.Path;
import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.Map;
import java.util.SplittableRandom;
import settle.datasets.Dataset;
import settle.engine.model.Activation;
import settle.engine.model.Mlp;
import settle.engine.model.Model;
import settle.engine.model.SoftmaxRegression;
import settle.engine.schedule.Schedule;
import settle.engine.schedule.Schedules;
import settle.engine.train.Sampling;
import settle.engine.train.Trainer;
import settle.engine.train.TrainingSettings;

/**
 * The four workloads of the speed comparison: the shapes, batch sizes, rows and epochs both sides train with.
 *
 * <p>Data are synthetic and the same on both sides: features N(0, 1), labels the arg-max of the features times a
 * random teacher matrix plus N(0, 1) noise per class (so the problem is learnable but not separable). Both sides
 * shuffle every epoch, use the rate α_e = rate / (1 + 0.5·e) in epoch e = 1, 2, …, λ = 0, and evaluate the
 * full-batch training objective at the start and after every epoch (settle's training semantics require it).
 *
 * @param key the name used on the command line and by the peer script
 * @param inputs d
 * @param hidden the hidden layer sizes, empty for multinomial logistic regression
 * @param classes K
 * @param batch B
 * @param rows N
 * @param epochs passes
 * @param rate the schedule's initial rate
 */
public record Workload(String key, int inputs, int[] hidden, int classes, int batch, int rows, int epochs, double rate) {

    /** The four workloads of the issue, in its order. */
    public static final List<Workload> ALL = List.of(
            new Workload("logistic-b64", 50, new int[0], 10, 64, 8192, 16, 0.1),
            new Workload("logistic-b1024", 50, new int[0], 10, 1024, 16384, 32, 0.1),
            new Workload("mlp-64-128-10-b64", 64, new int[] {128}, 10, 64, 8192, 8, 0.05),
            new Workload("mlp-784-256-10-b256", 784, new int[] {256}, 10, 256, 4096, 6, 0.05));

    /** @return the workload of that key */
    public static Workload of(String key) {
        for (Workload w : ALL) {
            if (w.key.equals(key)) {
                return w;
            }
        }
        throw new IllegalArgumentException("unknown workload '" + key + "'; expected one of "
                + ALL.stream().map(Workload::key).toList());
    }

    /** @return the same workload with another number of rows */
    public Workload withRows(int value) {
        return new Workload(key, inputs, hidden, classes, batch, value, epochs, rate);
    }

    /** @return the same workload with another number of epochs */
    public Workload withEpochs(int value) {
        return new Workload(key, inputs, hidden, classes, batch, rows, value, rate);
    }

    /** @return a one-line description of the shape */
    public String describe() {
        String shape = hidden.length == 0 ? "multinomial logistic d=" + inputs + ", " + classes + " classes"
                : "MLP " + inputs + "-" + Arrays.toString(hidden).replaceAll("[\\[\\] ]", "").replace(',', '-') + "-"
                        + classes + " ReLU";
        return shape + ", batch " + batch;
    }

    /** @return the model, λ = 0 */
    public Model model() {
        return hidden.length == 0 ? new SoftmaxRegression(inputs, classes, 0.0)
                : new Mlp(inputs, hidden, Activation.RELU, classes, 0.0);
    }

    /** @return updates per epoch, ⌈N/B⌉ */
    public int updatesPerEpoch() {
        return (rows + batch - 1) / batch;
    }

    /** @return examples trained over the whole run (every batch is full when B divides N) */
    public long examples() {
        return (long) epochs * rows;
    }

    /**
     * @return floating-point operations of needed work per example trained: 4 × the first layer's weights + 6 ×
     *     every other layer's weights (forward, weight gradient, and for later layers the back-propagated delta)
     */
    public long flopsPerExample() {
        long flops = 0;
        int previous = inputs;
        int[] widths = Arrays.copyOf(hidden, hidden.length + 1);
        widths[hidden.length] = classes;
        for (int l = 0; l < widths.length; l++) {
            long weights = (long) previous * widths[l];
            flops += (l == 0 ? 4 : 6) * weights;
            previous = widths[l];
        }
        return flops;
    }

    /** @return the synthetic data set, a function of the seed alone */
    public Dataset data(long seed) {
        SplittableRandom random = new SplittableRandom(seed);
        double[] teacher = new double[inputs * classes];
        for (int i = 0; i < teacher.length; i++) {
            teacher[i] = gaussian(random) / Math.sqrt(inputs);
        }
        double[] x = new double[rows * inputs];
        int[] y = new int[rows];
        double[] score = new double[classes];
        for (int r = 0; r < rows; r++) {
            for (int j = 0; j < inputs; j++) {
                x[r * inputs + j] = gaussian(random);
            }
            int best = 0;
            for (int k = 0; k < classes; k++) {
                double s = gaussian(random);
                for (int j = 0; j < inputs; j++) {
                    s += x[r * inputs + j] * teacher[j * classes + k];
                }
                score[k] = s;
                if (s > score[best]) {
                    best = k;
                }
            }
            y[r] = best;
        }
        List<String> features = new ArrayList<>();
        for (int j = 0; j < inputs; j++) {
            features.add("x" + j);
        }
        List<String> names = new ArrayList<>();
        for (int k = 0; k < classes; k++) {
            names.add("c" + k);
        }
        return new Dataset(key + " synthetic (seed " + seed + ")", x, y, features, names);
    }

    private static double gaussian(SplittableRandom random) {
        // Box–Muller (common practice); one of the pair is enough here
        double u = 1.0 - random.nextDouble();
        double v = random.nextDouble();
        return Math.sqrt(-2.0 * Math.log(u)) * Math.cos(2.0 * Math.PI * v);
    }

    /** @return settle's schedule: reciprocal per epoch, α_e = rate / (1 + 0.5·e) */
    public Schedule schedule() {
        return Schedules.parse(Map.of("kind", "reciprocal", "rate", rate, "decay", 0.5, "per", "epoch"));
    }

    /** @return shuffle, no momentum, tail 0.1 with one snapshot (at the last update, an epoch end) */
    public TrainingSettings settings() {
        return new TrainingSettings(epochs, batch, Sampling.SHUFFLE, 0.0, 0.1, 1, false);
    }

    /** @return a trainer of this workload on {@code data} */
    public Trainer trainer(Dataset data) {
        return Trainer.builder(model(), data, schedule(), settings()).build();
    }

    /**
     * Writes the data for the peer: {@code <key>.x} (N·d float64, little-endian, row-major) and {@code <key>.y}
     * (N int32, little-endian).
     */
    public void write(Dataset data, Path dir) throws IOException {
        PeerFiles.writeDoubles(dir.resolve(key + ".x"), data.featureMatrix());
        PeerFiles.writeInts(dir.resolve(key + ".y"), data.labels());
    }
}
