package settle.engine.model;

import java.util.Arrays;
import java.util.random.RandomGenerator;
import settle.input.BadInputException;

/**
 * A multilayer perceptron: hidden layers of the chosen {@link Activation}, then a softmax output layer over
 * the K classes. With K = 2 the output is a 2-way softmax (two output units, class 1 the positive class), not a
 * single sigmoid unit: its two biases (and, with λ = 0, its two weight rows) carry the softmax gauge.
 *
 * <p>Layers are numbered 1 … L (L − 1 hidden layers, then the output); layer l maps s_{l−1} values to s_l,
 * with s_0 = d and s_L = K. θ holds them layer by layer: layer l's weights W_l (s_l × s_{l−1}, row-major: row
 * j is output unit j's incoming weights), then its s_l biases. Weights are penalised, biases are not. The
 * objective is not convex.
 */
public final class Mlp implements Model {

    private final int[] sizes;
    private final Activation activation;
    private final double l2;
    private final int layers;
    private final int[] weightOffset;
    private final int[] biasOffset;
    private final int parameterCount;
    private final boolean[] penalised;
    private final int[] weightRanges;

    /**
     * @param inputs d, at least 1
     * @param hidden the hidden layer sizes, at least one, each at least 1; not modified
     * @param activation the hidden layers' nonlinearity
     * @param classes K, at least 2
     * @param l2 λ ≥ 0, the penalty on the weights (not the biases)
     */
    public Mlp(int inputs, int[] hidden, Activation activation, int classes, double l2) {
        if (inputs < 1) {
            throw new IllegalArgumentException("an MLP needs at least one input: " + inputs);
        }
        if (hidden.length < 1) {
            throw new IllegalArgumentException("model.hidden must list at least one layer size for kind mlp");
        }
        for (int h : hidden) {
            if (h < 1) {
                throw new IllegalArgumentException("model.hidden sizes must be at least 1: " + Arrays.toString(hidden));
            }
        }
        if (classes < 2) {
            throw new IllegalArgumentException("an MLP needs at least 2 classes: " + classes);
        }
        if (activation == null) {
            throw new IllegalArgumentException("model.activation must be relu or tanh: null");
        }
        if (!(l2 >= 0) || Double.isInfinite(l2)) {
            throw new IllegalArgumentException("model.l2 must be ≥ 0 and finite: " + l2);
        }
        this.layers = hidden.length + 1;
        this.sizes = new int[layers + 1];
        sizes[0] = inputs;
        System.arraycopy(hidden, 0, sizes, 1, hidden.length);
        sizes[layers] = classes;
        this.activation = activation;
        this.l2 = l2;
        this.weightOffset = new int[layers + 1];
        this.biasOffset = new int[layers + 1];
        long offset = 0;
        for (int l = 1; l <= layers; l++) {
            weightOffset[l] = (int) offset;
            offset += (long) sizes[l] * sizes[l - 1];
            biasOffset[l] = (int) offset;
            offset += sizes[l];
            if (offset > Integer.MAX_VALUE - 8) {
                throw BadInputException.of("model.hidden", "model.hidden " + Arrays.toString(hidden)
                        + " gives too many parameters for " + inputs + " inputs");
            }
        }
        this.parameterCount = (int) offset;
        this.penalised = new boolean[parameterCount];
        this.weightRanges = new int[2 * layers];
        for (int l = 1; l <= layers; l++) {
            Arrays.fill(penalised, weightOffset[l], biasOffset[l], true);
            weightRanges[2 * l - 2] = weightOffset[l];
            weightRanges[2 * l - 1] = biasOffset[l];
        }
    }

    @Override
    public int inputs() {
        return sizes[0];
    }

    @Override
    public int classes() {
        return sizes[layers];
    }

    @Override
    public int parameterCount() {
        return parameterCount;
    }

    @Override
    public double l2() {
        return l2;
    }

    @Override
    public boolean convex() {
        return false;
    }

    @Override
    public boolean penalised(int index) {
        return penalised[index];
    }

    /** @return the hidden layers' nonlinearity */
    public Activation activation() {
        return activation;
    }

    /** @return where layer l's weights start in θ, for l = 1 … L */
    public int weightOffset(int layer) {
        java.util.Objects.checkIndex(layer - 1, layers);
        return weightOffset[layer];
    }

    /** @return where layer l's biases start in θ, for l = 1 … L */
    public int biasOffset(int layer) {
        java.util.Objects.checkIndex(layer - 1, layers);
        return biasOffset[layer];
    }

