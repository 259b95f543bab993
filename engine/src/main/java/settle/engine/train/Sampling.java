package settle.engine.train;


/** How an epoch's mini-batches are drawn from the training split (plan key {@code training.sampling}). */
public enum Sampling {
    /** a fresh permutation each epoch, cut into batches of B in order; the last short batch is kept */
    SHUFFLE("shuffle"),
    /** each batch is B independent indices drawn with replacement; an epoch is ⌈N/B⌉ updates */
    REPLACEMENT("replacement");

    private final String key;

    Sampling(String key) {
        this.key = key;
    }

    /** @return the name as written in a plan */
    public String key() {
        return key;
    }

    @Override
    public String toString() {
        return key;
    }
}
