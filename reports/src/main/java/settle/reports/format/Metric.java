package settle.reports.format;

/**
 * The per-replicate metrics of a replicate file (DESIGN.md "Wander metrics"), with their file keys, in the file's
 * order.
 */
public enum Metric {
    /** F(θ_F): the training objective of the returned iterate (the primary metric without a reference minimiser). */
    FINAL_OBJECTIVE("final_objective", "final objective", false, false, JsonIn.Range.NON_NEGATIVE),
    /** F(θ_F) − F(θ*): the primary metric of a convex model. */
    FINAL_GAP("final_gap", "final gap", true, false, JsonIn.Range.ANY),
    /** ‖θ_F − θ*‖. */
    FINAL_DISTANCE("final_distance", "final distance", true, false, JsonIn.Range.NON_NEGATIVE),
    /** sqrt((1/L) Σ ‖θ_t − θ̄‖²) over every tail update, θ̄ the tail mean: how much the run still moves. */
    TAIL_RADIUS("tail_radius", "tail radius", false, false, JsonIn.Range.NON_NEGATIVE),
    /** sqrt((1/L) Σ ‖θ_t − θ*‖²) over every tail update. */
    TAIL_DISTANCE("tail_distance", "tail distance", true, false, JsonIn.Range.NON_NEGATIVE),
    /** The tail radius over the epoch ends in the tail only (descriptive). */
    TAIL_RADIUS_EPOCH_ENDS("tail_radius_epoch_ends", "tail radius at epoch ends", false, false,
            JsonIn.Range.NON_NEGATIVE),
    /** The tail distance over the epoch ends in the tail only (descriptive). */
    TAIL_DISTANCE_EPOCH_ENDS("tail_distance_epoch_ends", "tail distance at epoch ends", true, false,
            JsonIn.Range.NON_NEGATIVE),
    /** standard deviation of F over the tail snapshots. */
    TAIL_LOSS_SPREAD("tail_loss_spread", "tail loss spread", false, false, JsonIn.Range.NON_NEGATIVE),
    /** F(θ̄) − F(θ*). */
    AVERAGED_GAP("averaged_gap", "averaged gap", true, false, JsonIn.Range.ANY),
    /** test loss at the final iterate. */
    TEST_LOSS("test_loss", "test loss", false, false, JsonIn.Range.NON_NEGATIVE),
    /** test accuracy at the final iterate. */
    TEST_ACCURACY("test_accuracy", "test accuracy", false, true, JsonIn.Range.UNIT);

    private final String key;
    private final String words;
    private final boolean convexOnly;
    private final boolean higherIsBetter;
    private final JsonIn.Range range;

    Metric(String key, String words, boolean convexOnly, boolean higherIsBetter, JsonIn.Range range) {
        this.range = range;
        this.key = key;
        this.words = words;
        this.convexOnly = convexOnly;
        this.higherIsBetter = higherIsBetter;
    }

    /** @return the key in the replicate file and in summary.csv */
    public String key() {
        return key;
    }

    /** @return the name in sentences */
    public String words() {
        return words;
    }

    /** @return true when the metric needs θ* (convex models) */
    public boolean convexOnly() {
        return convexOnly;
    }

    /** @return the values a replicate file accepts for it (gaps may be below 0 by rounding) */
    JsonIn.Range range() {
        return range;
    }

    /** @return true for test accuracy */
    public boolean higherIsBetter() {
        return higherIsBetter;
    }
}
