package settle.engine.theory;

/** How the mini-batches that the prediction models were drawn. */
public enum BatchSampling {
    /** B independent indices with replacement: batch noise covariance C/B, batches independent. */
    REPLACEMENT,
    /**
     * A fresh permutation per epoch, cut into consecutive batches (the last one short): one batch has noise
     * covariance C/B·(N − B)/(N − 1), and two batches of the same epoch covary by −C/(N − 1).
     */
    SHUFFLE
}
