package settle.engine.schedule;

import static org.junit.jupiter.api.Assertions.assertEquals;

import org.junit.jupiter.api.Test;

/**
 * Schedule arithmetic check values (the project's THEORY.md §7.1), recomputed with numpy 1.24.2 (Debian's
 * python3-numpy) from the closed formulas, e.g. {@code 0.1*(1+np.cos(np.pi*np.arange(11)/10))/2}. Those
 * values count from t = 0; settle's counters start at 1, so value t is settle's epoch t (decay kinds, which
 * never use rate itself) or epoch t + 1 (progress kinds, which start at rate). The last value of a
 * progress curve (t = T) lies beyond the run: settle's progress stays below 1.
 */
class TheoryCheckValuesTest {

    /** numpy printed 8 decimals. */
    private static final double PRINTED = 1e-8;

    private static void check(double[] expected, double[] actual, int offset) {
        for (int i = 0; i < expected.length; i++) {
            assertEquals(expected[i], actual[i + offset], PRINTED, "value " + i);
        }
    }

    /** 0.2/(1+t), t = 0..4: 0.2, 0.1, 0.06666667, 0.05, 0.04; settle's epoch e = t (t = 1..4). */
    @Test
    void inverseTime() {
        double[] r = Maps.rates(4, 1, "kind", "reciprocal", "rate", 0.2, "decay", 1);
        check(new double[] {0.1, 0.06666667, 0.05, 0.04}, r, 0);
    }

    /** 0.1/(1+0.5t), t = 0..4: 0.1, 0.06666667, 0.05, 0.04, 0.03333333; settle's epoch e = t. */
    @Test
    void inverseTimeHalfDecay() {
        double[] r = Maps.rates(4, 1, "kind", "reciprocal", "rate", 0.1, "decay", 0.5);
        check(new double[] {0.06666667, 0.05, 0.04, 0.03333333}, r, 0);
    }

    /** 0.1·0.9^t, t = 0..4: 0.1, 0.09, 0.081, 0.0729, 0.06561; settle's epoch e = t. */
    @Test
    void exponential() {
        double[] r = Maps.rates(4, 1, "kind", "exponential", "rate", 0.1, "base", 0.9);
        check(new double[] {0.09, 0.081, 0.0729, 0.06561}, r, 0);
    }

    /** Cosine, 0.1 → 0, T = 10, t = 0..9 ↔ epochs 1..10 of a 10-epoch run (t = 10 → 0 is beyond it). */
    @Test
    void cosineTenEpochs() {
        double[] r = Maps.rates(10, 1, "kind", "cosine", "rate", 0.1);
        check(new double[] {0.1, 0.09755283, 0.09045085, 0.07938926, 0.06545085, 0.05, 0.03454915, 0.02061074,
            0.00954915, 0.00244717}, r, 0);
    }

    /** Cosine, 0.5 → 0, T = 5: 0.5, 0.45225425, 0.32725425, 0.17274575, 0.04774575 in epochs 1..5. */
    @Test
    void cosineFiveEpochs() {
        double[] r = Maps.rates(5, 1, "kind", "cosine", "rate", 0.5);
        check(new double[] {0.5, 0.45225425, 0.32725425, 0.17274575, 0.04774575}, r, 0);
    }

    /** Linear decay 0.1·(1 − t/10), t = 0..9: 0.1, 0.09, …, 0.01 ↔ anneal power 1 over 10 epochs. */
    @Test
    void linearDecay() {
        double[] r = Maps.rates(10, 1, "kind", "anneal", "rate", 0.1);
        check(new double[] {0.1, 0.09, 0.08, 0.07, 0.06, 0.05, 0.04, 0.03, 0.02, 0.01}, r, 0);
    }

    /**
     * (1 − √·) cooldown from 1 over 10 steps, t = 0..9: 1, 0.68377223, …, 0.0513167 ↔ warmup-stable-decay
     * with decay-from 0 and shape root over 10 epochs.
     */
    @Test
    void rootCooldown() {
        double[] r = Maps.rates(10, 1, "kind", "warmup-stable-decay", "rate", 1, "decay-from", 0, "shape", "root");
        check(new double[] {1, 0.68377223, 0.5527864, 0.45227744, 0.36754447, 0.29289322, 0.22540333, 0.16333997,
            0.10557281, 0.0513167}, r, 0);
    }
}
