package settle.reports.stats;

/**
 * A confidence interval [low, high] with the confidence level it actually has (an exact rank interval
 * reaches only the levels its discrete distribution allows, so the achieved level may exceed, or for
 * very few pairs fall short of, the requested one).
 *
 * @param low lower end (NaN when there is nothing to estimate from)
 * @param high upper end (NaN when there is nothing to estimate from)
 * @param level achieved (exact intervals) or nominal (bootstrap intervals) coverage, in [0, 1]
 */
public record Interval(double low, double high, double level) {

    public Interval {
        if (!(low <= high) && !(Double.isNaN(low) && Double.isNaN(high))) {
            throw new IllegalArgumentException("interval ends out of order: [" + low + ", " + high + "]");
        }
        if (!(level >= 0.0 && level <= 1.0)) {
            throw new IllegalArgumentException("interval level must be in [0, 1]: " + level);
        }
    }

    /** @return an interval with no ends (nothing to estimate from) at the given level */
    public static Interval none(double level) {
        return new Interval(Double.NaN, Double.NaN, level);
    }

    /** @return true when both ends are numbers */
    public boolean isDefined() {
        return !Double.isNaN(low);
    }
}
