package settle.engine.model;

import java.util.random.RandomGenerator;

/**
 * Binary logistic regression: p(class 1 | x) = σ(w·x + b), class 1 the positive class.
 *
 * <p>θ = (w_0 … w_{d−1}, b): the d weights, then the bias at index d. The per-example loss is the
 * cross-entropy −y·log p − (1 − y)·log(1 − p) = softplus(z) − y·z with z = w·x + b, evaluated as
 * max(z, 0) + log1p(exp(−|z|)) − y·z so that no exponential overflows. Its gradient with respect to z is
 * σ(z) − y.
 */
public final class BinaryLogistic implements Model {

    private final int inputs;
    private final double l2;

    /**
     * @param inputs d, at least 1
     * @param l2 λ ≥ 0, the penalty on the weights (not the bias)
     */
    public BinaryLogistic(int inputs, double l2) {
        if (inputs < 1) {
            throw new IllegalArgumentException("binary logistic regression needs at least one input: " + inputs);
        }
        if (!(l2 >= 0) || Double.isInfinite(l2)) {
            throw new IllegalArgumentException("model.l2 must be ≥ 0 and finite: " + l2);
        }
        this.inputs = inputs;
        this.l2 = l2;
    }

    @Override
    public int inputs() {
        return inputs;
    }

    @Override
    public int classes() {
        return 2;
    }

    @Override
    public int parameterCount() {
        return inputs + 1;
    }

    @Override
    public double l2() {
        return l2;
    }

    @Override
    public boolean convex() {
        return true;
    }

    /** @return false: a single sigmoid score has no gauge ({@link #removeGauge} is the identity) */
    @Override
    public boolean hasGauge() {
        return false;
    }

    @Override
    public boolean penalised(int index) {
        return index < inputs;
    }

    @Override
    public String describe() {
        return "binary logistic regression, " + inputs + " features, 2 classes";
    }

    @Override
    public Workspace workspace(int maxBatch) {
        if (maxBatch < 1) {
            throw new IllegalArgumentException("workspace capacity must be at least 1: " + maxBatch);
        }
        return new Scratch(maxBatch);
    }

    @Override
    public Workspace workspace(int maxBatch, int arms) {
        if (maxBatch < 1 || arms < 1) {
            throw new IllegalArgumentException("workspace capacity and arms must be at least 1: " + maxBatch + ", " + arms);
        }
        return new Scratch(maxBatch, arms, inputs);
    }

    /**
     * The capacity, and for arms computed together ({@link #batchObjectives}) their weights side by side (weight j
     * of arm a at j·A + a), their gradient sums the same way, and per arm the bias, score, δ and sums.
     */
    private static final class Scratch implements Workspace {
        private final int capacity;
        private final int arms;
        private final double[] weights;
        private final double[] gradients;
        private final double[] bias;
        private final double[] score;
        private final double[] delta;
        private final double[] biasSums;
        private final double[] lossSums;

        Scratch(int capacity) {
            this(capacity, 0, 0);
        }

        Scratch(int capacity, int arms, int inputs) {
            this.capacity = capacity;
            this.arms = arms;
            this.weights = new double[arms * inputs];
            this.gradients = new double[arms * inputs];
            this.bias = new double[arms];
            this.score = new double[arms];
            this.delta = new double[arms];
            this.biasSums = new double[arms];
            this.lossSums = new double[arms];
        }

        @Override
        public int capacity() {
            return capacity;
        }
    }

    private int check(double[] theta, int n, Workspace workspace) {
        Starts.checkLength("θ", theta, inputs + 1);
        Starts.checkRows(n, workspace.capacity());
        return n;
    }

    /** @return z = w·x_r + b for row r of x, which is (n, d) row-major; w is θ[0..d), b is θ[d] */
    private double score(double[] theta, double[] x, int row) {
        int base = row * inputs;
        double z = theta[inputs];
        for (int j = 0; j < inputs; j++) {
            z += theta[j] * x[base + j];
        }
        return z;
    }

    /** softplus(z) − y·z: the cross-entropy of label y ∈ {0, 1} at score z, without overflow. */
    static double crossEntropy(double z, int y) {
        double softplus = Math.max(z, 0.0) + Math.log1p(Math.exp(-Math.abs(z)));
        return y == 1 ? softplus - z : softplus;
    }

    /** σ(z) = 1 / (1 + exp(−z)), evaluated on the side where the exponential cannot overflow. */
    static double sigmoid(double z) {
        if (z >= 0) {
            return 1.0 / (1.0 + Math.exp(-z));
        }
        double e = Math.exp(z);
        return e / (1.0 + e);
    }

