package settle.reports.stats;

/** The scale on which two arms' paired values are compared. */
public enum Scale {
    /**
     * d_k = log(arm_k / baseline_k), values below the floor raised to it: for positive metrics that span decades
     * (gaps, distances, radii, losses); the effect is shown as a % change, 100·(exp(d) − 1).
     */
    LOG_RATIO,
    /**
     * d_k = arm_k − baseline_k for a fraction (test accuracy): the effect is shown in percentage points, 100·d;
     * no floor.
     */
    POINTS;

    /**
     * @param d an effect or interval end on this scale
     * @return what is shown: the % change (log ratio) or the percentage points (points)
     */
    public double shown(double d) {
        return this == LOG_RATIO ? 100.0 * Math.expm1(d) : 100.0 * d;
    }

    /** @return the unit of {@link #shown}: "%" or "pp" */
    public String unit() {
        return this == LOG_RATIO ? "%" : "pp";
    }
}
