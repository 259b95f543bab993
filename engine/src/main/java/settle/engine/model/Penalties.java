package settle.engine.model;

/**
 * The penalty and the batch gradient's last step for models whose weights lie in known index ranges: the same
 * arithmetic as {@link Model#batchObjective}'s and {@link Model#penalty}'s defaults (same operations, same
 * order), without a per-index {@link Model#penalised} call.
 */
final class Penalties {

    private Penalties() {
    }

    /**
     * @param weightRanges ascending pairs (start, end) of the weight blocks in θ; not modified
     * @return (λ/2) Σ over the weights of θ², indices ascending
     */
    static double penalty(double[] theta, int[] weightRanges, double lambda) {
        double sum = 0;
        for (int q = 0; q < weightRanges.length; q += 2) {
            for (int i = weightRanges[q]; i < weightRanges[q + 1]; i++) {
                sum += theta[i] * theta[i];
            }
        }
        return 0.5 * lambda * sum;
    }

    /**
     * Turns a gradient sum over n rows into the batch gradient: g ← g/n, then g += λθ on the weights (one pass;
     * per element the same two roundings as the default, and the penalty's sum in the same order). With λ = 0 only
     * g ← g/n (the same values, up to the sign of a zero).
     *
     * @param theta not modified
     * @param gradient the sum on entry, the batch gradient on return; modified
     * @return lossSum/n + the penalty
     */
    static double finishBatch(double[] theta, double[] gradient, int[] weightRanges, double lossSum, int n,
            double lambda) {
        double inverse = 1.0 / n;
        if (lambda == 0.0) {
            // no penalty: skip the sum of squares, a serial chain over every weight that would only be multiplied by 0
            for (int i = 0; i < gradient.length; i++) {
                gradient[i] *= inverse;
            }
            return lossSum * inverse;
        }
        double sum = 0;
        int next = 0;
        for (int q = 0; q < weightRanges.length; q += 2) {
            for (int i = next; i < weightRanges[q]; i++) {
                gradient[i] *= inverse;
            }
            for (int i = weightRanges[q]; i < weightRanges[q + 1]; i++) {
                double t = theta[i];
                gradient[i] = gradient[i] * inverse + lambda * t;
                sum += t * t;
            }
            next = weightRanges[q + 1];
        }
        for (int i = next; i < gradient.length; i++) {
            gradient[i] *= inverse;
        }
        return lossSum * inverse + 0.5 * lambda * sum;
    }
}
