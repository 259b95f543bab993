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
 * every update.
 *
 * <p>A sweep stops once F(θ_t) is not finite, or is above F(θ₀) after the sweep had made a real fall: the sweep has
 * then undone all the progress it made, and larger rates will not make any. A real fall is at least
 * {@link #REAL_FALL} of the fall possible, F(θ₀) − F_floor, with F_floor = F(θ*) where the minimum is known and 0
 * otherwise (every objective settle fits, a cross-entropy plus an L2 penalty, is non-negative). Before that the
 * rates are tiny and a few mini-batch steps can raise the objective by chance (seen with batches of one row). It also stops before the first rate at or above a given ceiling (the
 * stability bound 2(1 + β)/λmax(H) of a convex model): no rate from there on may be suggested, so none is tried.
 * An L2-logistic loss has a bounded gradient and may never climb back to F(θ₀); its sweep then runs to the ceiling
 * or the top. What the sweep suggests is {@link RangeRule}'s.
 *
 * <p>The idea of sweeping the rate upward over one short run is L. N. Smith's learning-rate range test
 * ("Cyclical Learning Rates for Training Neural Networks", WACV 2017; from memory), which grows the rate linearly
 * over a few epochs; the geometric ramp, the stops and the reading are settle's own. Updates are the trainer's own
 * ({@link MiniBatchStep}); the loop allocates nothing.
 */
public final class RangeTest {

    /** The fraction of the possible fall F(θ₀) − F_floor after which a rise above F(θ₀) ends the sweep. */
    public static final double REAL_FALL = 0.1;

    /** Why a sweep ended. */
    public enum End {
        /** it ran every update up to {@code to} */
        TOP,
        /** F(θ_t) rose above F(θ₀) after a real fall */
        ABOVE_START,
        /** F(θ_t) was not finite */
        NOT_FINITE,
        /** the next rate was at or above the ceiling (the stability bound) */
        CEILING
    }

    /**
     * One sweep.
     *
     * @param rates α_t of each update run, in order
     * @param objectives F(θ_t) after each update run
     * @param initialObjective F(θ₀)
     * @param end why it ended: with {@link End#ABOVE_START} or {@link End#NOT_FINITE} the last update is the one
     *     that stopped it
     */
    public record Sweep(double[] rates, double[] objectives, double initialObjective, End end) {

        /** @return settle's reading of this sweep ({@link RangeRule}) */
        public RangeRule.Range range() {
            return RangeRule.of(rates, objectives, initialObjective);
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

    /**
     * Runs one sweep from replicate {@code seeds}' initial weights and mini-batch order.
     *
     * @param ceiling no update is run at a rate at or above it (NaN or ∞: no ceiling)
     * @param floor F_floor: F(θ*) when known, else 0
     */
    public Sweep run(ReplicateSeeds seeds, double ceiling, double floor) {
        if (!Double.isFinite(floor)) {
            throw new IllegalArgumentException("the floor of the objective must be finite, got " + floor);
        }
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
        double real = REAL_FALL * (f0 - floor);
        End end = End.TOP;
        boolean fell = false;
        int run = 0;
        for (int t = 1; t <= updates; t++) {
            int u = (t - 1) % perEpoch;
            if (u == 0) {
                SampleOrders.fill(seeds, sampling, n, (t - 1) / perEpoch + 1, order);
            }
            int start = u * batch;
            int rows = Math.min(batch, order.length - start);
            double rate = rate(t);
            if (rate >= ceiling) {
                end = End.CEILING;
                break;
            }
            step.load(theta, order, start, rows);
            step.apply(theta, rate);
            double f = full.objective(theta);
            rates[run] = rate;
            objectives[run] = f;
            run++;
            if (!Double.isFinite(f)) {
                end = End.NOT_FINITE;
                break;
            }
            if (f > f0 && fell) {
                end = End.ABOVE_START;
                break;
            }
            fell |= f0 - f >= real;
        }
        return new Sweep(Arrays.copyOf(rates, run), Arrays.copyOf(objectives, run), f0, end);
    }
}
