package settle.reports.study;

/** The per-replicate metrics of a replicate file (DESIGN.md "Wander metrics"), with their file keys. */
public enum Metric {
    /** F(θ_F) − F(θ*). */
    FINAL_GAP("final_gap", "final gap", true, false),
    /** ‖θ_F − θ*‖. */
    FINAL_DISTANCE("final_distance", "final distance", true, false),
    /** sqrt((1/K) Σ ‖θ_(k) − θ̄_K‖²): the primary metric. */
    TAIL_RADIUS("tail_radius", "tail radius", false, false),
    /** sqrt((1/K) Σ ‖θ_(k) − θ*‖²). */
    TAIL_DISTANCE("tail_distance", "tail distance", true, false),
    /** standard deviation of F over the tail snapshots. */
    TAIL_LOSS_SPREAD("tail_loss_spread", "tail loss spread", false, false),
    /** F(θ̄) − F(θ*). */
    AVERAGED_GAP("averaged_gap", "averaged gap", true, false),
    /** test loss at the final iterate. */
    TEST_LOSS("test_loss", "test loss", false, false),
    /** test accuracy at the final iterate. */
    TEST_ACCURACY("test_accuracy", "test accuracy", false, true);

    private final String key;
    private final String words;
    private final boolean convexOnly;
    private final boolean higherIsBetter;

    Metric(String key, String words, boolean convexOnly, boolean higherIsBetter) {
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

    /** @return true for test accuracy */
    public boolean higherIsBetter() {
        return higherIsBetter;
    }
}