    @Override
    public String describe() {
        StringBuilder shape = new StringBuilder();
        for (int l = 0; l <= layers; l++) {
            shape.append(l == 0 ? "" : "-").append(sizes[l]);
        }
        return "MLP " + shape + " (" + activation.key() + " hidden layers, softmax output), " + sizes[0]
                + " features, " + sizes[layers] + " classes";
    }

    @Override
    public Workspace workspace(int maxBatch) {
        if (maxBatch < 1) {
            throw new IllegalArgumentException("workspace capacity must be at least 1: " + maxBatch);
        }
        return new Scratch(maxBatch, sizes);
    }

    /**
     * Per layer l = 1 … L: its outputs a_l (capacity × s_l; post-activation for hidden layers, the logits and
     * then the probabilities for the output layer) and the loss's gradient with respect to its pre-activations
     * δ_l (capacity × s_l); the soft-max's scratch (capacity × K); each row's target logit and log-sum-exp
     * (capacity); and the products' packing buffer.
     */
    private static final class Scratch implements Workspace {
        private final int capacity;
        private final int[] sizes;
        private final double[][] out;
        private final double[][] delta;
        private final double[] targets;
        private final double[] logSumExp;
        private final double[] exponents;
        private final double[] pack;

        Scratch(int capacity, int[] sizes) {
            this.capacity = capacity;
            this.sizes = sizes;
            this.targets = new double[capacity];
            this.logSumExp = new double[capacity];
            this.exponents = new double[Math.multiplyExact(capacity, sizes[sizes.length - 1])];
            this.out = new double[sizes.length][];
            this.delta = new double[sizes.length][];
            int largest = 0;
            for (int l = 1; l < sizes.length; l++) {
                out[l] = new double[Math.multiplyExact(capacity, sizes[l])];
                delta[l] = new double[capacity * sizes[l]];
                largest = Math.max(largest, Kernels.packLength(capacity, sizes[l], sizes[l - 1]));
            }
            this.pack = new double[largest];
        }

        @Override
        public int capacity() {
            return capacity;
        }
    }

    private Scratch scratch(double[] theta, int n, Workspace workspace) {
        Starts.checkLength("θ", theta, parameterCount);
        if (!(workspace instanceof Scratch s) || !Arrays.equals(s.sizes, sizes)) {
            throw new IllegalArgumentException("workspace was not made by an MLP of shape " + Arrays.toString(sizes));
        }
        Starts.checkRows(n, s.capacity);
        return s;
    }

    // ---- forward and backward, side by side --------------------------------------------------------------
    // x is (n, d) row-major; layer l has W_l (s_l, s_{l−1}) row-major at weightOffset[l] and b_l (s_l).
    // Forward:  a_0 = x;  z_l = a_{l−1} W_lᵀ + b_l;  a_l = act(z_l) for l < L;  p = softmax(z_L) per row;
    //           loss_r = logsumexp(z_L,r) − z_L,r,y_r.
    // Backward: δ_L = p − onehot(y);  ∂/∂W_l += δ_lᵀ a_{l−1};  ∂/∂b_l += Σ_r δ_l,r;
    //           δ_{l−1} = (δ_l W_l) ⊙ act'(a_{l−1})  with relu' = [a > 0], tanh' = 1 − a².

    /**
     * Fills s.out[1..L] for the n rows of x; s.out[L] ends holding the logits z_L (n, K). Each z is one fused
     * multiply-add chain from b_j over the inputs in ascending order ({@link Kernels#product}).
     */
    private void forward(double[] theta, double[] x, int n, Scratch s) {
        for (int l = 1; l <= layers; l++) {
            double[] in = l == 1 ? x : s.out[l - 1];
            double[] out = s.out[l];
            int nIn = sizes[l - 1];
            int nOut = sizes[l];
            Kernels.multiplyByTransposed(in, 0, n, nIn, theta, weightOffset[l], nOut, theta, biasOffset[l], out, 0,
                    s.pack);
            if (l < layers) {
                int count = n * nOut;
                if (activation == Activation.RELU) {
                    Kernels.relu(out, count, nOut);
                } else {
                    for (int i = 0; i < count; i++) {
                        out[i] = Math.tanh(out[i]);
                    }
                }
            }
        }
    }

    /**
     * Keeps each row's target logit, turns the logits (n, K) in s.out[L] into probabilities in place (when
     * {@code probabilities}; a loss alone needs only the log-sum-exps) and returns Σ_r (log-sum-exp_r − logit_{r,y_r}).
     */
    private double softmax(int[] y, int n, Scratch s, boolean probabilities) {
        double[] logits = s.out[layers];
        int k = sizes[layers];
        for (int r = 0; r < n; r++) {
            s.targets[r] = logits[r * k + y[r]];
        }
        Softmax.probabilities(logits, n, k, s.logSumExp, s.exponents, probabilities);
        double sum = 0;
        for (int r = 0; r < n; r++) {
            sum += s.logSumExp[r] - s.targets[r];
        }
        return sum;
    }

