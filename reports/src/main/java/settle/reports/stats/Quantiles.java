package settle.reports.stats;

import java.util.Arrays;

/**
 * Order statistics used in the per-arm summaries.
 *
 * <ul>
 *   <li><b>Quantile</b>: R's type 7 (Hyndman &amp; Fan, "Sample quantiles in statistical packages",
 *       The American Statistician 50(4), 1996, definition 7; R's and NumPy's default): with the sorted
 *       sample x_(1) ≤ … ≤ x_(n) and h = (n − 1)p, Q(p) = x_(⌊h⌋+1) + (h − ⌊h⌋)(x_(⌊h⌋+2) − x_(⌊h⌋+1)).</li>
 *   <li><b>IQR</b>: Q(0.75) − Q(0.25) with that definition.</li>
 *   <li><b>Interquartile mean (IQM)</b>: the mean of the middle half of the sample, with the sample
 *       seen as n equal masses: each sorted value x_(i) owns the interval [(i − 1)/n, i/n], and its
 *       weight is the length of the part of that interval inside [¼, ¾], times n. So
 *       IQM = (2/n) Σ w_i x_(i) with w_i = max(0, min(i, 3n/4) − max(i − 1, n/4)); the weights sum to
 *       n/2. When n is a multiple of 4 this is the mean after dropping n/4 values from each end (the
 *       25 % trimmed mean); otherwise the two values straddling the quartiles enter with their
 *       fractional weights (n = 10: x_(3) and x_(8) weigh ½, x_(4)…x_(7) weigh 1).</li>
 * </ul>
 */
public final class Quantiles {

    private Quantiles() {
    }

    /**
     * @param sorted ascending values, finite, at least one. Not modified.
     * @param p probability in [0, 1]
     * @return the type-7 quantile
     */
    public static double type7(double[] sorted, double p) {
        if (sorted.length == 0) {
            throw new IllegalArgumentException("a quantile needs at least one value");
        }
        if (!(p >= 0.0 && p <= 1.0)) {
            throw new IllegalArgumentException("quantile probability must be in [0, 1]: " + p);
        }
        double h = (sorted.length - 1) * p;
        int lo = (int) Math.floor(h);
        if (lo >= sorted.length - 1) {
            return sorted[sorted.length - 1];
        }
        double frac = h - lo;
        return sorted[lo] + frac * (sorted[lo + 1] - sorted[lo]);
    }

    /**
     * @param sorted ascending values, at least one. Not modified.
     * @return the interquartile mean as defined in the class comment
     */
    public static double interquartileMean(double[] sorted) {
        int n = sorted.length;
        if (n == 0) {
            throw new IllegalArgumentException("an interquartile mean needs at least one value");
        }
        double from = n / 4.0;
        double to = 3.0 * n / 4.0;
        double sum = 0.0;
        for (int i = 1; i <= n; i++) {
            double w = Math.min(i, to) - Math.max(i - 1, from);
            if (w > 0) {
                sum += w * sorted[i - 1];
            }
        }
        return 2.0 * sum / n;
    }

    /**
     * @param values values in any order, finite. Not modified.
     * @return a sorted copy
     */
    public static double[] sortedCopy(double[] values) {
        for (int i = 0; i < values.length; i++) {
            if (!Double.isFinite(values[i])) {
                throw new IllegalArgumentException("value " + i + " is not finite: " + values[i]);
            }
        }
        double[] s = values.clone();
        Arrays.sort(s);
        return s;
    }
}
