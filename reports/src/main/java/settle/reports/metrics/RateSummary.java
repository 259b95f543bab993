package settle.reports.metrics;

import settle.reports.format.Replicate;
import settle.reports.format.Study;

/**
 * An arm's rates in numbers, from its first present replicate (every replicate of an arm runs the same rates unless
 * a plateau schedule cut them): the first and last rate, Σα and Σα² over the updates run (values that are not
 * finite left out of the sums), and the number of updates.
 *
 * @param first the rate of the first update (NaN when there is none)
 * @param last the rate of the last update run (NaN when there is none)
 * @param sum Σα over the updates run
 * @param sumOfSquares Σα² over the updates run
 * @param updates the number of updates run (0 when the arm has no replicate file)
 */
public record RateSummary(double first, double last, double sum, double sumOfSquares, int updates) {

    /**
     * @param study the study
     * @param arm the arm (0-based)
     * @return the summary of the rates of the arm's first present replicate
     */
    public static RateSummary of(Study study, int arm) {
        Replicate r = Replicates.first(study, arm);
        return of(r == null ? new double[0] : r.rates());
    }

    /**
     * @param rates the rate of every update, in order; not modified
     * @return their summary
     */
    public static RateSummary of(double[] rates) {
        double sum = 0;
        double sq = 0;
        for (double v : rates) {
            if (Double.isFinite(v)) {
                sum += v;
                sq += v * v;
            }
        }
        return new RateSummary(rates.length == 0 ? Double.NaN : rates[0],
                rates.length == 0 ? Double.NaN : rates[rates.length - 1], sum, sq, rates.length);
    }
}
