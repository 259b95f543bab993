package settle.engine.model;

import java.util.random.RandomGenerator;

/**
 * Multinomial logistic regression over K ≥ 3 classes: p(k | x) = softmax(W x + b)_k.
 *
 * <p>θ = (W_0 (d), W_1 (d), …, W_{K−1} (d), b_0 … b_{K−1}): class 0's d weights, class 1's, …, then the K
 * biases from index K·d. The per-example loss is the cross-entropy logsumexp(z) − z_y with z = W x + b,
 * the log-sum-exp taken after subtracting max z so that no exponential overflows.
 *
 * <p>The objective is invariant to adding one constant to every bias and, with λ = 0, one vector to every
 * class's weights; {@link #removeGauge} projects those directions out. (Two classes use
 * {@link BinaryLogistic}, the sigmoid form.)
 */
public final class SoftmaxRegression implements Model {

    private final int inputs;
    private final int classes;
    private final double l2;
    private final int biasOffset;
    private final int[] weightRanges;

    /**
     * @param inputs d, at least 1
     * @param classes K, at least 3
     * @param l2 λ ≥ 0, the penalty on the weights (not the biases)
     */
    public SoftmaxRegression(int inputs, int classes, double l2) {
        if (inputs < 1) {
            throw new IllegalArgumentException("multinomial logistic regression needs at least one input: " + inputs);
        }
        if (classes < 3) {
            throw new IllegalArgumentException("multinomial logistic regression needs at least 3 classes "
                    + "(2 classes use the sigmoid form): " + classes);
        }
        if (!(l2 >= 0) || Double.isInfinite(l2)) {
            throw new IllegalArgumentException("model.l2 must be ≥ 0 and finite: " + l2);
        }
        if ((long) (inputs + 1) * classes > Integer.MAX_VALUE - 8) {
            throw new IllegalArgumentException("too many parameters: " + inputs + " inputs × " + classes + " classes");
        }
        this.inputs = inputs;
        this.classes = classes;
        this.l2 = l2;
        this.biasOffset = inputs * classes;
        this.weightRanges = new int[] {0, biasOffset};
    }

    @Override
    public int inputs() {
        return inputs;
    }

    @Override
    public int classes() {
        return classes;
    }

    @Override
    public int parameterCount() {
        return biasOffset + classes;
    }

    @Override
    public double l2() {
        return l2;
    }

    @Override
    public boolean convex() {
        return true;
    }

    @Override
    public boolean penalised(int index) {
        return index < biasOffset;
    }

    @Override
    public String describe() {
        return "multinomial logistic regression, " + inputs + " features, " + classes + " classes";
    }

    @Override
    public Workspace workspace(int maxBatch) {
        return workspace(maxBatch, 1);
    }

    /**
     * The most parameter vectors one stacked product takes ({@link #batchObjectives}, {@link #addLossSums}): more
     * arms go in groups of this many, so a grid of thousands of arms does not make a workspace thousands of times
     * the batch's scores.
     */
    static final int MAX_STACK = 16;

    /**
     * Scratch for up to {@code arms} parameter vectors (at most {@link #MAX_STACK}) stacked into one product
     * ({@link #batchObjectives}, {@link #addLossSums}).
     */
    @Override
    public Workspace workspace(int maxBatch, int arms) {
        if (maxBatch < 1) {
            throw new IllegalArgumentException("workspace capacity must be at least 1: " + maxBatch);
        }
        if (arms < 1) {
            throw new IllegalArgumentException("workspace arms must be at least 1: " + arms);
        }
        return new Scratch(maxBatch, Math.min(arms, MAX_STACK), inputs, classes);
    }

    /**
     * The batch's scores, then probabilities, then deltas (capacity × arms·K), and the soft-max's scratch of the
     * same size; each row's target score and log-sum-exp (capacity × arms); the products' packing buffer; and for
     * several arms at once their weights and biases side by side (arms·K rows of d, arms·K) and their gradient.
     */
    private static final class Scratch implements Workspace {
        private final int capacity;
        private final int arms;
        private final int inputs;
        private final int classes;
        private final double[] scores;
        private final double[] targets;
        private final double[] logSumExp;
        private final double[] exponents;
        private final double[] pack;
        private final double[] weights;
        private final double[] biases;
        private final double[] gradient;
        private final double[] sums;

        Scratch(int capacity, int arms, int inputs, int classes) {
            this.capacity = capacity;
            this.arms = arms;
            this.inputs = inputs;
            this.classes = classes;
            int width = Math.multiplyExact(arms, classes);
            this.scores = new double[Math.multiplyExact(capacity, width)];
            this.targets = new double[Math.multiplyExact(capacity, arms)];
            this.logSumExp = new double[targets.length];
            this.exponents = new double[scores.length];
            this.pack = new double[Kernels.packLength(capacity, width, inputs)];
            this.weights = arms == 1 ? null : new double[Math.multiplyExact(width, inputs)];
            this.biases = arms == 1 ? null : new double[width];
            this.gradient = arms == 1 ? null : new double[Math.multiplyExact(width, inputs + 1)];
            this.sums = new double[arms];
        }

