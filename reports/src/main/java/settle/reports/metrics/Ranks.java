package settle.reports.metrics;

/** Ranks of values from the smallest: what the a-priori section sets side by side (bound, tail radius, final gap). */
public final class Ranks {

    private Ranks() {
    }

    /**
     * Competition ranks: each finite value gets 1 + the number of finite values below it, so ties share a rank and
     * the next rank is skipped ({1, 3, 3, 2} ranks as {1, 3, 3, 2}; {2, 2, 1} as {2, 2, 1}).
     *
     * @param values the values; not modified
     * @return each value's rank from 1, or 0 for a value that is not finite (it has no rank)
     */
    public static int[] of(double[] values) {
        int[] out = new int[values.length];
        for (int i = 0; i < values.length; i++) {
            if (!Double.isFinite(values[i])) {
                continue;
            }
            int below = 0;
            for (double v : values) {
                if (Double.isFinite(v) && v < values[i]) {
                    below++;
                }
            }
            out[i] = 1 + below;
        }
        return out;
    }
}
