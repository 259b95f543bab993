package settle.reports.metrics;

import settle.reports.stats.Interval;

/**
 * One arm-level metric of one arm (seed spread, prediction spread or disagreement).
 *
 * @param value the metric over the arm's finished replicates (NaN when it cannot be computed)
 * @param interval the jackknife interval over the arm's finished replicates (leave one replicate out; log scale),
 *     or an undefined interval (fewer than three finished replicates, or a value of zero)
 * @param replicates finished replicates behind the value
 */
public record ArmLevel(double value, Interval interval, int replicates) {

    /** @return a metric that cannot be computed */
    public static ArmLevel none() {
        return new ArmLevel(Double.NaN, Interval.none(0.0), 0);
    }
}
