package settle.engine.train;

import java.util.function.Consumer;

/**
 * The online tail statistics of one replicate (DESIGN.md "Wander metrics"), fed every tail iterate in order:
 * <ul>
 *   <li>θ̄, the mean of the raw tail iterates (Welford: m ← m + (θ − m)/n), the final iterate of an averaged arm;</li>
 *   <li>over every tail iterate x_t (gauge-free), its own mean x̄, Σ‖x_t − x̄‖² and Σ‖x_t − θ*‖²: the tail radius
 *       sqrt((1/L) Σ‖x_t − x̄‖²) and the tail distance sqrt((1/L) Σ‖x_t − θ*‖²);</li>
 *   <li>the same over the tail's epoch ends, with their own mean and divisor (their count);</li>
 *   <li>the K snapshots: their objectives and, while K·P is within the store limit, the gauge-free iterates.</li>
 * </ul>
 * The gauge projection is linear, so x̄ is the projection of θ̄; without a gauge x_t = θ_t and x̄ is θ̄ itself (one
 * buffer, no copy). Each tail update costs O(P) and allocates nothing; the result depends on the iterates alone,
 * not on K.
 */
final class TailRecorder {

    private final TailPlan plan;
    private final int p;
    private final Consumer<double[]> gauge;
    private final double[] gaugeFree;
    private final double[] rawMean;
    private final Moments everyIterate;
    private final Moments epochEnds;
    private final double[] objectives;
    private final double[] stored;
    private final long[] updates;
    private long lastUpdate;
    private int snapshotCount;

    /**
     * @param reference θ* (gauge-free), or null; not modified
     * @param gauge projects an iterate in place onto the gauge-free subspace, or null when the model has no gauge
     * @param storeLimit snapshots are stored while K·P ≤ this
     */
    TailRecorder(TailPlan plan, int parameters, double[] reference, Consumer<double[]> gauge, long storeLimit) {
        this.plan = plan;
        this.p = parameters;
        this.gauge = gauge;
        this.gaugeFree = gauge == null ? null : new double[p];
        this.everyIterate = new Moments(p, reference);
        this.epochEnds = new Moments(p, reference);
        this.rawMean = gauge == null ? everyIterate.mean : new double[p];
        this.objectives = new double[plan.snapshots()];
        this.updates = plan.snapshotUpdates();
        this.stored = (long) plan.snapshots() * p <= storeLimit ? new double[plan.snapshots() * p] : null;
        this.lastUpdate = plan.firstUpdate() - 1;
    }

    /** @return true when update {@code t} belongs to the tail */
    boolean inTail(long t) {
        return t >= plan.firstUpdate();
    }

    /**
     * Adds the iterate after tail update {@code t}, which must follow the last one added (the first is T − L + 1).
     *
     * @param theta the raw iterate; not modified
     */
    void addIterate(long t, double[] theta) {
        if (t != lastUpdate + 1 || t > plan.totalUpdates()) {
            throw new IllegalStateException("tail update " + t + " after " + lastUpdate + " (tail "
                    + plan.firstUpdate() + ".." + plan.totalUpdates() + ")");
        }
        lastUpdate = t;
        double[] x = theta;
        if (gauge != null) {
            long n = everyIterate.count + 1;
            double inverse = 1.0 / n;
            for (int i = 0; i < p; i++) {
                rawMean[i] += (theta[i] - rawMean[i]) * inverse;
            }
            System.arraycopy(theta, 0, gaugeFree, 0, p);
            gauge.accept(gaugeFree);
            x = gaugeFree;
        }
        everyIterate.add(x);
        if (plan.epochEnd(t)) {
            epochEnds.add(x);
        }
    }

    /** @return true when a snapshot is due after update {@code t} */
    boolean snapshotDue(long t) {
        return snapshotCount < updates.length && t == updates[snapshotCount];
    }

