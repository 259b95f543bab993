package settle.engine.model;

import java.util.random.RandomGenerator;

/**
 * A classifier whose parameters θ are one flat {@code double[]} (layers and biases are views by offset; the
 * order is the one DESIGN.md fixes and {@code final.csv} / {@code reference.json} use).
 *
 * <p>The training objective is F(θ) = (1/N) Σ loss_i(θ) + (λ/2)‖weights‖², with loss_i the cross-entropy of
 * example i and biases unpenalised. Batches arrive row-major ({@code n × inputs()}) in caller-owned buffers;
 * every method writes only into the buffers it is given and the {@link Workspace}, and allocates nothing.
 * A model object holds no per-run state, so one instance serves any number of threads, each with its own
 * workspace.
 */
public interface Model {

    /** @return d, the number of input features */
    int inputs();

    /** @return K, the number of classes (2 for the sigmoid form) */
    int classes();

    /** @return P, the length of θ */
    int parameterCount();

    /** @return λ, the L2 penalty on weights */
    double l2();

    /** @return true when F is convex in θ (logistic models) */
    boolean convex();

    /** @return true when θ[index] is a weight (penalised), false for a bias */
    boolean penalised(int index);

    /** @return a one-line description, e.g. "multinomial logistic regression, 4 features, 3 classes" */
    String describe();

    /** @return scratch buffers for batches of up to {@code maxBatch} rows, owned by one thread */
    Workspace workspace(int maxBatch);

    /**
     * Adds the sum over the batch of the per-example cross-entropy gradients into {@code gradientSum} and
     * returns the sum of the per-example cross-entropies (no penalty in either).
     *
     * @param theta parameters; not modified
     * @param x row-major batch, {@code n × inputs()}; not modified
     * @param y labels of the batch in 0..K−1; not modified
     * @param n rows in the batch, at most the workspace's capacity
     * @param gradientSum accumulator of length P; modified (added to)
     * @param workspace scratch; modified
     */
    double addGradientSum(double[] theta, double[] x, int[] y, int n, double[] gradientSum, Workspace workspace);

    /** @return the sum over the batch of the per-example cross-entropies (no penalty); arguments as above */
    double lossSum(double[] theta, double[] x, int[] y, int n, Workspace workspace);

    /**
     * Class probabilities of each row.
     *
     * @param out receives {@code n × classes()} probabilities, row-major; modified
     */
    void probabilities(double[] theta, double[] x, int n, double[] out, Workspace workspace);

    /**
     * Fills θ with a starting point.
     *
     * @param theta receives P values; modified
     * @param rng the replicate's initialisation stream; advanced
     */
    void initialise(double[] theta, Initialisation init, RandomGenerator rng);

    /** @return (λ/2) Σ over weights of θ² */
    default double penalty(double[] theta) {
        double sum = 0;
        for (int i = 0; i < theta.length; i++) {
            if (penalised(i)) {
                sum += theta[i] * theta[i];
            }
        }
        return 0.5 * l2() * sum;
    }

    /**
     * The mini-batch objective and its gradient: mean cross-entropy over the batch + (λ/2)‖weights‖²,
     * and its gradient (the mean per-example gradient + λ·weights) written into {@code gradient}.
     *
     * @param gradient receives P values (overwritten); modified
     * @return the batch objective
     */
    default double batchObjective(double[] theta, double[] x, int[] y, int n, double[] gradient, Workspace workspace) {
        java.util.Arrays.fill(gradient, 0.0);
        double lossSum = addGradientSum(theta, x, y, n, gradient, workspace);
        return batchMean(theta, lossSum, n, gradient);
    }

    /**
     * The last step of {@link #batchObjective}: from the batch's sums to its means plus the penalty.
     *
     * @param lossSum the sum of the batch's per-example cross-entropies
     * @param gradient the sum of their gradients on entry, the batch gradient on return; modified
     * @return the batch objective
     */
    default double batchMean(double[] theta, double lossSum, int n, double[] gradient) {
        double inverse = 1.0 / n;
        double lambda = l2();
        for (int i = 0; i < gradient.length; i++) {
            gradient[i] *= inverse;
            if (penalised(i)) {
                gradient[i] += lambda * theta[i];
            }
        }
        return lossSum * inverse + penalty(theta);
    }

    /**
     * {@link #lossSum} of several parameter vectors on one batch, each added to its sum: {@code sums[s] +=
     * lossSum(thetas[s], …)} for s in [0, count), the same bits (a model that computes the vectors together keeps
     * every value's chain of operations). {@link FullBatch#objectives} evaluates its chunks this way.
     *
     * @param thetas the parameter vectors, {@code count} of them from index 0; not modified
     * @param sums added to, from index 0; modified
     * @param workspace from {@link #workspace(int, int)}; modified
     */
    default void addLossSums(double[][] thetas, int count, double[] x, int[] y, int n, double[] sums,
            Workspace workspace) {
        for (int s = 0; s < count; s++) {
            sums[s] += lossSum(thetas[s], x, y, n, workspace);
        }
    }

    /**
     * {@link #batchObjective} of several parameter vectors on one batch (the arms of one replicate, which share
     * their mini-batches). Each arm's objective and gradient are the same bits as {@link #batchObjective} gives it
     * alone: a model that computes the arms together keeps every output element's chain of operations, so the
     * result does not depend on how many arms share the batch.
     *
     * @param thetas the arms' parameters, {@code count} of them from index 0; not modified
     * @param gradients receive each arm's gradient (overwritten); modified
     * @param objectives receives each arm's batch objective from index 0; modified
     * @param workspace from {@link #workspace(int, int)} with room for {@code count} arms; modified
     */
    default void batchObjectives(double[][] thetas, int count, double[] x, int[] y, int n, double[][] gradients,
            double[] objectives, Workspace workspace) {
        for (int a = 0; a < count; a++) {
            objectives[a] = batchObjective(thetas[a], x, y, n, gradients[a], workspace);
        }
    }

    /** @return scratch buffers for batches of up to {@code maxBatch} rows and up to {@code arms} arms at once */
    default Workspace workspace(int maxBatch, int arms) {
        return workspace(maxBatch);
    }

    /**
     * Projects θ in place onto the gauge-free subspace: directions along which the objective is flat by
     * symmetry are removed (softmax: class biases centred, and class weights centred when λ = 0). The
     * identity for models without such a symmetry.
     *
     * @param theta modified
     */
    default void removeGauge(double[] theta) {
    }

    /**
     * Whether {@link #removeGauge} can change a vector. False promises that it is the identity, so callers may
     * skip the copy and the projection; true (the default) is always safe.
     *
     * @return false only for a model whose {@link #removeGauge} is the identity
     */
    default boolean hasGauge() {
        return true;
    }

    /** Per-thread scratch buffers of a model; opaque to callers. */
    interface Workspace {
        /** @return the largest batch these buffers hold */
        int capacity();
    }
}
