package settle.reports.stats;

/** Which way a metric improves. A diverged replicate is the worst value in either case. */
public enum Direction {
    /** Smaller is better (tail radius, gaps, distances, loss spread, test loss). */
    LOWER_IS_BETTER,
    /** Larger is better (test accuracy). */
    HIGHER_IS_BETTER
}
