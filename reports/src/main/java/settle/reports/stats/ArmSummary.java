package settle.reports.stats;

/**
 * Per-arm summary of one per-replicate metric over the replicates that did not diverge.
 *
 * @param replicates replicates given
 * @param diverged replicates that diverged (left out of the summary)
 * @param median type-7 median (NaN if every replicate diverged)
 * @param interquartileMean interquartile mean, fractional ends weighted (see {@link Quantiles})
 * @param lowerQuartile type-7 Q(0.25)
 * @param upperQuartile type-7 Q(0.75)
 */
public record ArmSummary(int replicates, int diverged, double median, double interquartileMean,
        double lowerQuartile, double upperQuartile) {

    public ArmSummary {
        if (replicates < 0 || diverged < 0 || diverged > replicates) {
            throw new IllegalArgumentException("inconsistent counts: replicates " + replicates
                    + ", diverged " + diverged);
        }
    }

    /** @return Q(0.75) − Q(0.25), type 7 */
    public double interquartileRange() {
        return upperQuartile - lowerQuartile;
    }

    /**
     * @param values per-replicate values; entries of diverged replicates are ignored. Not modified.
     * @param diverged true for a replicate that diverged. Not modified.
     * @return the summary of the finite replicates
     */
    public static ArmSummary of(double[] values, boolean[] diverged) {
        if (values.length != diverged.length) {
            throw new IllegalArgumentException("values and diverged flags differ in length: " + values.length
                    + " and " + diverged.length);
        }
        int bad = 0;
        for (boolean d : diverged) {
            if (d) {
                bad++;
            }
        }
        double[] finite = new double[values.length - bad];
        int k = 0;
        for (int i = 0; i < values.length; i++) {
            if (!diverged[i]) {
                if (!Double.isFinite(values[i])) {
                    throw new IllegalArgumentException("replicate " + (i + 1) + " is not marked diverged but its"
                            + " value is " + values[i]);
                }
                finite[k++] = values[i];
            }
        }
        if (finite.length == 0) {
            return new ArmSummary(values.length, bad, Double.NaN, Double.NaN, Double.NaN, Double.NaN);
        }
        double[] s = Quantiles.sortedCopy(finite);
        return new ArmSummary(values.length, bad, Quantiles.type7(s, 0.5), Quantiles.interquartileMean(s),
                Quantiles.type7(s, 0.25), Quantiles.type7(s, 0.75));
    }
}