    // Forward and backward, side by side. x is (n, d) row-major, θ = (w (d), b).
    // Forward:  z_r = w·x_r + b,  loss_r = softplus(z_r) − y_r z_r.
    // Backward: δ_r = σ(z_r) − y_r,  ∂/∂w += δ_r x_r,  ∂/∂b += δ_r.

    @Override
    public double lossSum(double[] theta, double[] x, int[] y, int n, Workspace workspace) {
        check(theta, n, workspace);
        double sum = 0;
        for (int r = 0; r < n; r++) {
            sum += crossEntropy(score(theta, x, r), y[r]);
        }
        return sum;
    }

    @Override
    public double addGradientSum(double[] theta, double[] x, int[] y, int n, double[] gradientSum,
            Workspace workspace) {
        check(theta, n, workspace);
        Starts.checkLength("gradient", gradientSum, inputs + 1);
        double sum = 0;
        double biasSum = 0;
        for (int r = 0; r < n; r++) {
            double z = score(theta, x, r);
            int label = y[r];
            sum += crossEntropy(z, label);
            double delta = sigmoid(z) - label;
            int base = r * inputs;
            for (int j = 0; j < inputs; j++) {
                gradientSum[j] += delta * x[base + j];
            }
            biasSum += delta;
        }
        gradientSum[inputs] += biasSum;
        return sum;
    }

    /**
     * The arms' batch objectives and gradients in one pass over the batch, their weights side by side so that
     * each row is read once for every arm and the arms' scores are independent chains. Each arm's score, loss sum,
     * gradient sum and bias sum are the same operations in the same order as {@link #addGradientSum} takes them
     * for that arm alone (z = b, then z += w_j·x_j for j ascending; sums over rows ascending from 0), so every
     * value is the same bits as {@link #batchObjective} gives it.
     */
    @Override
    public void batchObjectives(double[][] thetas, int count, double[] x, int[] y, int n, double[][] gradients,
            double[] objectives, Workspace workspace) {
        Scratch s = (Scratch) workspace;
        if (count > s.arms) {
            Model.super.batchObjectives(thetas, count, x, y, n, gradients, objectives, workspace);
            return;
        }
        Starts.checkRows(n, s.capacity);
        int d = inputs;
        double[] w = s.weights;
        double[] g = s.gradients;
        for (int a = 0; a < count; a++) {
            double[] theta = thetas[a];
            Starts.checkLength("θ", theta, d + 1);
            Starts.checkLength("gradient", gradients[a], d + 1);
            for (int j = 0; j < d; j++) {
                w[j * count + a] = theta[j];
            }
            s.bias[a] = theta[d];
            s.biasSums[a] = 0.0;
            s.lossSums[a] = 0.0;
        }
        java.util.Arrays.fill(g, 0, d * count, 0.0);
        double[] z = s.score;
        double[] delta = s.delta;
        for (int r = 0; r < n; r++) {
            int base = r * d;
            System.arraycopy(s.bias, 0, z, 0, count);
            for (int j = 0; j < d; j++) {
                double xj = x[base + j];
                int wj = j * count;
                for (int a = 0; a < count; a++) {
                    z[a] += w[wj + a] * xj;
                }
            }
            int label = y[r];
            for (int a = 0; a < count; a++) {
                s.lossSums[a] += crossEntropy(z[a], label);
                double da = sigmoid(z[a]) - label;
                delta[a] = da;
                s.biasSums[a] += da;
            }
            for (int j = 0; j < d; j++) {
                double xj = x[base + j];
                int gj = j * count;
                for (int a = 0; a < count; a++) {
                    g[gj + a] += delta[a] * xj;
                }
            }
        }
        for (int a = 0; a < count; a++) {
            double[] gradient = gradients[a];
            for (int j = 0; j < d; j++) {
                gradient[j] = g[j * count + a];
            }
            gradient[d] = 0.0 + s.biasSums[a];
            objectives[a] = batchMean(thetas[a], s.lossSums[a], n, gradient);
        }
    }

    /** Writes (1 − p, p) per row: class 0 first, then the positive class 1. */
    @Override
    public void probabilities(double[] theta, double[] x, int n, double[] out, Workspace workspace) {
        check(theta, n, workspace);
        for (int r = 0; r < n; r++) {
            double z = score(theta, x, r);
            out[2 * r] = sigmoid(-z);
            out[2 * r + 1] = sigmoid(z);
        }
    }

    /**
     * Zeros: every parameter 0. Glorot: w ~ U(−a, a), a = sqrt(6 / (d + 1)). He: w ~ N(0, 2/d). The bias is
     * always 0; one draw per weight in θ order.
     */
    @Override
    public void initialise(double[] theta, Initialisation init, RandomGenerator rng) {
        Starts.checkLength("θ", theta, inputs + 1);
        Starts.fillWeights(theta, 0, 1, inputs, init, rng);
        theta[inputs] = 0.0;
    }
}
