package settle.engine.probe;

/**
 * settle's reading of one rate sweep (a pure function of the sweep's rates α_1 &lt; α_2 &lt; … and the objectives
 * F_1, F_2, … after each update, with F_0 = F(θ₀) at the start):
 *
 * <ul>
 *   <li><b>fall</b> = F_0 − min_t F_t, the most the sweep ever gained; no range when it is not positive (the sweep
 *       never went below where it started);</li>
 *   <li><b>upper end</b> = the rate α_t* of the update that reached that lowest objective (the first, on a tie): the
 *       largest rate after which the sweep was still at its best;</li>
 *   <li><b>lower end</b> = the smallest rate α_t after which the sweep had gained at least half the fall,
 *       F_0 − F_t ≥ fall / 2. A geometric sweep with ratio q per update has, by rate α, taken steps summing to
 *       about α·q/(q − 1): as much as q/(q − 1) updates at α (about 19 for 300 updates over 7 decades). The lower
 *       end is thus the rate at which a short run already makes half the progress the best rate makes; below it a
 *       rate mostly wastes updates.</li>
 * </ul>
 *
 * Since α_t* itself gained the whole fall, lower ≤ upper. Where the sweep stops is {@link RangeTest}'s business;
 * the cap at the stability bound is the caller's.
 */
public final class RangeRule {

    /** The lower end is the first rate by which the sweep had gained this fraction of its whole fall. */
    public static final double HALF = 0.5;

    private RangeRule() {
    }

    /**
     * A sweep's range.
     *
     * @param lower the lower end (NaN when there is no range)
     * @param upper the upper end (NaN when there is no range)
     * @param lowest min_t F_t (NaN for an empty sweep)
     * @param fall F_0 − min_t F_t (NaN for an empty sweep)
     * @param best t* − 1, the 0-based index of the update that reached the lowest objective (−1 when none)
     */
    public record Range(double lower, double upper, double lowest, double fall, int best) {

        /** @return whether the sweep went below where it started, so that the range exists */
        public boolean exists() {
            return Double.isFinite(upper);
        }
    }

    /**
     * @param rates α_t, increasing
     * @param objectives F_t after update t, as many as rates (a value that is not finite never counts as lowest)
     * @param initial F_0, finite
     * @return the sweep's range
     */
    public static Range of(double[] rates, double[] objectives, double initial) {
        if (rates.length != objectives.length) {
            throw new IllegalArgumentException(rates.length + " rates but " + objectives.length + " objectives");
        }
        if (!Double.isFinite(initial)) {
            throw new IllegalArgumentException("F(θ₀) must be finite, got " + initial);
        }
        int best = -1;
        for (int t = 0; t < objectives.length; t++) {
            if (Double.isFinite(objectives[t]) && (best < 0 || objectives[t] < objectives[best])) {
                best = t;
            }
        }
        if (best < 0) {
            return new Range(Double.NaN, Double.NaN, Double.NaN, Double.NaN, -1);
        }
        double lowest = objectives[best];
        double fall = initial - lowest;
        if (!(fall > 0)) {
            return new Range(Double.NaN, Double.NaN, lowest, fall, best);
        }
        int half = best;
        for (int t = 0; t < best; t++) {
            if (initial - objectives[t] >= HALF * fall) {
                half = t;
                break;
            }
        }
        return new Range(rates[half], rates[best], lowest, fall, best);
    }
}
