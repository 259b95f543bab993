package settle.reports.stats;

import org.apache.commons.math3.distribution.TDistribution;

/**
 * Jackknife confidence intervals for a positive statistic of S replicates (J. W. Tukey, "Bias and confidence in
 * not-quite large samples", Ann. Math. Statist. 29, 1958, abstract; B. Efron, C. Stein, "The jackknife estimate of
 * variance", Ann. Statist. 9(3), 1981): from the S leave-one-replicate-out values v_(i),
 * SE = sqrt((S − 1)/S · Σ (v_(i) − v̄)²), and the interval estimate ± t_{S−1}·SE, here on the log scale (the
 * statistics are spreads: positive and skewed), so it is estimate·exp(±t·SE_log). Leaving a replicate out never
 * counts one twice, which is what shrinks a bootstrap of a spread. Its coverage is measured by simulation in
 * ArmLevelCoverageTest and stated in docs/stats.md.
 */
public final class Jackknife {

    private Jackknife() {
    }

    /**
     * @param estimate the statistic on all S replicates
     * @param leaveOneOut the statistic with each replicate left out, S ≥ 3 values. Not modified.
     * @param level nominal confidence level in (0, 1)
     * @return the interval on the log scale; when the estimate or a leave-one-out value is zero (the log is
     *     undefined) the same interval on the raw scale with its lower end raised to 0; undefined when the estimate
     *     is zero or there are fewer than three replicates
     */
    public static Interval interval(double estimate, double[] leaveOneOut, double level) {
        if (!(level > 0.0 && level < 1.0)) {
            throw new IllegalArgumentException("confidence level must be in (0, 1): " + level);
        }
        int s = leaveOneOut.length;
        if (s < 3 || !(estimate > 0.0) || !Double.isFinite(estimate)) {
            return Interval.none(level);
        }
        double t = new TDistribution(null, s - 1).inverseCumulativeProbability(0.5 + level / 2.0);
        boolean positive = true;
        for (double v : leaveOneOut) {
            positive &= v > 0.0 && Double.isFinite(v);
        }
        double[] values = new double[s];
        for (int i = 0; i < s; i++) {
            values[i] = positive ? Math.log(leaveOneOut[i]) : leaveOneOut[i];
        }
        double mean = 0.0;
        for (double v : values) {
            mean += v;
        }
        mean /= s;
        double sum = 0.0;
        for (double v : values) {
            sum += (v - mean) * (v - mean);
        }
        double se = Math.sqrt((s - 1.0) / s * sum);
        if (positive) {
            return new Interval(estimate * Math.exp(-t * se), estimate * Math.exp(t * se), level);
        }
        return new Interval(Math.max(0.0, estimate - t * se), estimate + t * se, level);
    }
}
