package settle.reports.stats;

/**
 * Settings of the verdict.
 *
 * @param floor values below this are raised to it before the log-ratio (a gap F(θ) − F(θ*) can be zero
 *     or negative to rounding); must be positive
 * @param confidence confidence level of the intervals, in (0, 1)
 * @param significance level α at which an adjusted p counts as a detected difference, in (0, 1)
 * @param resamples bootstrap resamples, at least {@link Bootstrap#MIN_RESAMPLES}
 * @param seed bootstrap generator seed (fixed: the verdict is reproducible)
 */
public record VerdictOptions(double floor, double confidence, double significance, int resamples, long seed) {

    /**
     * Default floor: 1e-12. A training objective of order 0.1–1, summed over a few thousand examples in
     * double precision, is known to about 1e-13; a gap below 1e-12 is rounding, not a difference.
     */
    public static final double DEFAULT_FLOOR = 1e-12;

    /** Default bootstrap seed. */
    public static final long DEFAULT_SEED = 0x5E771EL;

    public VerdictOptions {
        if (!(floor > 0.0) || !Double.isFinite(floor)) {
            throw new IllegalArgumentException("floor must be a positive number: " + floor);
        }
        if (!(confidence > 0.0 && confidence < 1.0)) {
            throw new IllegalArgumentException("confidence must be in (0, 1): " + confidence);
        }
        if (!(significance > 0.0 && significance < 1.0)) {
            throw new IllegalArgumentException("significance must be in (0, 1): " + significance);
        }
        if (resamples < Bootstrap.MIN_RESAMPLES) {
            throw new IllegalArgumentException("resamples must be at least " + Bootstrap.MIN_RESAMPLES + ": "
                    + resamples);
        }
    }

    /** @return floor 1e-12, 95 % intervals, α = 0.05, 10 000 resamples, the default seed */
    public static VerdictOptions defaults() {
        return new VerdictOptions(DEFAULT_FLOOR, 0.95, 0.05, Bootstrap.MIN_RESAMPLES, DEFAULT_SEED);
    }
}