        @Override
        public int capacity() {
            return capacity;
        }
    }

    private Scratch scratch(double[] theta, int n, Workspace workspace) {
        Starts.checkLength("θ", theta, parameterCount());
        if (!(workspace instanceof Scratch s) || s.classes != classes || s.inputs != inputs) {
            throw new IllegalArgumentException("workspace was not made by a " + classes
                    + "-class multinomial logistic model with " + inputs + " inputs");
        }
        Starts.checkRows(n, s.capacity);
        return s;
    }

    // Forward and backward, side by side. x is (n, d) row-major, W is (K, d) row-major at θ[0], b (K) at θ[K·d].
    // Forward:  Z = X Wᵀ + b (n, K),  per row the soft-max p and log-sum-exp (Softmax),  loss_r = lse_r − z_y.
    // Backward: Δ_rk = p_rk − [k = y_r],  ∂/∂W += Δᵀ X,  ∂/∂b += column sums of Δ.

    /**
     * Fills s.scores with Z = X Wᵀ + b for the n rows of x (one fused multiply-add chain per score), keeps each
     * row's target score, turns the scores into probabilities (when {@code probabilities}; otherwise only the
     * log-sum-exps are needed) and returns Σ_r (log-sum-exp_r − z_{r,y_r}).
     */
    private double forward(double[] theta, double[] x, int[] y, int n, Scratch s, boolean probabilities) {
        Kernels.multiplyByTransposed(x, 0, n, inputs, theta, 0, classes, theta, biasOffset, s.scores, 0, s.pack);
        double[] z = s.scores;
        for (int r = 0; r < n; r++) {
            s.targets[r] = z[r * classes + y[r]];
        }
        Softmax.probabilities(z, n, classes, s.logSumExp, s.exponents, probabilities);
        double sum = 0;
        for (int r = 0; r < n; r++) {
            sum += s.logSumExp[r] - s.targets[r];
        }
        return sum;
    }

    /**
     * {@link #forward} of {@code count} parameter vectors at once: their weights stacked as the rows of one W
     * (count·K × d) and their biases side by side, one product Z = X Wᵀ + b (n × count·K), in which row r of vector
     * c is the K scores from (r·count + c)·K, so the soft-max runs over n·count rows of K. Every score is the same
     * chain of fused multiply-adds as {@link #forward} computes for that vector alone (the kernels' exactness
     * contract: the width of a product never changes how one output is summed), every soft-max row the same
     * operations, and each vector's loss sum adds its rows in the same order, so each value is the same bits.
     *
     * @param sums receives vector c's Σ_r (log-sum-exp_r − z_{r,y_r}) at {@code sums[c]}; modified
     */
    private void forwardStacked(double[][] thetas, int from, int count, double[] x, int[] y, int n, Scratch s,
            boolean probabilities, double[] sums, int sumsOffset) {
        int width = count * classes;
        int weights = classes * inputs;
        for (int c = 0; c < count; c++) {
            double[] theta = thetas[from + c];
            Starts.checkLength("θ", theta, parameterCount());
            System.arraycopy(theta, 0, s.weights, c * weights, weights);
            System.arraycopy(theta, biasOffset, s.biases, c * classes, classes);
        }
        Kernels.multiplyByTransposed(x, 0, n, inputs, s.weights, 0, width, s.biases, 0, s.scores, 0, s.pack);
        double[] z = s.scores;
        for (int r = 0; r < n; r++) {
            int row = r * count;
            for (int c = 0; c < count; c++) {
                s.targets[row + c] = z[(row + c) * classes + y[r]];
            }
        }
        Softmax.probabilities(z, n * count, classes, s.logSumExp, s.exponents, probabilities);
        for (int c = 0; c < count; c++) {
            double sum = 0;
            for (int r = 0; r < n; r++) {
                sum += s.logSumExp[r * count + c] - s.targets[r * count + c];
            }
            sums[sumsOffset + c] = sum;
        }
    }

    @Override
    public double lossSum(double[] theta, double[] x, int[] y, int n, Workspace workspace) {
        return forward(theta, x, y, n, scratch(theta, n, workspace), false);
    }

    /** Stacks up to the workspace's arms vectors into one product ({@link #forwardStacked}); the same bits. */
    @Override
    public void addLossSums(double[][] thetas, int count, double[] x, int[] y, int n, double[] sums,
            Workspace workspace) {
        Scratch s = scratch(thetas[0], n, workspace);
        for (int from = 0; from < count; from += s.arms) {
            int group = Math.min(s.arms, count - from);
            if (group == 1) {
                sums[from] += forward(thetas[from], x, y, n, s, false);
                continue;
            }
            forwardStacked(thetas, from, group, x, y, n, s, false, s.sums, 0);
            for (int c = 0; c < group; c++) {
                sums[from + c] += s.sums[c];
            }
        }
    }

