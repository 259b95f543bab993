package settle.reports.metrics;

/**
 * Projection of softmax-regression parameters onto the gauge-free subspace (DESIGN.md "Training semantics"):
 * adding a constant to every class bias (and, when λ = 0, one vector to every class's weights) leaves a
 * softmax model unchanged, so distances between parameter vectors are taken after centring the K biases
 * (and the K weight vectors, feature by feature). Layout: class 0's d weights, class 1's, …, then the K
 * biases. Binary logistic regression (d weights, one bias) has no gauge.
 */
public final class GaugeProjection {

    private final int features;
    private final int classes;
    private final boolean biases;
    private final boolean weights;

    /**
     * @param features d
     * @param classes K (the layout has K·d + K parameters; K = 2 with d + 1 parameters is binary: no gauge)
     * @param biases centre the class biases
     * @param weights centre the class weights (λ = 0)
     */
    public GaugeProjection(int features, int classes, boolean biases, boolean weights) {
        this.features = features;
        this.classes = classes;
        this.biases = biases;
        this.weights = weights;
    }

    /** @return the projection that changes nothing */
    public static GaugeProjection none() {
        return new GaugeProjection(0, 0, false, false);
    }

    /**
     * The gauge of a study's model, from its parameter count and the reference's gauge dimension (0 none; 1
     * the biases; d + 1 biases and weights). When the reference does not say (curvature skipped), the
     * biases are centred, and the weights too when {@code l2IsZero}.
     *
     * @param parameters P
     * @param features d
     * @param classes K
     * @param gaugeDimension from reference.json, or −1 when unknown
     * @param l2IsZero whether the plan's penalty is zero (used only when the dimension is unknown)
     * @return the projection
     */
    public static GaugeProjection of(int parameters, int features, int classes, int gaugeDimension, boolean l2IsZero) {
        if (classes < 3 || parameters != classes * features + classes) {
            return none();
        }
        if (gaugeDimension >= 0) {
            return new GaugeProjection(features, classes, gaugeDimension >= 1, gaugeDimension >= features + 1);
        }
        return new GaugeProjection(features, classes, true, l2IsZero);
    }

    /** @return true when the projection changes something */
    public boolean active() {
        return biases || weights;
    }

    /**
     * @param theta parameters in the softmax layout
     * @return a projected copy
     */
    public double[] project(double[] theta) {
        double[] out = theta.clone();
        if (!active()) {
            return out;
        }
        int d = features;
        int k = classes;
        if (biases) {
            double mean = 0.0;
            for (int c = 0; c < k; c++) {
                mean += out[k * d + c];
            }
            mean /= k;
            for (int c = 0; c < k; c++) {
                out[k * d + c] -= mean;
            }
        }
        if (weights) {
            for (int j = 0; j < d; j++) {
                double mean = 0.0;
                for (int c = 0; c < k; c++) {
                    mean += out[c * d + j];
                }
                mean /= k;
                for (int c = 0; c < k; c++) {
                    out[c * d + j] -= mean;
                }
            }
        }
        return out;
    }
}
