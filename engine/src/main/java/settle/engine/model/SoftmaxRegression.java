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
        if (maxBatch < 1) {
            throw new IllegalArgumentException("workspace capacity must be at least 1: " + maxBatch);
        }
        return new Scratch(maxBatch, inputs, classes);
    }

    /**
     * The batch's scores, then probabilities, then deltas (capacity × K), and the soft-max's scratch of the same
     * size; each row's target score and log-sum-exp (capacity); and the products' packing buffer.
     */
    private static final class Scratch implements Workspace {
        private final int capacity;
        private final int classes;
        private final double[] scores;
        private final double[] targets;
        private final double[] logSumExp;
        private final double[] exponents;
        private final double[] pack;

        Scratch(int capacity, int inputs, int classes) {
            this.capacity = capacity;
            this.classes = classes;
            this.scores = new double[Math.multiplyExact(capacity, classes)];
            this.targets = new double[capacity];
            this.logSumExp = new double[capacity];
            this.exponents = new double[scores.length];
            this.pack = new double[Kernels.packLength(capacity, classes, inputs)];
        }

        @Override
        public int capacity() {
            return capacity;
        }
    }

    private Scratch scratch(double[] theta, int n, Workspace workspace) {
        Starts.checkLength("θ", theta, parameterCount());
        if (!(workspace instanceof Scratch s) || s.classes != classes || s.pack.length != Kernels.packLength(s.capacity, classes, inputs)) {
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
     * row's target score, turns the scores into probabilities and returns Σ_r (log-sum-exp_r − z_{r,y_r}).
     */
    private double forward(double[] theta, double[] x, int[] y, int n, Scratch s) {
        Kernels.multiplyByTransposed(x, 0, n, inputs, theta, 0, classes, theta, biasOffset, s.scores, 0, s.pack);
        double[] z = s.scores;
        for (int r = 0; r < n; r++) {
            s.targets[r] = z[r * classes + y[r]];
        }
        Softmax.probabilities(z, n, classes, s.logSumExp, s.exponents);
        double sum = 0;
        for (int r = 0; r < n; r++) {
            sum += s.logSumExp[r] - s.targets[r];
        }
        return sum;
    }

    @Override
    public double lossSum(double[] theta, double[] x, int[] y, int n, Workspace workspace) {
        return forward(theta, x, y, n, scratch(theta, n, workspace));
    }

    @Override
    public double addGradientSum(double[] theta, double[] x, int[] y, int n, double[] gradientSum,
            Workspace workspace) {
        Scratch s = scratch(theta, n, workspace);
        Starts.checkLength("gradient", gradientSum, parameterCount());
        double sum = forward(theta, x, y, n, s);
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

    @Override
    public double penalty(double[] theta) {
        return Penalties.penalty(theta, weightRanges, l2);
    }

    @Override
    public void probabilities(double[] theta, double[] x, int n, double[] out, Workspace workspace) {
        Scratch s = scratch(theta, n, workspace);
        Kernels.multiplyByTransposed(x, 0, n, inputs, theta, 0, classes, theta, biasOffset, s.scores, 0, s.pack);
        Softmax.probabilities(s.scores, n, classes, s.logSumExp, s.exponents);
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
