package settle.reports.metrics;

import settle.reports.stats.Interval;

/**
 * One arm-level metric of one arm (seed spread, prediction spread or disagreement).
 *
 * @param value the metric over the arm's finished replicates (NaN when it cannot be computed)
 * @param interval the percentile bootstrap interval over seed indices resampled jointly across arms, or an
 *     undefined interval (no replicate of the arm may have diverged or be missing for it)
 * @param replicates finished replicates behind the value
 */
public record ArmLevel(double value, Interval interval, int replicates) {

    /** @return a metric that cannot be computed */
    public static ArmLevel none() {
        return new ArmLevel(Double.NaN, Interval.none(0.0), 0);
    }
}
