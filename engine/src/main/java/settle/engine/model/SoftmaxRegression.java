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
        return new Scratch(maxBatch, classes);
    }

    /** One row's scores (K values); rows are processed one at a time. */
    private static final class Scratch implements Workspace {
        private final int capacity;
        private final double[] scores;

        Scratch(int capacity, int classes) {
            this.capacity = capacity;
            this.scores = new double[classes];
        }

        @Override
        public int capacity() {
            return capacity;
        }
    }

    private Scratch scratch(double[] theta, int n, Workspace workspace) {
        Starts.checkLength("θ", theta, parameterCount());
        if (!(workspace instanceof Scratch s) || s.scores.length != classes) {
            throw new IllegalArgumentException("workspace was not made by a " + classes
                    + "-class multinomial logistic model");
        }
        Starts.checkRows(n, s.capacity);
        return s;
    }

    // Forward and backward, side by side. x is (n, d) row-major, W is (K, d) row-major at θ[0], b (K) at θ[K·d].
    // Forward:  z = W x_r + b (K),  m = max z,  s = Σ exp(z_k − m),  loss_r = m + log s − z_y.
    // Backward: δ_k = exp(z_k − m)/s − [k = y],  ∂/∂W_k += δ_k x_r,  ∂/∂b_k += δ_k.

    /**
     * Replaces each score z_k by exp(z_k − max z) (callers read z_y first).
     *
     * @param scores z on entry, the shifted exponentials on return; modified
     * @return max z + log Σ exp(z_k − max z), the log-sum-exp of z
     */
    private double logSumExp(double[] scores) {
        double max = scores[0];
        for (int k = 1; k < classes; k++) {
            max = Math.max(max, scores[k]);
        }
        double sum = 0;
        for (int k = 0; k < classes; k++) {
            double e = Math.exp(scores[k] - max);
            scores[k] = e;
            sum += e;
        }
        return max + Math.log(sum);
    }

    /** Fills {@code scores} with z = W x_r + b for row r of x. */
    private void scores(double[] theta, double[] x, int row, double[] scores) {
        int base = row * inputs;
        for (int k = 0; k < classes; k++) {
            int w = k * inputs;
            double z = theta[biasOffset + k];
            for (int j = 0; j < inputs; j++) {
                z += theta[w + j] * x[base + j];
            }
            scores[k] = z;
        }
    }

    @Override
    public double lossSum(double[] theta, double[] x, int[] y, int n, Workspace workspace) {
        double[] z = scratch(theta, n, workspace).scores;
        double sum = 0;
        for (int r = 0; r < n; r++) {
            scores(theta, x, r, z);
            double target = z[y[r]];
            sum += logSumExp(z) - target;
        }
        return sum;
    }

    @Override
    public double addGradientSum(double[] theta, double[] x, int[] y, int n, double[] gradientSum,
            Workspace workspace) {
        double[] z = scratch(theta, n, workspace).scores;
        Starts.checkLength("gradient", gradientSum, parameterCount());
        double sum = 0;
        for (int r = 0; r < n; r++) {
            scores(theta, x, r, z);
            int label = y[r];
            double target = z[label];
            double lse = logSumExp(z);
            sum += lse - target;
            double inverse = 1.0 / sumOf(z);
            int base = r * inputs;
            for (int k = 0; k < classes; k++) {
                double delta = z[k] * inverse - (k == label ? 1.0 : 0.0);
                int w = k * inputs;
                for (int j = 0; j < inputs; j++) {
                    gradientSum[w + j] += delta * x[base + j];
                }
                gradientSum[biasOffset + k] += delta;
            }
        }
        return sum;
    }

    private double sumOf(double[] values) {
        double sum = 0;
        for (int k = 0; k < classes; k++) {
            sum += values[k];
        }
        return sum;
    }

    @Override
    public void probabilities(double[] theta, double[] x, int n, double[] out, Workspace workspace) {
        double[] z = scratch(theta, n, workspace).scores;
        for (int r = 0; r < n; r++) {
            scores(theta, x, r, z);
            logSumExp(z);
            double inverse = 1.0 / sumOf(z);
            int o = r * classes;
            for (int k = 0; k < classes; k++) {
                out[o + k] = z[k] * inverse;
            }
        }
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
        Gauge.centreOutputs(theta, 0, classes, inputs, biasOffset, l2 == 0.0);
    }
}