    @Override
    public double addGradientSum(double[] theta, double[] x, int[] y, int n, double[] gradientSum,
            Workspace workspace) {
        Scratch s = scratch(theta, n, workspace);
        Starts.checkLength("gradient", gradientSum, parameterCount());
        double sum = forward(theta, x, y, n, s, true);
        double[] z = s.scores;
        for (int r = 0; r < n; r++) {
            z[r * classes + y[r]] -= 1.0;
        }
        Kernels.addTransposedProduct(z, 0, n, classes, x, 0, inputs, gradientSum, 0, s.pack);
        Kernels.addColumnSums(z, n, classes, gradientSum, biasOffset);
        return sum;
    }

    @Override
    public double batchObjective(double[] theta, double[] x, int[] y, int n, double[] gradient, Workspace workspace) {
        java.util.Arrays.fill(gradient, 0.0);
        double lossSum = addGradientSum(theta, x, y, n, gradient, workspace);
        return Penalties.finishBatch(theta, gradient, weightRanges, lossSum, n, l2);
    }

    /**
     * The arms' batch objectives and gradients in one forward product ({@link #forwardStacked}) and one gradient
     * product G (count·K × d) = Δᵀ X over the arms' deltas side by side; each gradient element is the same chain
     * (rows ascending from 0) as {@link #addGradientSum} gives one arm alone, each bias gradient the same column
     * sum, so every arm's objective and gradient are the same bits as {@link #batchObjective}.
     */
    @Override
    public void batchObjectives(double[][] thetas, int count, double[] x, int[] y, int n, double[][] gradients,
            double[] objectives, Workspace workspace) {
        Scratch s = scratch(thetas[0], n, workspace);
        for (int from = 0; from < count; from += s.arms) {
            int group = Math.min(s.arms, count - from);
            if (group == 1) {
                objectives[from] = batchObjective(thetas[from], x, y, n, gradients[from], workspace);
            } else {
                batchObjectivesStacked(thetas, from, group, x, y, n, gradients, objectives, s);
            }
        }
    }

    private void batchObjectivesStacked(double[][] thetas, int from, int count, double[] x, int[] y, int n,
            double[][] gradients, double[] objectives, Scratch s) {
        int width = count * classes;
        int weights = classes * inputs;
        forwardStacked(thetas, from, count, x, y, n, s, true, objectives, from);
        double[] z = s.scores;
        for (int r = 0; r < n; r++) {
            int row = r * count;
            for (int c = 0; c < count; c++) {
                z[(row + c) * classes + y[r]] -= 1.0;
            }
        }
        int biases = width * inputs;
        java.util.Arrays.fill(s.gradient, 0, biases + width, 0.0);
        Kernels.addTransposedProduct(z, 0, n, width, x, 0, inputs, s.gradient, 0, s.pack);
        Kernels.addColumnSums(z, n, width, s.gradient, biases);
        for (int c = 0; c < count; c++) {
            double[] gradient = gradients[from + c];
            Starts.checkLength("gradient", gradient, parameterCount());
            System.arraycopy(s.gradient, c * weights, gradient, 0, weights);
            System.arraycopy(s.gradient, biases + c * classes, gradient, biasOffset, classes);
            objectives[from + c] = Penalties.finishBatch(thetas[from + c], gradient, weightRanges, objectives[from + c],
                    n, l2);
        }
    }

    @Override
    public double penalty(double[] theta) {
        return Penalties.penalty(theta, weightRanges, l2);
    }

    @Override
    public void probabilities(double[] theta, double[] x, int n, double[] out, Workspace workspace) {
        Scratch s = scratch(theta, n, workspace);
        Kernels.multiplyByTransposed(x, 0, n, inputs, theta, 0, classes, theta, biasOffset, s.scores, 0, s.pack);
        Softmax.probabilities(s.scores, n, classes, s.logSumExp, s.exponents, true);
        System.arraycopy(s.scores, 0, out, 0, n * classes);
    }

    /**
     * Zeros: every parameter 0. Glorot: W ~ U(−a, a), a = sqrt(6 / (d + K)). He: W ~ N(0, 2/d). Biases are
     * always 0; one draw per weight in θ order.
     */
    @Override
    public void initialise(double[] theta, Initialisation init, RandomGenerator rng) {
        Starts.checkLength("θ", theta, parameterCount());
        Starts.fillWeights(theta, 0, classes, inputs, init, rng);
        java.util.Arrays.fill(theta, biasOffset, biasOffset + classes, 0.0);
    }

    /** Centres the K biases; with λ = 0 also centres, feature by feature, the K class weight vectors. */
    @Override
    public void removeGauge(double[] theta) {
        Starts.checkLength("θ", theta, parameterCount());
        SoftmaxCentring.centreOutputs(theta, 0, classes, inputs, biasOffset, l2 == 0.0);
    }
}
