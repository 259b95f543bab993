package settle.engine.probe;

import java.util.Arrays;
import java.util.Objects;
import settle.datasets.Dataset;
import settle.engine.model.FullBatch;
import settle.engine.model.Initialisation;
import settle.engine.model.Model;
import settle.engine.train.MiniBatchStep;
import settle.engine.train.ReplicateSeeds;
import settle.engine.train.SampleOrders;
import settle.engine.train.Sampling;
import settle.engine.train.TrainingSettings;

/**
 * A learning-rate range test: mini-batch SGD from a replicate's initial weights, over its mini-batch order,
 * with the rate grown geometrically from {@code from} to {@code to} over {@code updates} updates
 * (α_t = from · (to/from)^((t−1)/(updates−1))), recording the full-batch training objective F(θ_t) after
 * every update. A sweep stops early once F(θ_t) is not finite or exceeds {@link #BLOW_UP} × the lowest value
 * seen so far (F(θ₀) included): the rate has become too large. An L2-logistic loss has a bounded gradient and
 * may never blow up; its sweep then runs to the top.
 *
 * <p>The test is Smith's ("Cyclical Learning Rates for Training Neural Networks", WACV 2017, §3.3, which grows
 * the rate linearly over a few epochs); the geometric ramp and the stop at a multiple of the best loss are
 * common practice. Updates are the trainer's own ({@link MiniBatchStep}); the loop allocates nothing.
 */
public final class RangeTest {

    /** The sweep stops once the objective exceeds this multiple of its lowest value so far. */
    public static final double BLOW_UP = 4.0;

    /**
     * One sweep.
     *
     * @param rates α_t of each update run, in order
     * @param objectives F(θ_t) after each update run
     * @param initialObjective F(θ₀)
     * @param stopped whether the sweep stopped early (the last update's objective blew up or was not finite)
     */
    public record Sweep(double[] rates, double[] objectives, double initialObjective, boolean stopped) {

        /** @return the largest rate whose update left the objective within the blow-up limit */
        public double largestStableRate() {
            int stable = stopped ? rates.length - 1 : rates.length;
            return stable == 0 ? Double.NaN : rates[stable - 1];
        }
    }

    private final Model model;
    private final Dataset train;
    private final TrainingSettings settings;
    private final Initialisation initialisation;
    private final double from;
    private final double to;
    private final int updates;

    /**
     * @param settings batch, sampling and momentum are used (epochs, tail and snapshots are not)
     * @param initialisation how each sweep starts (as the plan's replicates do)
     * @param from the first rate, > 0
     * @param to the last rate, > from
     * @param updates the sweep's length, ≥ 2
     */
    public RangeTest(Model model, Dataset train, TrainingSettings settings, Initialisation initialisation,
            double from, double to, int updates) {
        this.model = Objects.requireNonNull(model, "model");
        this.train = Objects.requireNonNull(train, "train");
        this.settings = Objects.requireNonNull(settings, "settings");
        this.initialisation = Objects.requireNonNull(initialisation, "initialisation");
        if (!(from > 0) || !(to > from) || to == Double.POSITIVE_INFINITY) {
            throw new IllegalArgumentException("the sweep needs 0 < from < to < ∞, got from " + from + ", to " + to);
        }
        if (updates < 2) {
            throw new IllegalArgumentException("the sweep needs at least 2 updates, got " + updates);
        }
        this.from = from;
        this.to = to;
        this.updates = updates;
    }

    /** @return the rate of update t (1-based) */
    public double rate(int t) {
        return from * Math.pow(to / from, (t - 1) / (double) (updates - 1));
    }

    /** Runs one sweep from replicate {@code seeds}' initial weights and mini-batch order. */
    public Sweep run(ReplicateSeeds seeds) {
        int p = model.parameterCount();
        int n = train.rows();
        int batch = settings.batch();
        Sampling sampling = settings.sampling();
        int capacity = sampling == Sampling.SHUFFLE ? Math.min(batch, n) : batch;
        MiniBatchStep step = new MiniBatchStep(model, train, capacity, settings.momentum());
        FullBatch full = new FullBatch(model, train);
        double[] theta = new double[p];
        int[] order = new int[SampleOrders.length(sampling, n, batch)];
        int perEpoch = settings.updatesPerEpoch(n);
        double[] rates = new double[updates];
        double[] objectives = new double[updates];
        model.initialise(theta, initialisation, seeds.initialisationStream());
        double f0 = full.objective(theta);
        double best = f0;
        boolean stopped = false;
        int run = 0;
        for (int t = 1; t <= updates; t++) {
            int u = (t - 1) % perEpoch;
            if (u == 0) {
                SampleOrders.fill(seeds, sampling, n, (t - 1) / perEpoch + 1, order);
            }
            int start = u * batch;
            int rows = Math.min(batch, order.length - start);
            double rate = rate(t);
            step.load(theta, order, start, rows);
            step.apply(theta, rate);
            double f = full.objective(theta);
            rates[run] = rate;
            objectives[run] = f;
            run++;
            if (!Double.isFinite(f) || f > BLOW_UP * best) {
                stopped = true;
                break;
            }
            best = Math.min(best, f);
        }
        return new Sweep(Arrays.copyOf(rates, run), Arrays.copyOf(objectives, run), f0, stopped);
    }
}
