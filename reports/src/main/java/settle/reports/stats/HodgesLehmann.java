package settle.reports.stats;

import java.util.Arrays;

/**
 * The Hodges–Lehmann estimate of a paired location shift (J. L. Hodges, E. L. Lehmann, "Estimates of
 * location based on rank tests", Ann. Math. Statist. 34(2), 1963): the median of the n(n+1)/2 Walsh
 * averages (x_i + x_j)/2, i ≤ j, and its exact confidence interval by inverting the signed-rank test,
 * computed as R's {@code wilcox.test(..., conf.int = TRUE)} does in its exact branch: with
 * q = qsignrank((1 − level)/2, n) (raised to 1 if 0) the interval runs from the q-th smallest to the
 * q-th largest Walsh average, and its achieved level is 1 − 2·P(V ≤ q − 1).
 *
 * <p>The interval uses the untied signed-rank distribution for n values, as R does; with tied or
 * zero values its coverage is approximate (the estimate itself is unaffected).
 */
public final class HodgesLehmann {

    private HodgesLehmann() {
    }

    /**
     * @param x the values (paired differences); finite. Not modified.
     * @return the Walsh averages (x_i + x_j)/2 for i ≤ j, sorted ascending
     */
    public static double[] sortedWalshAverages(double[] x) {
        double[] w = new double[walshCount(x.length)];
        fillWalsh(x, x.length, w);
        Arrays.sort(w);
        return w;
    }

    /**
     * @param x the values; finite. Not modified.
     * @return the median of the Walsh averages (R's "(pseudo)median"); NaN when x is empty
     */
    public static double estimate(double[] x) {
        checkFinite(x);
        if (x.length == 0) {
            return Double.NaN;
        }
        double[] w = sortedWalshAverages(x);
        int m = w.length;
        return (m & 1) == 1 ? w[m / 2] : (w[m / 2 - 1] + w[m / 2]) / 2.0;
    }

    /**
     * @param x the values; finite. Not modified.
     * @param level requested confidence level in (0, 1), e.g. 0.95
     * @return the exact interval with the level it achieves; an undefined interval when x is empty
     */
    public static Interval exactInterval(double[] x, double level) {
        checkFinite(x);
        if (!(level > 0.0 && level < 1.0)) {
            throw new IllegalArgumentException("confidence level must be in (0, 1): " + level);
        }
        int n = x.length;
        if (n == 0) {
            return Interval.none(0.0);
        }
        double[] w = sortedWalshAverages(x);
        double[] cdf = SignedRankDistribution.untiedCdf(n);
        int qu = SignedRankDistribution.lowerQuantile(cdf, (1.0 - level) / 2.0);
        if (qu == 0) {
            qu = 1;
        }
        int ql = w.length - qu;
        double achieved = 1.0 - 2.0 * (qu - 1 >= 0 ? cdf[qu - 1] : 0.0);
        return new Interval(w[qu - 1], w[ql], Math.max(0.0, achieved));
    }

    static int walshCount(int n) {
        long m = (long) n * (n + 1) / 2;
        if (m > Integer.MAX_VALUE - 8) {
            throw new IllegalArgumentException("too many values for Walsh averages: " + n);
        }
        return (int) m;
    }

    private static void fillWalsh(double[] x, int n, double[] w) {
        int k = 0;
        for (int i = 0; i < n; i++) {
            double xi = x[i];
            for (int j = i; j < n; j++) {
                w[k++] = (xi + x[j]) / 2.0;
            }
        }
    }

    private static void checkFinite(double[] x) {
        for (int i = 0; i < x.length; i++) {
            if (!Double.isFinite(x[i])) {
                throw new IllegalArgumentException("value " + i + " is not finite: " + x[i]
                        + " (the Hodges–Lehmann estimate uses finite pairs only)");
            }
        }
    }
}
