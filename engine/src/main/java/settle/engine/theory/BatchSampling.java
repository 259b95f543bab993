package settle.engine.theory;

/** How the mini-batches that the prediction models were drawn. */
public enum BatchSampling {
    /** B independent indices with replacement: batch noise covariance C/B, exactly. */
    REPLACEMENT,
    /**
     * A fresh permutation per epoch, cut into batches: modelled as C/B·(N − B)/(N − 1) (the
     * finite-population correction of one batch drawn without replacement), ignoring the correlation
     * between batches of one epoch, so the prediction is approximate.
     */
    SHUFFLE;

    /**
     * @param batch the batch size B of this update, 1 ≤ B ≤ N
     * @param examples N, the training examples
     * @return the factor f with C_B = f·C: 1/B, or (N − B)/((N − 1)·B) under reshuffling (0 when N = 1)
     */
    public double noiseFactor(int batch, int examples) {
        if (examples < 1 || batch < 1 || batch > examples) {
            throw new IllegalArgumentException("batch size must be in [1, " + examples + "]: " + batch);
        }
        if (this == REPLACEMENT) {
            return 1.0 / batch;
        }
        if (examples == 1) {
            return 0.0;
        }
        return (examples - batch) / ((examples - 1.0) * batch);
    }
}
