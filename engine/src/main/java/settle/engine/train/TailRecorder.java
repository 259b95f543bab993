package settle.engine.train;

import java.util.Arrays;

/**
 * The online tail statistics of one replicate, O(P) memory beyond the optional stored snapshots: θ̄, the mean of
 * every tail iterate (Welford: m ← m + (θ − m)/n), and over the K snapshots their mean and summed squared
 * deviations per coordinate (Welford), their objectives and their summed squared distance to θ*. Allocates
 * nothing after construction.
 */
final class TailRecorder {

    private final TailPlan plan;
    private final int p;
    private final double[] reference;
    private final double[] tailMean;
    private final double[] snapshotMean;
    private final double[] snapshotM2;
    private final double[] objectives;
    private final double[] stored;
    private final long[] updates;
    private long tailCount;
    private int snapshotCount;
    private double distanceSquaredSum;

    /**
     * @param reference θ* (gauge-free), or null; not modified
     * @param storeLimit snapshots are stored while K·P ≤ this
     */
    TailRecorder(TailPlan plan, int parameters, double[] reference, long storeLimit) {
        this.plan = plan;
        this.p = parameters;
        this.reference = reference;
        this.tailMean = new double[p];
        this.snapshotMean = new double[p];
        this.snapshotM2 = new double[p];
        this.objectives = new double[plan.snapshots()];
        this.updates = plan.snapshotUpdates();
        this.stored = (long) plan.snapshots() * p <= storeLimit ? new double[plan.snapshots() * p] : null;
    }

    /** @return true when update {@code t} belongs to the tail */
    boolean inTail(long t) {
        return t >= plan.firstUpdate();
    }

    /** @return true when a snapshot is due after update {@code t} */
    boolean snapshotDue(long t) {
        return snapshotCount < updates.length && t == updates[snapshotCount];
    }

    /** Adds a tail iterate to θ̄. @param theta the raw iterate; not modified */
    void addIterate(double[] theta) {
        tailCount++;
        double inverse = 1.0 / tailCount;
        for (int i = 0; i < p; i++) {
            tailMean[i] += (theta[i] - tailMean[i]) * inverse;
        }
    }

    /**
     * Records the next snapshot.
     *
     * @param gaugeFree the iterate projected onto the gauge-free subspace; not modified
     * @param objective F at the iterate, or NaN when it is evaluated later ({@link #setObjective})
     */
    void addSnapshot(double[] gaugeFree, double objective) {
        if (snapshotCount == objectives.length) {
            throw new IllegalStateException("all " + objectives.length + " snapshots are already taken");
        }
        int index = snapshotCount++;
        objectives[index] = objective;
        if (stored != null) {
            System.arraycopy(gaugeFree, 0, stored, index * p, p);
        }
        double inverse = 1.0 / snapshotCount;
        for (int i = 0; i < p; i++) {
            double delta = gaugeFree[i] - snapshotMean[i];
            snapshotMean[i] += delta * inverse;
            snapshotM2[i] += delta * (gaugeFree[i] - snapshotMean[i]);
        }
        if (reference != null) {
            double sum = 0;
            for (int i = 0; i < p; i++) {
                double delta = gaugeFree[i] - reference[i];
                sum += delta * delta;
            }
            distanceSquaredSum += sum;
        }
    }

    /** Sets F at snapshot {@code index} when it was recorded as not yet known (NaN) by {@link #addSnapshot}. */
    void setObjective(int index, double objective) {
        objectives[index] = objective;
    }

    /** @return the number of tail iterates averaged so far */
    long tailCount() {
        return tailCount;
    }

    /** @return the number of snapshots taken so far */
    int snapshotCount() {
        return snapshotCount;
    }

    /** @return θ̄, the live buffer; do not modify */
    double[] tailMean() {
        return tailMean;
    }

    /** @return the snapshot objectives, the live buffer; do not modify */
    double[] objectives() {
        return objectives;
    }

    /** @return the stored snapshots (K × P row-major, live buffer), or null beyond the limit */
    double[] stored() {
        return stored;
    }

    /** @return θ̄_K, the snapshot mean, into {@code out}; modified */
    double[] snapshotMean(double[] out) {
        if (stored == null) {
            System.arraycopy(snapshotMean, 0, out, 0, p);
            return out;
        }
        Arrays.fill(out, 0.0);
        for (int s = 0; s < snapshotCount; s++) {
            for (int i = 0; i < p; i++) {
                out[i] += stored[s * p + i];
            }
        }
        for (int i = 0; i < p; i++) {
            out[i] /= snapshotCount;
        }
        return out;
    }

    /**
     * sqrt((1/K) Σ‖θ_(k) − θ̄_K‖²): two passes over the stored snapshots when they are kept, else the Welford sums.
     *
     * @param scratch P values of scratch; modified
     */
    double radius(double[] scratch) {
        double sum = 0;
        if (stored != null) {
            snapshotMean(scratch);
            for (int s = 0; s < snapshotCount; s++) {
                for (int i = 0; i < p; i++) {
                    double delta = stored[s * p + i] - scratch[i];
                    sum += delta * delta;
                }
            }
        } else {
            for (int i = 0; i < p; i++) {
                sum += snapshotM2[i];
            }
        }
        return Math.sqrt(sum / snapshotCount);
    }

    /** @return sqrt((1/K) Σ‖θ_(k) − θ*‖²), NaN without a reference */
    double distance() {
        return reference == null ? Double.NaN : Math.sqrt(distanceSquaredSum / snapshotCount);
    }

    /** @return the standard deviation (divisor K) of the snapshot objectives, two passes */
    double lossSpread() {
        double mean = 0;
        for (int s = 0; s < snapshotCount; s++) {
            mean += objectives[s];
        }
        mean /= snapshotCount;
        double sum = 0;
        for (int s = 0; s < snapshotCount; s++) {
            double delta = objectives[s] - mean;
            sum += delta * delta;
        }
        return Math.sqrt(sum / snapshotCount);
    }
}
