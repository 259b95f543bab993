package settle.engine.minimum;

/**
 * The objective has no minimiser: with no penalty (λ = 0) on (quasi-)separable training data the loss can be
 * driven towards its infimum only by letting the weights grow without bound. The command line maps it to
 * exit code 1 (the work failed), not to bad input.
 */
public final class NoMinimiserException extends RuntimeException {

    private static final long serialVersionUID = 1L;

    /** @param message one line saying why and what to change */
    public NoMinimiserException(String message) {
        super(message);
    }

    static NoMinimiserException separable() {
        return new NoMinimiserException("no minimiser exists: the training data are linearly separable and l2 = 0;"
                + " set model.l2 > 0");
    }

    static NoMinimiserException unbounded(double largestLogit, int iterations) {
        return new NoMinimiserException(String.format(java.util.Locale.ROOT,
                "no minimiser exists: with l2 = 0 the weights grow without bound (largest logit %.3g after %d"
                        + " iterations; the training data are quasi-separable); set model.l2 > 0",
                largestLogit, iterations));
    }
}
