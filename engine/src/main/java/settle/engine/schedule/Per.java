package settle.engine.schedule;

/**
 * Which counter a schedule reads ({@code per: epoch | update}; default epoch): with {@code epoch}, the rate
 * is constant within an epoch.
 */
public enum Per {
    /** n = epoch (1 for the first pass); progress = (epoch − 1) / epochs. */
    EPOCH("epoch"),
    /** n = update (1 for the first update); progress = (update − 1) / total updates. */
    UPDATE("update");

    private final String word;

    Per(String word) {
        this.word = word;
    }

    /** @return the word written in a plan */
    public String word() {
        return word;
    }

    /** @return n: the epoch or the update counter, from 1 */
    double counter(int epoch, long update) {
        return this == EPOCH ? epoch : update;
    }

    /** @return progress in [0, 1): (epoch − 1) / epochs, or (update − 1) / total updates */
    double progress(int epoch, long update, RunShape shape) {
        return this == EPOCH ? (epoch - 1) / (double) shape.epochs() : shape.progress(update);
    }

    /** @return epochs elapsed before this counter: epoch − 1, or (update − 1) / updates per epoch */
    double epochsElapsed(int epoch, long update, RunShape shape) {
        return this == EPOCH ? epoch - 1 : (update - 1) / (double) shape.updatesPerEpoch();
    }

    static Per parse(KeyReader r) {
        return r.choice("per", "epoch", java.util.List.of("epoch", "update")).equals("epoch") ? EPOCH : UPDATE;
    }
}
