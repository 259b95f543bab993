package settle.reports.metrics;

import java.util.ArrayList;
import java.util.Arrays;
import java.util.List;
import java.util.function.Function;
import settle.reports.stats.Quantiles;
import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * One per-epoch series of an arm summarised over its finished replicates, epoch by epoch: the type-7 quartiles of
 * the finite values at each epoch end (the objective chart draws the median as a line and the interquartile range
 * as a band). Diverged and missing replicates are left out; an epoch no finished replicate reached, or where none
 * has a finite value, is NaN in all three.
 *
 * @param lower the first quartile at each epoch end (index 0 = epoch 1)
 * @param median the median at each epoch end
 * @param upper the third quartile at each epoch end
 */
public record EpochBands(double[] lower, double[] median, double[] upper) {

    /**
     * @param lower the first quartile per epoch; kept, not copied
     * @param median the median per epoch; kept, not copied
     * @param upper the third quartile per epoch; kept, not copied
     * @throws IllegalArgumentException when the three differ in length
     */
    public EpochBands {
        if (lower.length != median.length || upper.length != median.length) {
            throw new IllegalArgumentException("one value per epoch in each band: " + lower.length + ", "
                    + median.length + ", " + upper.length);
        }
    }

    /**
     * @param study the study
     * @param arm the arm (0-based)
     * @param series the replicate's series, one value per epoch end (such as {@code r -> r.epochs().objective()})
     * @param shift subtracted from every value before the quartiles (F(θ*) for the objective of a convex model, else
     *     0)
     * @return the bands over as many epochs as the arm's longest finished replicate
     */
    public static EpochBands of(Study study, int arm, Function<Replicate, double[]> series, double shift) {
        int epochs = 0;
        List<double[]> rows = new ArrayList<>();
        for (Replicate r : study.replicates().get(arm)) {
            if (r != null && !r.diverged()) {
                double[] s = series.apply(r);
                rows.add(s);
                epochs = Math.max(epochs, s.length);
            }
        }
        double[] lower = new double[epochs];
        double[] median = new double[epochs];
        double[] upper = new double[epochs];
        double[] buffer = new double[rows.size()];
        for (int e = 0; e < epochs; e++) {
            int n = 0;
            for (double[] s : rows) {
                if (e < s.length && Double.isFinite(s[e])) {
                    buffer[n++] = s[e] - shift;
                }
            }
            if (n == 0) {
                lower[e] = Double.NaN;
                median[e] = Double.NaN;
                upper[e] = Double.NaN;
                continue;
            }
            double[] sorted = Arrays.copyOf(buffer, n);
            Arrays.sort(sorted);
            lower[e] = Quantiles.type7(sorted, 0.25);
            median[e] = Quantiles.type7(sorted, 0.5);
            upper[e] = Quantiles.type7(sorted, 0.75);
        }
        return new EpochBands(lower, median, upper);
    }

    /** @return the number of epochs the bands cover */
    public int epochs() {
        return median.length;
    }
}