    /**
     * Records the next snapshot: the iterate last given to {@link #addIterate}, at whose update it must be due.
     *
     * @param theta that raw iterate; not modified
     * @param objective F at the iterate, or NaN when it is evaluated later ({@link #setObjective})
     */
    void addSnapshot(double[] theta, double objective) {
        if (!snapshotDue(lastUpdate)) {
            throw new IllegalStateException("no snapshot is due after update " + lastUpdate);
        }
        int index = snapshotCount++;
        objectives[index] = objective;
        if (stored != null) {
            System.arraycopy(gauge == null ? theta : gaugeFree, 0, stored, index * p, p);
        }
    }

    /** Sets F at snapshot {@code index} when it was recorded as not yet known (NaN) by {@link #addSnapshot}. */
    void setObjective(int index, double objective) {
        objectives[index] = objective;
    }

    /** @return the number of tail iterates added so far */
    long tailCount() {
        return everyIterate.count;
    }

    /** @return the number of tail epoch ends added so far */
    long epochEndCount() {
        return epochEnds.count;
    }

    /** @return the number of snapshots taken so far */
    int snapshotCount() {
        return snapshotCount;
    }

    /** @return the update of every planned snapshot, the live buffer; do not modify */
    long[] snapshotUpdates() {
        return updates;
    }

    /** @return θ̄, the mean of the raw tail iterates, the live buffer; do not modify */
    double[] tailMean() {
        return rawMean;
    }

    /** @return the snapshot objectives, the live buffer; do not modify */
    double[] objectives() {
        return objectives;
    }

    /** @return the stored gauge-free snapshots (K × P row-major, live buffer), or null beyond the limit */
    double[] stored() {
        return stored;
    }

    /** @return sqrt((1/L) Σ‖x_t − x̄‖²) over every tail iterate added */
    double radius() {
        return everyIterate.radius();
    }

    /** @return sqrt((1/L) Σ‖x_t − θ*‖²) over every tail iterate added, NaN without a reference */
    double distance() {
        return everyIterate.distance();
    }

    /** @return the radius over the tail's epoch ends about their own mean (0 for one epoch end) */
    double epochEndRadius() {
        return epochEnds.radius();
    }

    /** @return sqrt((1/E) Σ‖x_e − θ*‖²) over the tail's E epoch ends, NaN without a reference */
    double epochEndDistance() {
        return epochEnds.distance();
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

    /**
     * Running moments of a sequence of P-vectors x_1 … x_n (Welford, per coordinate, summed over coordinates):
     * with δ = x − m_{n−1}, m_n = m_{n−1} + δ/n and S_n = S_{n−1} + Σ_i δ_i (x_i − m_{n,i}), so S_n = Σ‖x_k − m_n‖²
     * without the cancellation of Σ‖x‖² − n‖m‖²; and D_n = Σ‖x_k − θ*‖², each term taken directly.
     */
    private static final class Moments {
        private final double[] mean;
        private final double[] reference;
        private long count;
        private double squaredDeviations;
        private double squaredDistances;

        /** @param reference θ*, or null (no distance: {@link #distance} is NaN) */
        Moments(int parameters, double[] reference) {
            this.mean = new double[parameters];
            this.reference = reference;
        }

        /** Adds x; not modified. */
        void add(double[] x) {
            count++;
            double inverse = 1.0 / count;
            double deviations = 0;
            double distances = 0;
            double[] star = reference == null ? mean : reference; // without θ* the distance sum goes unused
            for (int i = 0; i < mean.length; i++) {
                double delta = x[i] - mean[i];
                double offset = x[i] - star[i];
                mean[i] += delta * inverse;
                deviations += delta * (x[i] - mean[i]);
                distances += offset * offset;
            }
            squaredDeviations += deviations;
            squaredDistances += distances;
        }

        /** @return sqrt(S_n / n) */
        double radius() {
            return Math.sqrt(squaredDeviations / count);
        }

        /** @return sqrt(D_n / n), NaN without a reference */
        double distance() {
            return reference == null ? Double.NaN : Math.sqrt(squaredDistances / count);
        }
    }
}