    /** Adds the gradient of Σ_r loss_r into gradientSum, starting from δ_L in s.delta[L]. */
    private void backward(double[] theta, double[] x, int n, double[] gradientSum, Scratch s) {
        for (int l = layers; l >= 1; l--) {
            double[] in = l == 1 ? x : s.out[l - 1];
            double[] delta = s.delta[l];
            int nIn = sizes[l - 1];
            int nOut = sizes[l];
            // ∂/∂W_l (nOut, nIn) += δ_lᵀ (nOut × n) · a_{l−1} (n × nIn); ∂/∂b_l += column sums of δ_l.
            Kernels.addTransposedProduct(delta, 0, n, nOut, in, 0, nIn, gradientSum, weightOffset[l], s.pack);
            Kernels.addColumnSums(delta, n, nOut, gradientSum, biasOffset[l]);
            if (l == 1) {
                break;
            }
            // δ_{l−1} (n, nIn) = δ_l (n, nOut) · W_l (nOut, nIn), times act'(a_{l−1}).
            double[] previous = s.delta[l - 1];
            Kernels.product(delta, 0, n, nOut, theta, weightOffset[l], nIn, null, 0, previous, 0);
            int count = n * nIn;
            if (activation == Activation.RELU) {
                Kernels.keepWherePositive(previous, in, count, nIn);
            } else {
                for (int i = 0; i < count; i++) {
                    double a = in[i];
                    previous[i] *= 1.0 - a * a;
                }
            }
        }
    }

    @Override
    public double lossSum(double[] theta, double[] x, int[] y, int n, Workspace workspace) {
        Scratch s = scratch(theta, n, workspace);
        forward(theta, x, n, s);
        return softmax(y, n, s, false);
    }

    @Override
    public double addGradientSum(double[] theta, double[] x, int[] y, int n, double[] gradientSum,
            Workspace workspace) {
        Scratch s = scratch(theta, n, workspace);
        Starts.checkLength("gradient", gradientSum, parameterCount);
        forward(theta, x, n, s);
        double sum = softmax(y, n, s, true);
        double[] delta = s.delta[layers];
        int k = sizes[layers];
        System.arraycopy(s.out[layers], 0, delta, 0, n * k);
        for (int r = 0; r < n; r++) {
            delta[r * k + y[r]] -= 1.0;
        }
        backward(theta, x, n, gradientSum, s);
        return sum;
    }

    @Override
    public double batchObjective(double[] theta, double[] x, int[] y, int n, double[] gradient, Workspace workspace) {
        Arrays.fill(gradient, 0.0);
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
        forward(theta, x, n, s);
        double[] logits = s.out[layers];
        Softmax.probabilities(logits, n, sizes[layers], s.logSumExp, s.exponents, true);
        System.arraycopy(logits, 0, out, 0, n * sizes[layers]);
    }

    /**
     * Per layer l, fan-in s_{l−1} and fan-out s_l: zeros, every parameter 0 (every hidden unit then stays
     * identical to its neighbours: legal but rarely wanted); Glorot, W ~ U(−a, a) with
     * a = sqrt(6 / (s_{l−1} + s_l)); He (the MLP default), W ~ N(0, 2 / s_{l−1}). Biases are always 0; one
     * draw per weight in θ order, layer by layer.
     */
    @Override
    public void initialise(double[] theta, Initialisation init, RandomGenerator rng) {
        Starts.checkLength("θ", theta, parameterCount);
        for (int l = 1; l <= layers; l++) {
            Starts.fillWeights(theta, weightOffset[l], sizes[l], sizes[l - 1], init, rng);
            Arrays.fill(theta, biasOffset[l], biasOffset[l] + sizes[l], 0.0);
        }
    }

    /**
     * Centres the output layer's K biases and, with λ = 0, each column of its weights (the softmax gauge of
     * the output layer; the same holds for K = 2). The hidden layers' permutation symmetry is discrete and is
     * not removed.
     */
    @Override
    public void removeGauge(double[] theta) {
        Starts.checkLength("θ", theta, parameterCount);
        SoftmaxCentring.centreOutputs(theta, weightOffset[layers], sizes[layers], sizes[layers - 1], biasOffset[layers],
                l2 == 0.0);
    }
}
