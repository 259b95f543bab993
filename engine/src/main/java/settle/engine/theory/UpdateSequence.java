package settle.engine.theory;

/**
 * The updates of one replicate as the theory needs them: the actual rate of every update, the size of
 * every batch (the short last batch of a reshuffled epoch has its own size), and where epochs end.
 *
 * @param rates α_t for update t = 1 … T (index t − 1); finite, ≥ 0. Copied.
 * @param batches B_t for every update, ≥ 1. Copied.
 * @param epochEnds the number of updates done at the end of epoch 1, 2, …: strictly increasing, the
 *     last ≤ T (a run cut short has no entry for its unfinished epoch). Copied.
 * @param sampling how batches were drawn; under {@code shuffle} the batches of one epoch draw at most N examples
 * @param momentum heavy-ball β in [0, 1) (0: plain SGD)
 */
public record UpdateSequence(double[] rates, int[] batches, int[] epochEnds, BatchSampling sampling, double momentum) {

    public UpdateSequence {
        if (sampling == null) {
            throw new IllegalArgumentException("the sampling mode must be given");
        }
        if (!(momentum >= 0.0 && momentum < 1.0)) {
            throw new IllegalArgumentException("momentum β must be in [0, 1): " + momentum);
        }
        if (rates.length != batches.length) {
            throw new IllegalArgumentException(rates.length + " rates but " + batches.length + " batch sizes");
        }
        rates = rates.clone();
        batches = batches.clone();
        epochEnds = epochEnds.clone();
        for (int t = 0; t < rates.length; t++) {
            if (!(rates[t] >= 0.0) || !Double.isFinite(rates[t])) {
                throw new IllegalArgumentException("the rate of update " + (t + 1) + " must be a finite number ≥ 0: "
                        + rates[t]);
            }
            if (batches[t] < 1) {
                throw new IllegalArgumentException("the batch of update " + (t + 1) + " must hold at least one"
                        + " example: " + batches[t]);
            }
        }
        int previous = 0;
        for (int e = 0; e < epochEnds.length; e++) {
            if (epochEnds[e] <= previous || epochEnds[e] > rates.length) {
                throw new IllegalArgumentException("epoch " + (e + 1) + " ends at update " + epochEnds[e]
                        + ": epoch ends must increase strictly and stay within the " + rates.length + " updates");
            }
            previous = epochEnds[e];
        }
    }

    /** A sequence without momentum. */
    public UpdateSequence(double[] rates, int[] batches, int[] epochEnds, BatchSampling sampling) {
        this(rates, batches, epochEnds, sampling, 0.0);
    }

    /** As {@link #of(double[], int, int, BatchSampling, double)} without momentum. */
    public static UpdateSequence of(double[] rates, int examples, int batch, BatchSampling sampling) {
        return of(rates, examples, batch, sampling, 0.0);
    }

    /**
     * The sequence of a run as DESIGN.md's training semantics define it: ⌈N/B⌉ updates per epoch; with
     * replacement every batch has B examples, with reshuffling the last batch of an epoch has
     * N − (⌈N/B⌉ − 1)·B.
     *
     * @param rates the actual rate of every update; a run cut short may end inside an epoch. Not modified.
     * @param examples N
     * @param batch B, 1 ≤ B ≤ N
     * @param sampling how batches were drawn
     * @param momentum heavy-ball β in [0, 1)
     * @return the sequence
     */
    public static UpdateSequence of(double[] rates, int examples, int batch, BatchSampling sampling, double momentum) {
        int[] epoch = epochBatches(examples, batch);
        int perEpoch = epoch.length;
        int[] batches = new int[rates.length];
        for (int t = 0; t < rates.length; t++) {
            batches[t] = sampling == BatchSampling.SHUFFLE ? epoch[t % perEpoch] : batch;
        }
        int[] ends = new int[rates.length / perEpoch];
        for (int e = 0; e < ends.length; e++) {
            ends[e] = (e + 1) * perEpoch;
        }
        return new UpdateSequence(rates, batches, ends, sampling, momentum);
    }

    /**
     * @param examples N
     * @param batch B, 1 ≤ B ≤ N
     * @return the batch sizes of one reshuffled epoch: ⌈N/B⌉ batches of B, the last N − (⌈N/B⌉ − 1)·B
     */
    public static int[] epochBatches(int examples, int batch) {
        if (examples < 1 || batch < 1 || batch > examples) {
            throw new IllegalArgumentException("batch size must be in [1, " + examples + "]: " + batch);
        }
        int perEpoch = (examples + batch - 1) / batch;
        int[] sizes = new int[perEpoch];
        java.util.Arrays.fill(sizes, batch);
        sizes[perEpoch - 1] = examples - (perEpoch - 1) * batch;
        return sizes;
    }

    /** @return T, the number of updates */
    public int length() {
        return rates.length;
    }

    /** @return a copy of the rates */
    @Override
    public double[] rates() {
        return rates.clone();
    }

    /** @return a copy of the batch sizes */
    @Override
    public int[] batches() {
        return batches.clone();
    }

    /** @return a copy of the epoch ends */
    @Override
    public int[] epochEnds() {
        return epochEnds.clone();
    }

    double rate(int t) {
        return rates[t];
    }

    int batch(int t) {
        return batches[t];
    }

    int epochEnd(int e) {
        return epochEnds[e];
    }

    int epochs() {
        return epochEnds.length;
    }
}
